import type { MigrationInterface, QueryRunner } from 'typeorm';

/** The progress query reads a campaign's readings grouped per visit; these indexes serve it. */
export class ProgressIndexes1764658800000 implements MigrationInterface {
  name = 'ProgressIndexes1764658800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX offset_set_campaign_visit_idx ON offset_set (campaign_id, visit_id) WHERE NOT deleted`);
    await q.query(`CREATE INDEX probe_reading_campaign_visit_idx ON probe_reading (campaign_id, visit_id) WHERE NOT deleted`);
    await q.query(
      `CREATE INDEX closure_campaign_visit_idx ON closure (campaign_id, visit_id) WHERE NOT deleted AND review_state <> 'rejected'`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX offset_set_campaign_visit_idx, probe_reading_campaign_visit_idx, closure_campaign_visit_idx`);
  }
}
