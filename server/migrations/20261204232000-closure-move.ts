import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The lab moves a closure to the visit it belongs to (a crew tapped the wrong collar): the review
 * history keeps each move as rows of a fourth kind, 'move' (visitId and collarId, old → new).
 * File stamp 2026-12-04 23:20 UTC; TypeORM orders by the class name's last 13 digits, so the class
 * carries the same instant in Unix milliseconds.
 */
export class ClosureMove1796426400000 implements MigrationInterface {
  name = 'ClosureMove1796426400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure_review_history DROP CONSTRAINT closure_review_history_kind_check`);
    await q.query(`ALTER TABLE closure_review_history ADD CONSTRAINT closure_review_history_kind_check
      CHECK (kind IN ('decision', 'recompute', 'raw-change', 'move'))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM closure_review_history WHERE kind = 'move'`);
    await q.query(`ALTER TABLE closure_review_history DROP CONSTRAINT closure_review_history_kind_check`);
    await q.query(`ALTER TABLE closure_review_history ADD CONSTRAINT closure_review_history_kind_check
      CHECK (kind IN ('decision', 'recompute', 'raw-change'))`);
  }
}
