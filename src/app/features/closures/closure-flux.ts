import {
  ambientForClosure,
  planClosureFit,
  withCollarArea,
  type AirTempSource,
  type AmbientCheck,
  type ClosureFitResult,
  type FitContext,
  type OffsetSetRecord,
} from '../../../../shared/flux';
import { collarAreaCm2 } from '../../../../shared/model/derived';
import { siteFields } from '../../../../shared/model/site-layout';
import type { LocalRecord } from '../../core/db/db-schema';
import { localDay } from '../../../../shared/time/site-time';

/** What a closure's flux depends on beyond its series, read from the device store. */
export interface SpotInputs {
  site: LocalRecord<'site'> | null;
  collar: LocalRecord<'collar'>;
  profiles: LocalRecord<'chamberProfile'>[];
  /** The collar's live offset sets (superseded ones left out). */
  offsetSets: LocalRecord<'offsetSet'>[];
  analyzer: LocalRecord<'analyzer'> | null;
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

/**
 * The site's settings a fit reads, as the schema fills them in: a site not on this device yet
 * (it arrives with the next sync) counts with the schema's defaults, the zone as UTC.
 */
const SITE_FIT_DEFAULTS = siteFields
  .pick({ ambientMarginPpm: true, slopeBasis: true, defaultAirTempC: true, defaultProfileId: true })
  .parse({});

/** The collar's inside area: as stored, or from its shape when the record was made on this device (no derived fields yet). */
function insideAreaCm2(collar: LocalRecord<'collar'>): number | null {
  return collar.areaCm2 ?? collarAreaCm2(collar);
}

/** The fit context (shared/flux closure-fit-plan.ts) from the records on the device. */
function fitContext(closure: LocalRecord<'closure'>, inp: SpotInputs): FitContext {
  const site = inp.site;
  const timezone = site?.timezone ?? 'UTC';
  const sets: OffsetSetRecord[] = inp.offsetSets.map((s) => ({ takenOn: localDay(s.takenAt, timezone), offsetsCm: s.readingsCm }));
  const settings = site ?? SITE_FIT_DEFAULTS;
  return {
    timezone,
    elevationM: site?.elevationM ?? null,
    ambientMarginPpm: settings.ambientMarginPpm,
    slopeBasis: settings.slopeBasis,
    defaultProfileId: settings.defaultProfileId,
    defaultAirTempC: settings.defaultAirTempC,
    profiles: withCollarArea(
      inp.profiles.map((p) => ({
        id: p.id,
        name: p.name,
        validFrom: p.validFrom,
        chamberVolumeCm3: p.chamberVolumeCm3,
        loopVolumeCm3: p.loopVolumeCm3,
        footprintAreaCm2: p.footprintAreaCm2,
      })),
      insideAreaCm2(inp.collar),
    ),
    offsetSets: sets,
    precisionPpm: inp.analyzer?.precisionPpm ?? null,
    ambientPpm: ambientForClosure(inp.ambientChecks, closure.analyzerId, closure.startedAt)?.ppm ?? null,
    visitAirTempC: inp.visitAirTempC,
  };
}

/**
 * The flux on the spot: the same engine and volume rule the server runs (shared/flux), with the
 * closure's raw settle time, so the crew sees what the lab will see before walking on.
 */
export function fluxOnTheSpot(closure: LocalRecord<'closure'>, inp: SpotInputs): SpotResult | null {
  const series = closure.series;
  if (series.tS.length === 0) return null;
  const ctx = fitContext(closure, inp);
  const plan = planClosureFit({ startedAt: closure.startedAt, profileId: closure.profileId, series }, ctx);
  const first = series.co2Ppm.find((v) => typeof v === 'number') ?? null;
  return {
    fit: plan.fit({ settleS: closure.settleS }),
    volumeCm3: plan.volume.ok ? plan.volume.value.volumeCm3 : null,
    pressureIsDefault: plan.pressureIsDefault,
    profileName: plan.profile.ok ? plan.profile.profile.name : null,
    airTempSource: plan.temp.ok ? plan.temp.source : null,
    startAboveAmbientPpm: first !== null && ctx.ambientPpm !== null ? first - ctx.ambientPpm : null,
  };
}
