import { localDay } from '../time/site-time';
import { chamberAirTemperature, type AirTempChoice } from './chamber-air-temperature';
import { profileForClosure, type NamedProfileVersion, type ProfileChoice } from './chamber-system';
import { chamberVolumeFor, type ChamberVolumeOutcome, type OffsetSetRecord } from './chamber-volume';
import { fitClosure, invalidFit } from './closure-fit';
import type { ClosureFitResult, ClosureModel, SlopeBasis } from './closure-input';
import { pressureFromElevationKpa } from './standard-atmosphere';

type Column = readonly (number | null)[] | null | undefined;

/** A closure's stored series (logger import, manual entry or the seed). */
export interface ClosureSeries {
  tS: readonly (number | null)[];
  co2Ppm: readonly (number | null)[];
  co2IsDry?: boolean;
  h2oMmolMol?: Column;
  pressureKpa?: Column;
  tempC?: Column;
}

/** A chamber profile version as stored (its area is the collar's, filled in by `withCollarArea`). */
export type StoredProfileVersion = Omit<NamedProfileVersion, 'areaCm2'> & { footprintAreaCm2: number | null };

/**
 * What a closure's flux depends on beyond its series, as plain values: the device fills it from
 * Dexie, the server from PostgreSQL, and both get the same flux from `planClosureFit`.
 */
export interface FitContext {
  timezone: string;
  elevationM: number | null;
  ambientMarginPpm: number;
  slopeBasis: SlopeBasis;
  defaultProfileId: string | null;
  /** The site's air temperature when neither the file nor the visit has one. */
  defaultAirTempC: number;
  /** Every chamber profile version of the site, with the collar's area (see withCollarArea). */
  profiles: readonly NamedProfileVersion[];
  /** The collar's live offset sets (a superseded set no longer counts). */
  offsetSets: readonly OffsetSetRecord[];
  /** The analyzer's precision for the detection limit, ppm (null: the engine's default). */
  precisionPpm: number | null;
  /** The ambient reading of the closure's own analyzer nearest in time, ppm (null: none). */
  ambientPpm: number | null;
  /** The visit's air temperature, °C. */
  visitAirTempC: number | null;
}

/**
 * A is the collar's own inside area; a profile's footprint stands in only for a collar without
 * one (and is compared with it otherwise, for the footprint flag).
 */
export function withCollarArea(profiles: readonly StoredProfileVersion[], collarAreaCm2: number | null): NamedProfileVersion[] {
  return profiles.map((p) => ({ ...p, areaCm2: collarAreaCm2 ?? p.footprintAreaCm2 ?? NaN }));
}

/** How a fit is run: the raw settle time, or the lab's review settings. */
export interface FitSettings {
  settleS: number;
  windowEndS?: number | null;
  model?: 'auto' | ClosureModel;
  excludedIndices?: readonly number[];
}

/** Everything decided before the engine runs, and the fit itself for given settings. */
export interface ClosureFitPlan {
  day: string;
  profile: ProfileChoice<NamedProfileVersion>;
  volume: ChamberVolumeOutcome;
  temp: AirTempChoice;
  pressureIsDefault: boolean;
  fit(settings: FitSettings): ClosureFitResult;
}

const hasNumber = (c: Column): c is readonly (number | null)[] => !!c && c.some((v) => typeof v === 'number');

/**
 * The one assembly of a closure's fit input (series → site-local day → chamber profile → volume
 * from the day's offset set → air temperature → pressure) used by the flux on the phone and by the
 * server, so both give the same flux and the same refusal for the same closure.
 */
export function planClosureFit(
  closure: { startedAt: string; profileId: string | null; series: ClosureSeries },
  ctx: FitContext,
): ClosureFitPlan {
  const { series } = closure;
  const day = localDay(closure.startedAt, ctx.timezone);
  // The closure's own chamber (chamber-system.ts), never the newest profile of any name.
  const profile = profileForClosure(ctx.profiles, closure.profileId, day, ctx.defaultProfileId);
  const volume = profile.ok ? chamberVolumeFor(day, [profile.profile], ctx.offsetSets) : profile;
  const temp = chamberAirTemperature(series.tempC, ctx.visitAirTempC, ctx.defaultAirTempC);
  const pressureIsDefault = !hasNumber(series.pressureKpa);
  const pressureKpa = pressureIsDefault ? (ctx.elevationM === null ? NaN : pressureFromElevationKpa(ctx.elevationM)) : series.pressureKpa!;
  return {
    day,
    profile,
    volume,
    temp,
    pressureIsDefault,
    fit(s) {
      if (!volume.ok) return invalidFit(volume.error);
      if (!temp.ok) return invalidFit(temp.error);
      return fitClosure({
        tS: series.tS,
        co2Ppm: series.co2Ppm,
        co2IsDry: series.co2IsDry === true,
        h2oMmolMol: series.h2oMmolMol ?? null,
        pressureKpa,
        tempC: temp.tempC,
        tempSource: temp.source,
        volumeCm3: volume.value.volumeCm3,
        areaCm2: volume.value.areaCm2,
        footprintAreaCm2: volume.value.footprintAreaCm2,
        settleS: s.settleS,
        windowEndS: s.windowEndS ?? null,
        excludedIndices: s.excludedIndices ?? [],
        model: s.model ?? 'auto',
        slopeAt: ctx.slopeBasis,
        ambientPpm: ctx.ambientPpm,
        ambientMarginPpm: ctx.ambientMarginPpm,
        precisionPpm: ctx.precisionPpm ?? undefined,
        pressureIsDefault,
        offsetAfter: volume.value.flags.includes('offset-after'),
      });
    },
  };
}
