import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The slope basis of a site's fluxes: 'closure' (curved models' slope at t = 0, the default) or
 * 'settle_end' (at the end of the settle time, how fluxes were computed before).
 */
export class SiteSlopeBasis1764688000000 implements MigrationInterface {
  name = 'SiteSlopeBasis1764688000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site ADD COLUMN slope_basis text NOT NULL DEFAULT 'closure'
      CONSTRAINT site_slope_basis_check CHECK (slope_basis IN ('closure', 'settle_end'))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site DROP COLUMN slope_basis`);
  }
}
