import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Each site sets how far a soil temperature's depth may sit from its probe depth and still count in
 * a visit's mean. Sites stored before keep the ±1 cm they were judged with.
 */
// TypeORM orders migrations by the last 13 digits of the class name (unix milliseconds).
export class TempDepthTolerance1796427060000 implements MigrationInterface {
  name = 'TempDepthTolerance1796427060000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site ADD COLUMN temp_depth_tolerance_cm double precision NOT NULL DEFAULT 1`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE site DROP COLUMN temp_depth_tolerance_cm`);
  }
}
