/**
 * A zero/span calibration of a gas analyzer as crews record it: each gas (zero, span) with its
 * certified concentration, the cylinder it came from and the analyzer's reading before
 * ("as found") and after ("as left") adjustment.
 *
 * Drift is the as-found error, reading before − gas concentration, per gas. It tells how far the
 * analyzer had moved since it was last set; judged in % of the span gas concentration because a
 * gain error moves every flux by that share (common practice; no published constant).
 */
/**
 * Common practice: an analyzer found more than about 2 % of the span gas off at calibration puts
 * the fluxes since its previous calibration in question (a gain error moves every flux by its share).
 */
export const DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT = 2;

export interface CalibrationReadings {
  zeroGasPpm?: number | null;
  zeroBeforePpm?: number | null;
  spanGasPpm?: number | null;
  spanBeforePpm?: number | null;
}

export interface CalibrationDrifts {
  zeroDriftPpm: number | null;
  driftPpm: number | null;
}

const given = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
// Readings carry at most 0.001 µmol/mol; rounding keeps 1012.3 − 1000 from reading 12.299999999999955.
const round3 = (x: number) => Math.round(x * 1000) / 1000;

/** The as-found drift of the zero and of the span, µmol/mol (null where a reading or gas is missing). */
export function calibrationDrifts(c: CalibrationReadings): CalibrationDrifts {
  return {
    zeroDriftPpm: given(c.zeroBeforePpm) && given(c.zeroGasPpm) ? round3(c.zeroBeforePpm - c.zeroGasPpm) : null,
    driftPpm: given(c.spanBeforePpm) && given(c.spanGasPpm) ? round3(c.spanBeforePpm - c.spanGasPpm) : null,
  };
}

/** The larger of the zero and span drift in % of the span gas concentration; null without a span gas or drift. */
export function worstDriftPct(d: { zeroDriftPpm?: number | null; driftPpm?: number | null; spanGasPpm?: number | null }): number | null {
  if (!given(d.spanGasPpm) || d.spanGasPpm <= 0) return null;
  const drifts = [d.zeroDriftPpm, d.driftPpm].filter(given).map(Math.abs);
  return drifts.length ? round3((Math.max(...drifts) / d.spanGasPpm) * 100) : null;
}

/**
 * Whether the analyzer was left within the site's limit: the as-left reading of each gas given is
 * within the limit (in % of the span gas) of its concentration. Null when nothing was read after.
 */
export function calibrationPassed(
  c: CalibrationReadings & { zeroAfterPpm?: number | null; spanAfterPpm?: number | null },
  limitPct: number,
): boolean | null {
  if (!given(c.spanGasPpm) || c.spanGasPpm <= 0) return null;
  const tolerance = (limitPct / 100) * c.spanGasPpm;
  const left: number[] = [];
  if (given(c.zeroAfterPpm) && given(c.zeroGasPpm)) left.push(Math.abs(c.zeroAfterPpm - c.zeroGasPpm));
  if (given(c.spanAfterPpm)) left.push(Math.abs(c.spanAfterPpm - c.spanGasPpm));
  return left.length ? left.every((e) => e <= tolerance + 1e-9) : null;
}

/** Whole days since a calibration (24 h each, rounded down), as the Board and Walk count them. */
export function calibrationAgeDays(atIso: string | Date, now: Date): number {
  return Math.floor((now.getTime() - new Date(atIso).getTime()) / 86_400_000);
}
