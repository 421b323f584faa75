/**
 * Each QC flag in plain words with what to do about it now, for the crew at the collar and for the
 * lab at the Bench (one table, beside the flag codes in qc-flags.ts). `action` is what the phone
 * offers right there: `redo` the closure, `check-seal` (reseat the chamber, then redo), `wait`
 * for the analyzer (warm-up, then redo), `note` (write down what was seen) or `none`.
 * Typed as a Record over every flag, so a new flag without words does not compile.
 */
import type { QcFlag } from './qc-flags';

export type FlagAction = 'redo' | 'check-seal' | 'wait' | 'note' | 'none';

export interface FlagAdvice {
  /** What happened, in words a crew member understands. */
  words: string;
  /** What to do now, at the collar. */
  advice: string;
  action: FlagAction;
  /** Whether the crew should act before leaving the collar (the card lists these first). */
  actNow: boolean;
}

export const FLAG_ADVICE: Readonly<Record<QcFlag, FlagAdvice>> = {
  'invalid-input': {
    words: 'No flux could be computed from this closure.',
    advice: 'Check that the logger file belongs to this closure, then redo the closure.',
    action: 'redo',
    actNow: true,
  },
  'too-few-points': {
    words: 'Too few readings after the settle time.',
    advice: 'Redo the closure and leave the chamber on for the full closure length.',
    action: 'redo',
    actNow: true,
  },
  'short-window': {
    words: 'The chamber was on for less than a minute after the settle time.',
    advice: 'Redo the closure and keep the chamber on longer.',
    action: 'redo',
    actNow: true,
  },
  flat: {
    words: 'CO2 hardly changed: the flux is below what the analyzer can detect.',
    advice: 'Nothing to redo if the chamber sealed: a near-zero flux is a valid result.',
    action: 'none',
    actNow: false,
  },
  'negative-flux': {
    words: 'CO2 fell while the chamber was on (uptake or a leak).',
    advice: 'Check the collar seal and the chamber gasket, then redo the closure.',
    action: 'check-seal',
    actNow: true,
  },
  spike: {
    words: 'One reading jumps away from its neighbours.',
    advice: 'Keep breath and hands away from the inlet; redo the closure if it happened more than once.',
    action: 'redo',
    actNow: true,
  },
  'gaps-dropped': {
    words: 'Some readings were missing and were left out.',
    advice: 'Check the analyzer cable and logger; redo if many readings are missing.',
    action: 'redo',
    actNow: false,
  },
  'no-water-data': {
    words: 'The file has no water vapour readings.',
    advice: 'Nothing to do now; the lab corrects the flux without them.',
    action: 'none',
    actNow: false,
  },
  'exp-rejected': {
    words: 'The rise of CO2 does not follow a normal curve.',
    advice: 'Check the collar seal and that the chamber sat still, then redo the closure.',
    action: 'check-seal',
    actNow: true,
  },
  'exp-linear-ratio-high': {
    words: 'CO2 rose fast at first and then levelled off early (a leak or a disturbance when the chamber went on).',
    advice: 'Check the collar seal, seat the chamber gently, then redo the closure.',
    action: 'check-seal',
    actNow: true,
  },
  'footprint-area-differs': {
    words: 'The chamber profile’s area differs from this collar’s area.',
    advice: 'Tell the lead: the collar size or the chamber profile may be wrong.',
    action: 'note',
    actNow: false,
  },
  'start-above-ambient': {
    words: 'CO2 started well above the ambient air.',
    advice: 'Air the chamber and keep your breath away from it, wait until the analyzer shows ambient, then redo.',
    action: 'wait',
    actNow: true,
  },
  'low-r2': {
    words: 'The readings scatter around the fitted line.',
    advice: 'Nothing to redo if the flux is small; if it is large, check the seal and redo.',
    action: 'none',
    actNow: false,
  },
  'offset-after': {
    words: 'The collar offset used was measured on a later day.',
    advice: 'Measure the offset at this visit if it is due.',
    action: 'note',
    actNow: false,
  },
  'default-pressure': {
    words: 'No pressure readings: a default from the site’s elevation was used.',
    advice: 'Nothing to do now.',
    action: 'none',
    actNow: false,
  },
  'temp-from-visit': {
    words: 'No chamber temperature in the file: the visit’s air temperature was used.',
    advice: 'Keep the visit’s air temperature up to date.',
    action: 'none',
    actNow: false,
  },
  'temp-site-default': {
    words: 'No chamber temperature in the file and none noted at the visit: the site’s default was used.',
    advice: 'Enter the air temperature in the visit conditions now.',
    action: 'note',
    actNow: true,
  },
};

/** The advice for a flag code; unknown codes (a newer server) read as themselves. */
export function flagAdvice(flag: string): FlagAdvice {
  return (
    (FLAG_ADVICE as Record<string, FlagAdvice>)[flag] ?? {
      words: flag,
      advice: 'Ask the lab what this flag means.',
      action: 'none',
      actNow: false,
    }
  );
}
