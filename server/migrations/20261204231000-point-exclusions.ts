import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Samples the lab leaves out of a closure's fit: `review_exclusions`, a list of
 * {index, reason} beside the other review fields (the series itself is never changed). Who left
 * which points out and when is in closure_review_history like every other review field.
 * File stamp 2026-12-04 23:10 UTC; TypeORM orders by the class name's last 13 digits, so the class
 * carries the same instant in Unix milliseconds.
 */
export class PointExclusions1796425800000 implements MigrationInterface {
  name = 'PointExclusions1796425800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure ADD COLUMN review_exclusions jsonb NOT NULL DEFAULT '[]'::jsonb
      CONSTRAINT closure_review_exclusions_check CHECK (jsonb_typeof(review_exclusions) = 'array')`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure DROP COLUMN review_exclusions`);
  }
}
