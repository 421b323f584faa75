import {
  ambientForClosure, chamberAirTemperature, chamberVolumeFor, collarAreaCm2, DEFAULT_SITE_AIR_TEMP_C, fitClosure, invalidFit,
  pressureFromElevationKpa, profileForClosure, type AirTempSource, type AmbientCheck, type ClosureFitResult, type NamedProfileVersion,
  type OffsetSetRecord,
} from '../../../../shared/flux';
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

/** The site's calendar day of an instant (closures and offset sets compare by local day): shared/time is its home. */
export { localDay };

type Col = (number | null)[] | null | undefined;
const has = (c: Col): c is (number | null)[] => !!c && c.some((v) => typeof v === 'number');

/**
 * The flux on the spot: the same engine and volume rule the server runs (shared/flux), with the
 * closure's raw settle time, so the crew sees what the lab will see before walking on.
 */
export function fluxOnTheSpot(closure: LocalRecord, inp: SpotInputs): SpotResult | null {
  const series = closure['series'] as { tS: (number | null)[]; co2Ppm: (number | null)[]; co2IsDry?: boolean; h2oMmolMol?: Col; pressureKpa?: Col; tempC?: Col } | undefined;
  if (!series || series.tS.length === 0) return null;
  const timeZone = String(inp.site?.['timezone'] ?? 'UTC');
  const day = localDay(String(closure['startedAt']), timeZone);
  const area = typeof inp.collar['areaCm2'] === 'number' ? inp.collar['areaCm2']
    : typeof inp.collar['diameterCm'] === 'number' ? collarAreaCm2(inp.collar['diameterCm'])
      : Number(inp.collar['sideACm']) * Number(inp.collar['sideBCm']);
  const profiles: NamedProfileVersion[] = inp.profiles.map((p) => ({
    id: p.id, name: String(p['name'] ?? ''), validFrom: String(p['validFrom']), chamberVolumeCm3: Number(p['chamberVolumeCm3']), loopVolumeCm3: Number(p['loopVolumeCm3']),
    // A is the collar's own inside area; the profile's footprint is only compared with it.
    areaCm2: Number.isFinite(area) ? area : Number(p['footprintAreaCm2']),
    footprintAreaCm2: typeof p['footprintAreaCm2'] === 'number' ? p['footprintAreaCm2'] : null,
  }));
  const sets: OffsetSetRecord[] = inp.offsetSets.map((s) => ({ takenOn: localDay(String(s['takenAt']), timeZone), offsetsCm: s['readingsCm'] as number[] }));
  const chosen = profileForClosure(profiles, (closure['profileId'] as string | null) ?? null, day, (inp.site?.['defaultProfileId'] as string | null) ?? null);
  const volume = chosen.ok ? chamberVolumeFor(day, [chosen.profile], sets) : chosen;
  const siteTemp = typeof inp.site?.['defaultAirTempC'] === 'number' ? inp.site['defaultAirTempC'] : DEFAULT_SITE_AIR_TEMP_C;
  const temp = chamberAirTemperature(series.tempC, inp.visitAirTempC, siteTemp);
  const pressureIsDefault = !has(series.pressureKpa);
  const elevation = inp.site?.['elevationM'];
  const first = series.co2Ppm.find((v) => typeof v === 'number') ?? null;
  const ambientPpm = ambientForClosure(inp.ambientChecks, (closure['analyzerId'] as string | null) ?? null, String(closure['startedAt']))?.ppm ?? null;
  const base = { volumeCm3: volume.ok ? volume.value.volumeCm3 : null, pressureIsDefault,
    profileName: chosen.ok ? chosen.profile.name : null, airTempSource: temp.ok ? temp.source : null,
    startAboveAmbientPpm: first !== null && ambientPpm !== null ? first - ambientPpm : null };
  const refuse = (error: string): SpotResult => ({ ...base, fit: invalidFit(error) });
  if (!volume.ok) return refuse(volume.error);
  if (!temp.ok) return refuse(temp.error);
  const fit = fitClosure({
    tS: series.tS, co2Ppm: series.co2Ppm, co2IsDry: series.co2IsDry === true, h2oMmolMol: series.h2oMmolMol ?? null,
    pressureKpa: pressureIsDefault ? (typeof elevation === 'number' ? pressureFromElevationKpa(elevation) : NaN) : series.pressureKpa!,
    tempC: temp.tempC, tempSource: temp.source, volumeCm3: volume.value.volumeCm3, areaCm2: volume.value.areaCm2, footprintAreaCm2: volume.value.footprintAreaCm2,
    settleS: Number(closure['settleS']), slopeAt: inp.site?.['slopeBasis'] === 'settle_end' ? 'settle_end' : 'closure',
    ambientPpm, ambientMarginPpm: Number(inp.site?.['ambientMarginPpm'] ?? 100),
    precisionPpm: typeof inp.analyzer?.['precisionPpm'] === 'number' ? inp.analyzer['precisionPpm'] : undefined,
    pressureIsDefault, offsetAfter: volume.value.flags.includes('offset-after'),
  });
  return { ...base, fit };
}
