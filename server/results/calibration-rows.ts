import type { DataSource } from 'typeorm';
import { worstDriftPct } from '../../shared/model/calibration';
import type { Rows } from './export-rows';

/** The EML method step for calibrations.csv. */
export const CALIBRATION_METHOD =
  'Analyzer calibrations (calibrations.csv): zero and span gas with their cylinders, the analyzer reading of each before (as found) ' +
  'and after (as left) adjustment; drift = reading before − gas concentration, judged as the larger of zero and span drift in % of the span gas ' +
  'against the site limit (default 2 %, common practice).';

/**
 * Rows of calibrations.csv: one per calibration record of the site (skipped ones too, with their
 * reason), oldest first, with the drift judged against the site's limit. Who recorded it is the
 * author of its first revision (a later correction does not change it).
 */
export async function* calibrationRows(ds: DataSource, siteId: string): Rows {
  const rows = await ds.query(
    `
    SELECT c.*, a.name AS analyzer_name, a.serial AS analyzer_serial, u.display_name, s.calibration_drift_limit_pct
      FROM analyzer_check c JOIN site s ON s.id = c.site_id
      LEFT JOIN analyzer a ON a.id = c.analyzer_id
      LEFT JOIN app_user u ON u.id = coalesce((SELECT l.user_id FROM change_log l WHERE l.entity = 'analyzerCheck' AND l.record_id = c.id
                                               ORDER BY l.rev LIMIT 1), c.updated_by)
     WHERE c.site_id = $1 AND c.kind = 'calibration' AND NOT c.deleted ORDER BY c.at, c.id`,
    [siteId],
  );
  for (const r of rows) {
    const pct = worstDriftPct({ zeroDriftPpm: r.zero_drift_ppm, driftPpm: r.drift_ppm, spanGasPpm: r.span_gas_ppm });
    const limit = Number(r.calibration_drift_limit_pct);
    yield [
      r.id,
      r.analyzer_id,
      r.analyzer_name,
      r.analyzer_serial,
      new Date(r.at).toISOString(),
      r.display_name,
      r.skipped,
      r.skip_reason,
      r.passed,
      r.zero_gas_ppm,
      r.zero_cylinder,
      r.zero_before_ppm,
      r.zero_after_ppm,
      r.zero_drift_ppm,
      r.span_gas_ppm,
      r.span_cylinder,
      r.span_before_ppm,
      r.span_after_ppm,
      r.drift_ppm,
      pct,
      limit,
      pct === null ? null : pct > limit,
      r.note,
    ];
  }
}
