import type { EntityManager } from 'typeorm';
import type { PushResult, SyncOp, SyncStatus } from '../../shared/sync/sync-wire';

/**
 * Another request stored an answer for one of this batch's opIds while the batch ran (a device
 * retrying a push whose answer it lost). The batch's transaction is rolled back and run again;
 * the second run answers that op from the ledger, so an op never takes effect twice.
 */
export class LedgerRace extends Error {
  constructor(readonly opIds: string[]) {
    super(`ops answered by another request meanwhile: ${opIds.join(', ')}`);
  }
}

/** Answers stored for the user's opIds by earlier pushes. The ledger is per user: another user's opId is no key to its answer. */
export async function storedAnswers(em: EntityManager, userId: string, opIds: string[]): Promise<Map<string, PushResult>> {
  if (!opIds.length) return new Map();
  const rows: { op_id: string; status: SyncStatus; response: PushResult }[] = await em.query(
    `SELECT op_id, status, response FROM sync_op WHERE user_id = $2 AND op_id = ANY($1::uuid[]) AND status <> 'pending'`,
    [opIds, userId],
  );
  return new Map(rows.map((r) => [r.op_id, { ...r.response, status: r.status }]));
}

/**
 * Writes each op's ledger row once, with its answer (without the possibly large record; a replay
 * needs status, rev and messages), in one statement. The unique (user, opId) key makes a racing
 * request with the same opId wait here until this one commits; the one that finds a row already
 * there throws LedgerRace and runs again.
 */
export async function saveAnswers(
  em: EntityManager,
  deviceId: string,
  userId: string,
  ops: Map<string, SyncOp>,
  results: PushResult[],
): Promise<void> {
  if (!results.length) return;
  // One JSON parameter for all rows: arrays of JSON texts would each be escaped element by element.
  const stored = results.map(({ record: _r, conflict, ...rest }) => {
    const op = ops.get(rest.opId)!;
    const answer = conflict ? { ...rest, conflict: { fields: conflict.fields, serverRev: conflict.serverRev } } : rest;
    return { o: rest.opId, e: op.entity, r: op.id, s: rest.status, a: answer };
  });
  const rows: { op_id: string }[] = await em.query(
    `INSERT INTO sync_op (op_id, device_id, user_id, entity, record_id, status, response)
     SELECT o, $1, $2, e, r, s, a FROM json_to_recordset($3::json) AS t(o uuid, e text, r uuid, s text, a jsonb)
     ON CONFLICT (user_id, op_id) DO NOTHING RETURNING op_id`,
    [deviceId, userId, JSON.stringify(stored)],
  );
  if (rows.length < results.length) {
    const written = new Set(rows.map((r) => r.op_id));
    throw new LedgerRace(results.map((r) => r.opId).filter((id) => !written.has(id)));
  }
}
