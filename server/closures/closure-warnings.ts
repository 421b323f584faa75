import type { EntityManager } from 'typeorm';
import { pressureFromElevationKpa } from '../../shared/flux';
import type { Warning } from '../../shared/model/common';
import type { StoredRecord } from '../../shared/model/stored-record';

/** Pressure more than this from the elevation's standard value is suspicious (weather moves it a few kPa). */
const PRESSURE_WARN_KPA = 5;

/** CO2 outside the analyzer's calibrated range and pressure far from the site's elevation value: stored, but said. */
export async function closureWarnings(em: EntityManager, record: Record<string, unknown>): Promise<Warning[]> {
  // The writer hands over any entity's record untyped; a closure's has passed the closure schema by then.
  const c = record as Pick<StoredRecord<'closure'>, 'series' | 'analyzerId' | 'siteId'>;
  const out: Warning[] = [];
  const { series } = c;
  const [a]: { range_min_ppm: number; range_max_ppm: number }[] = c.analyzerId
    ? await em.query(`SELECT range_min_ppm, range_max_ppm FROM analyzer WHERE id = $1`, [c.analyzerId])
    : [];
  if (a) {
    const outside = series.co2Ppm.filter((v) => typeof v === 'number' && (v < a.range_min_ppm || v > a.range_max_ppm)).length;
    if (outside)
      out.push({
        path: 'series.co2Ppm',
        message: `${outside} CO2 values are outside the analyzer's calibrated range (${a.range_min_ppm}–${a.range_max_ppm} µmol/mol)`,
      });
  }
  const [s]: { elevation_m: number | null }[] = await em.query(`SELECT elevation_m FROM site WHERE id = $1`, [c.siteId]);
  const p = series.pressureKpa?.find((v): v is number => typeof v === 'number');
  if (s?.elevation_m != null && p !== undefined) {
    const expected = pressureFromElevationKpa(s.elevation_m);
    if (Math.abs(p - expected) > PRESSURE_WARN_KPA) {
      out.push({
        path: 'series.pressureKpa',
        message: `Pressure ${p} kPa is more than ${PRESSURE_WARN_KPA} kPa from ${expected.toFixed(1)} kPa expected at ${s.elevation_m} m`,
      });
    }
  }
  return out;
}
