import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Calibrations are recorded in full: zero and span gas with their cylinders and the analyzer's
 * readings before and after adjustment, the zero drift beside the span drift, and each site's
 * drift limit (2 % of the span gas, common practice).
 */
export class AnalyzerCalibrations1764698400000 implements MigrationInterface {
  name = 'AnalyzerCalibrations1764698400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE analyzer_check
      ADD COLUMN zero_gas_ppm double precision, ADD COLUMN zero_cylinder text,
      ADD COLUMN zero_before_ppm double precision, ADD COLUMN zero_after_ppm double precision,
      ADD COLUMN span_cylinder text, ADD COLUMN span_before_ppm double precision, ADD COLUMN span_after_ppm double precision,
      ADD COLUMN zero_drift_ppm double precision`);
    await q.query(`ALTER TABLE site ADD COLUMN calibration_drift_limit_pct double precision NOT NULL DEFAULT 2`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site DROP COLUMN calibration_drift_limit_pct`);
    await q.query(`ALTER TABLE analyzer_check DROP COLUMN zero_gas_ppm, DROP COLUMN zero_cylinder, DROP COLUMN zero_before_ppm,
      DROP COLUMN zero_after_ppm, DROP COLUMN span_cylinder, DROP COLUMN span_before_ppm, DROP COLUMN span_after_ppm, DROP COLUMN zero_drift_ppm`);
  }
}
