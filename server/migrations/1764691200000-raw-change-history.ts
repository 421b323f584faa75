import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A raw change to a reviewed closure sends it back to review; the review history keeps who changed
 * which raw field as rows of a third kind, 'raw-change', beside decisions and recomputes.
 */
export class RawChangeHistory1764691200000 implements MigrationInterface {
  name = 'RawChangeHistory1764691200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure_review_history DROP CONSTRAINT closure_review_history_kind_check`);
    await q.query(`ALTER TABLE closure_review_history ADD CONSTRAINT closure_review_history_kind_check
      CHECK (kind IN ('decision', 'recompute', 'raw-change'))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM closure_review_history WHERE kind = 'raw-change'`);
    await q.query(`ALTER TABLE closure_review_history DROP CONSTRAINT closure_review_history_kind_check`);
    await q.query(
      `ALTER TABLE closure_review_history ADD CONSTRAINT closure_review_history_kind_check CHECK (kind IN ('decision', 'recompute'))`,
    );
  }
}
