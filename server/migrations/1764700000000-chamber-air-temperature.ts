import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Chamber air temperature when the analyzer file has none: the visit's air temperature (kept in
 * the visit's conditions, jsonb `conditions->'airTempC'`, no column needed) and else the site's
 * default, 15 °C (US Standard Atmosphere 1976 sea level) unless the site states another.
 * Visits written before carry no air temperature: their conditions get an explicit null so every
 * stored visit matches the shared schema.
 */
export class ChamberAirTemperature1764700000000 implements MigrationInterface {
  name = 'ChamberAirTemperature1764700000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site ADD COLUMN default_air_temp_c double precision NOT NULL DEFAULT 15
      CONSTRAINT site_default_air_temp_c_check CHECK (default_air_temp_c BETWEEN -40 AND 60)`);
    await q.query(`UPDATE visit SET conditions = conditions || '{"airTempC": null}'::jsonb WHERE NOT (conditions ? 'airTempC')`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`UPDATE visit SET conditions = conditions - 'airTempC'`);
    await q.query(`ALTER TABLE site DROP COLUMN default_air_temp_c`);
  }
}
