import type { EntityManager } from 'typeorm';
import {
  chamberAirTemperature, chamberVolumeFor, engineVersion, fitClosure, invalidFit, pressureFromElevationKpa, profileForClosure, type ClosureFitResult,
} from '../../shared/flux';
import { loadClosureContext, localDay, type ClosureContext } from './closure-inputs';

type Series = { tS: (number | null)[]; co2Ppm: (number | null)[]; co2IsDry?: boolean; h2oMmolMol?: (number | null)[] | null;
  pressureKpa?: (number | null)[] | null; tempC?: (number | null)[] | null };

export interface ClosureResults {
  results: Record<string, unknown>;
  flags: string[];
  fluxUmolM2S: number | null;
}

const failed = (error: string): ClosureFitResult => invalidFit(error);

/**
 * Runs the flux engine on a closure as stored: once with the raw settle time (`raw`, never
 * changed by review) and, when the lab moved the settle time, window or model, once more with
 * those or left points out (`review`). The flux shown is the review's when there is one.
 */
export function resultsFor(c: Record<string, unknown>, ctx: ClosureContext): ClosureResults {
  const series = c['series'] as Series;
  const day = localDay(String(c['startedAt']), ctx.timezone);
  // The closure's own chamber (chamber-system.ts), never the newest profile of any name.
  const chosen = profileForClosure(ctx.profiles, (c['profileId'] as string | null) ?? null, day, ctx.defaultProfileId);
  const volume = chosen.ok ? chamberVolumeFor(day, [chosen.profile], ctx.offsetSets) : chosen;
  const temp = chamberAirTemperature(series.tempC, ctx.visitAirTempC, ctx.defaultAirTempC);
  const defaultPressure = !series.pressureKpa?.some((v) => typeof v === 'number');
  const pressureKpa = defaultPressure
    ? (ctx.elevationM === null ? NaN : pressureFromElevationKpa(ctx.elevationM))
    : (series.pressureKpa as (number | null)[]);
  const fit = (settleS: number, windowEndS: number | null, model: 'auto' | 'linear' | 'exponential' | 'quadratic', excludedIndices: number[] = []) => {
    if (!volume.ok) return failed(volume.error);
    if (!temp.ok) return failed(temp.error);
    return fitClosure({
      tS: series.tS, co2Ppm: series.co2Ppm, co2IsDry: series.co2IsDry === true, h2oMmolMol: series.h2oMmolMol ?? null, pressureKpa,
      tempC: temp.tempC, tempSource: temp.source,
      volumeCm3: volume.value.volumeCm3, areaCm2: volume.value.areaCm2, footprintAreaCm2: volume.value.footprintAreaCm2,
      settleS, windowEndS, excludedIndices, model, slopeAt: ctx.slopeBasis,
      ambientPpm: ctx.ambientPpm, ambientMarginPpm: ctx.ambientMarginPpm, precisionPpm: ctx.precisionPpm ?? undefined,
      pressureIsDefault: defaultPressure, offsetAfter: volume.value.flags.includes('offset-after'),
    });
  };
  const raw = fit(Number(c['settleS']), null, 'auto');
  const excluded = ((c['reviewExclusions'] as { index: number }[] | null | undefined) ?? []).map((e) => e.index);
  const reviewed = c['reviewSettleS'] != null || c['reviewWindowEndS'] != null || c['reviewModel'] != null || excluded.length > 0;
  const review = reviewed
    ? fit(Number(c['reviewSettleS'] ?? c['settleS']), (c['reviewWindowEndS'] as number | null) ?? null,
      (c['reviewModel'] as 'linear' | 'exponential' | 'quadratic' | null) ?? 'auto', excluded)
    : null;
  const shown = review ?? raw;
  const v = volume.ok ? volume.value : null;
  return {
    results: {
      engineVersion,
      volumeCm3: v?.volumeCm3 ?? null, areaCm2: v?.areaCm2 ?? null, meanOffsetCm: v?.meanOffsetCm ?? null,
      offsetSetId: v ? (v.offsetSet as { id?: string }).id ?? null : null,
      profileId: v ? (v.profile as { id?: string }).id ?? null : null,
      profileName: chosen.ok ? chosen.profile.name : null, profileSource: chosen.ok ? chosen.source : null,
      ambientPpm: ctx.ambientPpm, ambientCheckId: ctx.ambient?.checkId ?? null, ambientAt: ctx.ambient?.at ?? null,
      airTempSource: temp.ok ? temp.source : null, airTempC: temp.ok && typeof temp.tempC === 'number' ? temp.tempC : null,
      pressureIsDefault: defaultPressure, slopeBasis: ctx.slopeBasis,
      raw: finite(raw), review: review ? finite(review) : null,
    },
    flags: shown.flags,
    fluxUmolM2S: shown.selected && Number.isFinite(shown.selected.fluxUmolM2S) ? shown.selected.fluxUmolM2S : null,
  };
}

export async function computeClosureResults(em: EntityManager, c: Record<string, unknown>): Promise<Record<string, unknown>> {
  return { ...resultsFor(c, await loadClosureContext(em, c)) };
}

/** jsonb cannot hold NaN or Infinity: they are stored as null. */
function finite<T>(v: T): T {
  return JSON.parse(JSON.stringify(v, (_k, x) => (typeof x === 'number' && !Number.isFinite(x) ? null : x)));
}
