import type { EntityManager } from 'typeorm';
import type { ChamberProfileVersion, OffsetSetRecord } from '../../shared/flux';

/** The calendar day of an instant in the site's time zone (closures and offset sets compare by local day). */
export function localDay(iso: string | Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(iso));
}

export interface ClosureContext {
  timezone: string;
  elevationM: number | null;
  ambientMarginPpm: number;
  areaCm2: number | null;
  profiles: (ChamberProfileVersion & { id: string })[];
  offsetSets: (OffsetSetRecord & { id: string; takenAt: string })[];
  precisionPpm: number | null;
  rangeMinPpm: number | null;
  rangeMaxPpm: number | null;
  ambientPpm: number | null;
}

/**
 * Everything a closure's flux depends on beyond its own series, read in a few queries:
 * site defaults, collar area, the site's profile versions, the collar's live offset sets (a
 * superseded set no longer counts), the analyzer, and the day's ambient reading.
 */
export async function loadClosureContext(em: EntityManager, c: Record<string, unknown>): Promise<ClosureContext> {
  const [site] = await em.query(
    `SELECT s.timezone, s.elevation_m, s.ambient_margin_ppm, k.area_cm2
       FROM site s JOIN collar k ON k.id = $2 WHERE s.id = $1`, [c['siteId'], c['collarId']]);
  const timezone: string = site?.timezone ?? 'UTC';
  const areaCm2: number | null = site?.area_cm2 ?? null;
  const profiles = (await em.query(
    `SELECT id, to_char(valid_from, 'YYYY-MM-DD') AS valid_from, chamber_volume_cm3, loop_volume_cm3, footprint_area_cm2
       FROM chamber_profile WHERE site_id = $1 AND NOT deleted`, [c['siteId']]))
    .map((p: Record<string, unknown>) => ({
      id: p['id'] as string, validFrom: p['valid_from'] as string, chamberVolumeCm3: p['chamber_volume_cm3'] as number,
      loopVolumeCm3: p['loop_volume_cm3'] as number, areaCm2: (p['footprint_area_cm2'] as number | null) ?? areaCm2 ?? NaN,
    }));
  const offsetSets = (await em.query(
    `SELECT o.id, o.taken_at, o.readings_cm FROM offset_set o
      WHERE o.collar_id = $1 AND NOT o.deleted
        AND NOT EXISTS (SELECT 1 FROM offset_set n WHERE n.supersedes_id = o.id AND NOT n.deleted)`, [c['collarId']]))
    .map((o: { id: string; taken_at: Date; readings_cm: number[] }) => ({
      id: o.id, takenAt: o.taken_at.toISOString(), takenOn: localDay(o.taken_at, timezone), offsetsCm: o.readings_cm,
    }));
  const [analyzer] = c['analyzerId']
    ? await em.query(`SELECT precision_ppm, range_min_ppm, range_max_ppm FROM analyzer WHERE id = $1`, [c['analyzerId']])
    : [];
  const day = localDay(String(c['startedAt']), timezone);
  const [ambient] = await em.query(
    `SELECT co2_ppm FROM analyzer_check WHERE site_id = $1 AND kind = 'ambient' AND NOT skipped AND NOT deleted
        AND co2_ppm IS NOT NULL AND (at AT TIME ZONE $2)::date = $3::date ORDER BY at DESC LIMIT 1`,
    [c['siteId'], timezone, day]);
  return {
    timezone, elevationM: site?.elevation_m ?? null, ambientMarginPpm: site?.ambient_margin_ppm ?? 100, areaCm2, profiles, offsetSets,
    precisionPpm: analyzer?.precision_ppm ?? null, rangeMinPpm: analyzer?.range_min_ppm ?? null,
    rangeMaxPpm: analyzer?.range_max_ppm ?? null, ambientPpm: ambient?.co2_ppm ?? null,
  };
}
