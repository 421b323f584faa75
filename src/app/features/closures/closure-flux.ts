import {
  chamberVolumeFor, collarAreaCm2, fitClosure, invalidFit, pressureFromElevationKpa,
  type ClosureFitResult, type OffsetSetRecord,
} from '../../../../shared/flux';
import type { LocalRecord } from '../../core/db/db-schema';

/** What a closure's flux depends on beyond its series, read from the device store. */
export interface SpotInputs {
  site: LocalRecord | null;
  collar: LocalRecord;
  profiles: LocalRecord[];
  /** The collar's live offset sets (superseded ones left out). */
  offsetSets: LocalRecord[];
  analyzer: LocalRecord | null;
  /**
   * Ambient CO2 (ppm) by the site's local day (YYYY-MM-DD): the latest ambient check of that day.
   * A closure is compared with its own day's reading, not today's (an import may come days later).
   */
  ambientPpmByDay: Readonly<Record<string, number>>;
}

export interface SpotResult {
  fit: ClosureFitResult;
  volumeCm3: number | null;
  pressureIsDefault: boolean;
  /** First CO2 sample minus the day's ambient, ppm (a start far above ambient means a leak or a breath). */
  startAboveAmbientPpm: number | null;
}

/** The site's calendar day of an instant (closures and offset sets compare by local day). */
export function localDay(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(iso));
}

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
  const profiles = inp.profiles.map((p) => ({
    validFrom: String(p['validFrom']), chamberVolumeCm3: Number(p['chamberVolumeCm3']), loopVolumeCm3: Number(p['loopVolumeCm3']),
    // A is the collar's own inside area; the profile's footprint is only compared with it.
    areaCm2: Number.isFinite(area) ? area : Number(p['footprintAreaCm2']),
    footprintAreaCm2: typeof p['footprintAreaCm2'] === 'number' ? p['footprintAreaCm2'] : null,
  }));
  const sets: OffsetSetRecord[] = inp.offsetSets.map((s) => ({ takenOn: localDay(String(s['takenAt']), timeZone), offsetsCm: s['readingsCm'] as number[] }));
  const volume = chamberVolumeFor(day, profiles, sets);
  const pressureIsDefault = !has(series.pressureKpa);
  const elevation = inp.site?.['elevationM'];
  const first = series.co2Ppm.find((v) => typeof v === 'number') ?? null;
  const ambientPpm = inp.ambientPpmByDay[day] ?? null;
  const base = { volumeCm3: volume.ok ? volume.value.volumeCm3 : null, pressureIsDefault,
    startAboveAmbientPpm: first !== null && ambientPpm !== null ? first - ambientPpm : null };
  const refuse = (error: string): SpotResult => ({ ...base, fit: invalidFit(error) });
  if (!volume.ok) return refuse(volume.error);
  if (!has(series.tempC)) return refuse('no chamber air temperature in the series');
  const fit = fitClosure({
    tS: series.tS, co2Ppm: series.co2Ppm, co2IsDry: series.co2IsDry === true, h2oMmolMol: series.h2oMmolMol ?? null,
    pressureKpa: pressureIsDefault ? (typeof elevation === 'number' ? pressureFromElevationKpa(elevation) : NaN) : series.pressureKpa!,
    tempC: series.tempC, volumeCm3: volume.value.volumeCm3, areaCm2: volume.value.areaCm2, footprintAreaCm2: volume.value.footprintAreaCm2,
    settleS: Number(closure['settleS']), slopeAt: inp.site?.['slopeBasis'] === 'settle_end' ? 'settle_end' : 'closure',
    ambientPpm, ambientMarginPpm: Number(inp.site?.['ambientMarginPpm'] ?? 100),
    precisionPpm: typeof inp.analyzer?.['precisionPpm'] === 'number' ? inp.analyzer['precisionPpm'] : undefined,
    pressureIsDefault, offsetAfter: volume.value.flags.includes('offset-after'),
  });
  return { ...base, fit };
}
