import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A visit keeps every probe insertion (replicate) as its own probe reading; each now says who took
 * it. Readings stored before were one per visit: each stays as it is, the visit's one replicate,
 * taken by the visit's crew member (null when the visit names none).
 */
// Stamped 2026-12-04 23:21 UTC in unix milliseconds: TypeORM orders migrations by the last 13 digits of the class name.
export class ProbeReplicates1796426460000 implements MigrationInterface {
  name = 'ProbeReplicates1796426460000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE probe_reading ADD COLUMN taken_by_id uuid`);
    await q.query(`UPDATE probe_reading p SET taken_by_id = v.crew_id FROM visit v WHERE v.id = p.visit_id AND v.crew_id IS NOT NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE probe_reading DROP COLUMN taken_by_id`);
  }
}
