import type { EntityManager } from 'typeorm';
import type { PushResult, SyncOp, SyncStatus } from '../../shared/sync/sync-wire';

/**
 * Claims a batch's opIds in the ledger in one statement. A claim that another transaction holds
 * waits for it to commit and then comes back unclaimed, so an op never runs twice. The ledger is
 * the user's own (keyed by user and opId): another user's opId is no key to its stored answer.
 */
export async function claimOps(em: EntityManager, deviceId: string, userId: string, ops: SyncOp[]): Promise<Set<string>> {
  if (!ops.length) return new Set();
  const rows: { op_id: string }[] = await em.query(
    `INSERT INTO sync_op (op_id, device_id, user_id, entity, record_id, status, response)
     SELECT o, $1, $2, e, r, 'pending', '{}' FROM unnest($3::uuid[], $4::text[], $5::uuid[]) AS t(o, e, r)
     ON CONFLICT (user_id, op_id) DO NOTHING RETURNING op_id`,
    [deviceId, userId, ops.map((o) => o.opId), ops.map((o) => o.entity), ops.map((o) => o.id)]);
  return new Set(rows.map((r) => r.op_id));
}

/** Answers stored for the user's opIds applied by earlier pushes. */
export async function storedAnswers(em: EntityManager, userId: string, opIds: string[]): Promise<Map<string, PushResult>> {
  if (!opIds.length) return new Map();
  const rows: { op_id: string; status: SyncStatus; response: PushResult }[] = await em.query(
    `SELECT op_id, status, response FROM sync_op WHERE user_id = $2 AND op_id = ANY($1::uuid[]) AND status <> 'pending'`, [opIds, userId]);
  return new Map(rows.map((r) => [r.op_id, { ...r.response, status: r.status }]));
}

/** Keeps each answer without the (possibly large) record; a replay needs status, rev and messages. */
export async function saveAnswers(em: EntityManager, userId: string, results: PushResult[]): Promise<void> {
  if (!results.length) return;
  const stored = results.map(({ record: _r, conflict, ...rest }) =>
    JSON.stringify(conflict ? { ...rest, conflict: { fields: conflict.fields, serverRev: conflict.serverRev } } : rest));
  await em.query(
    `UPDATE sync_op SET status = t.s, response = t.r::jsonb FROM unnest($1::uuid[], $2::text[], $3::text[]) AS t(o, s, r)
      WHERE sync_op.user_id = $4 AND sync_op.op_id = t.o`,
    [results.map((r) => r.opId), results.map((r) => r.status), stored, userId]);
}
