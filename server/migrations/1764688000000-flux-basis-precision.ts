import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The slope basis of a site's fluxes: 'closure' (curved models' slope at t = 0, the default) or
 * 'settle_end' (at the end of the settle time, how fluxes were computed before). An analyzer's
 * precision may be unknown (null): the engine then uses a 1 ppm default and says so, instead of
 * storing the default as if the maker had stated it.
 */
export class FluxBasisPrecision1764688000000 implements MigrationInterface {
  name = 'FluxBasisPrecision1764688000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site ADD COLUMN slope_basis text NOT NULL DEFAULT 'closure'
      CONSTRAINT site_slope_basis_check CHECK (slope_basis IN ('closure', 'settle_end'))`);
    await q.query(`ALTER TABLE analyzer ALTER COLUMN precision_ppm DROP NOT NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`UPDATE analyzer SET precision_ppm = 1 WHERE precision_ppm IS NULL`);
    await q.query(`ALTER TABLE analyzer ALTER COLUMN precision_ppm SET NOT NULL`);
    await q.query(`ALTER TABLE site DROP COLUMN slope_basis`);
  }
}
