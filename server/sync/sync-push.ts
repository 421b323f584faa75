import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { syncOpSchema, type PushResult, type SyncStatus } from '../../shared/sync/sync-wire';
import { fieldErrorsFromZod } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { writeRecord } from '../records/record-writer';
import type { WriteOutcome } from '../records/write-outcome';
import { recordPush } from './device-service';

const DEADLOCK = '40P01';
const MAX_ATTEMPTS = 5;

/**
 * Applies a device's batch in one transaction with a savepoint per op, so one bad op never sinks
 * its neighbours and a crash mid-batch leaves nothing half-applied (the retry applies it all once).
 * Each opId is claimed in the ledger before it runs: a replay, even one racing in another request,
 * gets the stored answer instead of running twice.
 */
export async function pushOps(ds: DataSource, user: SessionUser, deviceId: string, outboxSize: number, ops: unknown[]): Promise<PushResult[]> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await ds.transaction(async (em) => {
        const changes = new ChangeBuffer();
        const results: PushResult[] = [];
        for (const raw of ops) results.push(await pushOne(em, user, deviceId, raw, changes));
        await changes.flush(em);
        await recordPush(em, deviceId, user.id, outboxSize);
        return results;
      });
    } catch (err) {
      // Two batches touching the same records in opposite order: PostgreSQL aborts one; run it again.
      if ((err as { code?: string }).code === DEADLOCK && attempt < MAX_ATTEMPTS) continue;
      throw err;
    }
  }
}

async function pushOne(em: EntityManager, user: SessionUser, deviceId: string, raw: unknown, changes: ChangeBuffer): Promise<PushResult> {
  const parsed = syncOpSchema.safeParse(raw);
  const opId = typeof (raw as { opId?: unknown })?.opId === 'string' ? (raw as { opId: string }).opId : '';
  if (!parsed.success) {
    return { opId, status: 'rejected', error: { message: 'The operation is malformed', fields: fieldErrorsFromZod(parsed.error) } };
  }
  const op = parsed.data;
  const claimed = await em.query(
    `INSERT INTO sync_op (op_id, device_id, user_id, entity, record_id, status, response)
     VALUES ($1, $2, $3, $4, $5, 'pending', '{}') ON CONFLICT (op_id) DO NOTHING RETURNING op_id`,
    [op.opId, deviceId, user.id, op.entity, op.id]);
  if (!claimed.length) return replayAnswer(em, op.opId);

  await em.query('SAVEPOINT sync_op');
  const mark = changes.mark();
  let outcome: WriteOutcome;
  try {
    outcome = await writeRecord(em, user, { entity: op.entity, id: op.id, baseRev: op.baseRev, op: op.op, fields: op.fields }, changes, { deviceId });
  } catch (err) {
    if ((err as { code?: string }).code === DEADLOCK) throw err;
    console.error(`[sync] op ${op.opId} failed:`, err);
    outcome = { status: 'rejected', error: { message: readable(err) } };
  }
  if (outcome.status !== 'applied' && outcome.status !== 'merged') {
    await em.query('ROLLBACK TO SAVEPOINT sync_op');
    changes.rollbackTo(mark);
  } else {
    await em.query('RELEASE SAVEPOINT sync_op');
  }
  const result = toResult(op.opId, outcome);
  await em.query(`UPDATE sync_op SET status = $2, response = $3 WHERE op_id = $1`, [op.opId, result.status, stored(result)]);
  return result;
}

function toResult(opId: string, o: WriteOutcome): PushResult {
  const r: PushResult = { opId, status: o.status };
  if (o.rev !== undefined) r.rev = o.rev;
  if (o.record) r.record = o.record;
  if (o.conflict) r.conflict = o.conflict;
  if (o.error) r.error = o.error;
  if (o.warnings) r.warnings = o.warnings;
  return r;
}

/** The ledger keeps the answer without the (possibly large) record; a replay re-reads nothing else. */
function stored(r: PushResult): string {
  const { record: _record, conflict, ...rest } = r;
  return JSON.stringify(conflict ? { ...rest, conflict: { fields: conflict.fields, serverRev: conflict.serverRev } } : rest);
}

async function replayAnswer(em: EntityManager, opId: string): Promise<PushResult> {
  const [row] = await em.query(`SELECT status, response FROM sync_op WHERE op_id = $1`, [opId]);
  const first = row.response as PushResult;
  return { ...first, opId, status: 'duplicate', originalStatus: row.status as SyncStatus };
}

function readable(err: unknown): string {
  const code = (err as { code?: string }).code;
  if (code === '23503') return 'The operation refers to a record the server does not have';
  if (code === '23505') return 'The operation would duplicate a unique value (for example a collar code at this site)';
  return 'The server could not apply this operation';
}
