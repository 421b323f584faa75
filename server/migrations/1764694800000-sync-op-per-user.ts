import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The sync op ledger is keyed by (user, opId): a replay gets the stored answer only from the user
 * who sent the op; the same opId from someone else is a new op of theirs, judged on its own.
 */
export class SyncOpPerUser1764694800000 implements MigrationInterface {
  name = 'SyncOpPerUser1764694800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE sync_op DROP CONSTRAINT sync_op_pkey`);
    await q.query(`ALTER TABLE sync_op ADD CONSTRAINT sync_op_pkey PRIMARY KEY (user_id, op_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    // Back to one row per opId: the first user's claim is kept.
    await q.query(`DELETE FROM sync_op s USING sync_op o WHERE s.op_id = o.op_id AND (s.at, s.user_id) > (o.at, o.user_id)`);
    await q.query(`ALTER TABLE sync_op DROP CONSTRAINT sync_op_pkey`);
    await q.query(`ALTER TABLE sync_op ADD CONSTRAINT sync_op_pkey PRIMARY KEY (op_id)`);
  }
}
