import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Campaign progress reads a campaign's visit_progress rows (server/campaigns/campaign-progress.ts).
 * The triggers keep those rows by updating them in place, so one campaign's rows end up scattered
 * over the whole table (26 000 rows on 10 700 pages at 20 000 collars): the read visited every page.
 * This index holds every column the read uses, in (campaign, round, collar) order, so the answer is
 * one range of index pages (an index-only scan: no table page where vacuum has marked it visible).
 * It replaces the (campaign_id, round) index, of which it is a prefix.
 */
export class VisitProgressRange1796435400000 implements MigrationInterface {
  name = 'VisitProgressRange1796435400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX visit_progress_range_idx ON visit_progress (campaign_id, round, collar_id)
                     INCLUDE (skipped, offsets, probes, closures, visit_id, arrived_at, skip_reason)`);
    await q.query(`DROP INDEX visit_progress_campaign_idx`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX visit_progress_campaign_idx ON visit_progress (campaign_id, round)`);
    await q.query(`DROP INDEX visit_progress_range_idx`);
  }
}
