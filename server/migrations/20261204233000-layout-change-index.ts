import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Campaign progress keeps a campaign's collar list (walking order, codes, plots, treatments) per
 * process and reuses it while no collar, plot, route or campaign of the site has changed: the
 * latest change-log seq of those entities is its key. This small partial index answers that seq
 * with one index probe however many visits and readings the site logs.
 */
export class LayoutChangeIndex1796427000000 implements MigrationInterface {
  name = 'LayoutChangeIndex1796427000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(
      `CREATE INDEX change_log_layout_idx ON change_log (site_id, seq) WHERE entity IN ('collar', 'plot', 'route', 'campaign')`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX change_log_layout_idx`);
  }
}
