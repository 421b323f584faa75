import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Room on each closure page for the new version of a row: a review decision or a recompute
 * rewrites results, flux and revision but no indexed column, so PostgreSQL can then update the
 * row in place (a HOT update) instead of touching every closure index. Applies to pages written
 * from now on.
 */
export class ClosureFillfactor1764662460000 implements MigrationInterface {
  name = 'ClosureFillfactor1764662460000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure SET (fillfactor = 80)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE closure RESET (fillfactor)`);
  }
}
