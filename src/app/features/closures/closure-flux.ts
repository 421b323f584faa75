import {
  ambientForClosure,
  DEFAULT_SITE_AIR_TEMP_C,
  planClosureFit,
  withCollarArea,
  type AirTempSource,
  type AmbientCheck,
  type ClosureFitResult,
  type ClosureSeries,
  type FitContext,
  type OffsetSetRecord,
} from '../../../../shared/flux';
import { collarAreaCm2 } from '../../../../shared/model/derived';
import type { LocalRecord } from '../../core/db/db-schema';
import { localDay } from '../../../../shared/time/site-time';

/** What a closure's flux depends on beyond its series, read from the device store. */
export interface SpotInputs {
  site: LocalRecord | null;
  collar: LocalRecord;
  profiles: LocalRecord[];
  /** The collar's live offset sets (superseded ones left out). */
  offsetSets: LocalRecord[];
  analyzer: LocalRecord | null;
  /**
   * The site's usable ambient readings: a closure is compared with its own analyzer's reading
   * nearest to its start (shared/flux chamber-system.ts), not today's (an import may come days later).
   */
  ambientChecks: readonly AmbientCheck[];
  /** The visit's air temperature, °C (stands in for a missing chamber temperature). */
  visitAirTempC: number | null;
}

export interface SpotResult {
  fit: ClosureFitResult;
  volumeCm3: number | null;
  pressureIsDefault: boolean;
  /** First CO2 sample minus the closure's ambient reading, ppm (a start far above ambient means a leak or a breath). */
  startAboveAmbientPpm: number | null;
  /** The chamber the volume came from and where T came from. */
  profileName: string | null;
  airTempSource: AirTempSource | null;
}

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** The collar's inside area: as stored, or from its shape when the record was made on this device. */
function insideAreaCm2(collar: LocalRecord): number | null {
  return (
    num(collar['areaCm2']) ??
    collarAreaCm2({
      shape: collar['shape'] === 'rectangular' ? 'rectangular' : 'round',
      diameterCm: num(collar['diameterCm']),
      sideACm: num(collar['sideACm']),
      sideBCm: num(collar['sideBCm']),
    })
  );
}

/** The fit context (shared/flux closure-fit-plan.ts) from the records on the device. */
function fitContext(closure: LocalRecord, inp: SpotInputs): FitContext {
  const timezone = String(inp.site?.['timezone'] ?? 'UTC');
  const sets: OffsetSetRecord[] = inp.offsetSets.map((s) => ({
    takenOn: localDay(String(s['takenAt']), timezone),
    offsetsCm: s['readingsCm'] as number[],
  }));
  return {
    timezone,
    elevationM: num(inp.site?.['elevationM']),
    ambientMarginPpm: num(inp.site?.['ambientMarginPpm']) ?? 100,
    slopeBasis: inp.site?.['slopeBasis'] === 'settle_end' ? 'settle_end' : 'closure',
    defaultProfileId: (inp.site?.['defaultProfileId'] as string | null | undefined) ?? null,
    defaultAirTempC: num(inp.site?.['defaultAirTempC']) ?? DEFAULT_SITE_AIR_TEMP_C,
    profiles: withCollarArea(
      inp.profiles.map((p) => ({
        id: p.id,
        name: String(p['name'] ?? ''),
        validFrom: String(p['validFrom']),
        chamberVolumeCm3: Number(p['chamberVolumeCm3']),
        loopVolumeCm3: Number(p['loopVolumeCm3']),
        footprintAreaCm2: num(p['footprintAreaCm2']),
      })),
      insideAreaCm2(inp.collar),
    ),
    offsetSets: sets,
    precisionPpm: num(inp.analyzer?.['precisionPpm']),
    ambientPpm:
      ambientForClosure(inp.ambientChecks, (closure['analyzerId'] as string | null) ?? null, String(closure['startedAt']))?.ppm ?? null,
    visitAirTempC: inp.visitAirTempC,
  };
}

/**
 * The flux on the spot: the same engine and volume rule the server runs (shared/flux), with the
 * closure's raw settle time, so the crew sees what the lab will see before walking on.
 */
export function fluxOnTheSpot(closure: LocalRecord, inp: SpotInputs): SpotResult | null {
  const series = closure['series'] as ClosureSeries | undefined;
  if (!series || series.tS.length === 0) return null;
  const ctx = fitContext(closure, inp);
  const plan = planClosureFit(
    { startedAt: String(closure['startedAt']), profileId: (closure['profileId'] as string | null) ?? null, series },
    ctx,
  );
  const first = series.co2Ppm.find((v) => typeof v === 'number') ?? null;
  return {
    fit: plan.fit({ settleS: Number(closure['settleS']) }),
    volumeCm3: plan.volume.ok ? plan.volume.value.volumeCm3 : null,
    pressureIsDefault: plan.pressureIsDefault,
    profileName: plan.profile.ok ? plan.profile.profile.name : null,
    airTempSource: plan.temp.ok ? plan.temp.source : null,
    startAboveAmbientPpm: first !== null && ctx.ambientPpm !== null ? first - ctx.ambientPpm : null,
  };
}
