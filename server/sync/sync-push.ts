import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { syncOpSchema, type PushResult, type SyncOp, type SyncStatus } from '../../shared/sync/sync-wire';
import { fieldErrorsFromZod } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { writeRecord } from '../records/record-writer';
import type { WriteOutcome } from '../records/write-outcome';
import { recordPush } from './device-service';
import { claimOps, saveAnswers, storedAnswers } from './op-ledger';

const DEADLOCK = '40P01';
const MAX_ATTEMPTS = 5;

type Parsed = { ok: true; op: SyncOp } | { ok: false; result: PushResult };

/**
 * Applies a device's batch in one transaction with a savepoint per op, so one bad op never sinks
 * its neighbours and a crash mid-batch leaves nothing half-applied (the retry applies it all once).
 * Every opId is claimed in the user's ledger up front (one statement): a replay by the same user,
 * even one racing in another request, gets the stored answer instead of running twice.
 */
export async function pushOps(ds: DataSource, user: SessionUser, deviceId: string, outboxSize: number, ops: unknown[]): Promise<PushResult[]> {
  const parsed = ops.map(parseOp);
  for (let attempt = 1; ; attempt++) {
    try {
      return await ds.transaction((em) => applyBatch(em, user, deviceId, outboxSize, parsed));
    } catch (err) {
      // Two batches touching the same records in opposite order: PostgreSQL aborts one; run it again.
      if ((err as { code?: string }).code === DEADLOCK && attempt < MAX_ATTEMPTS) continue;
      throw err;
    }
  }
}

function parseOp(raw: unknown): Parsed {
  const r = syncOpSchema.safeParse(raw);
  if (r.success) return { ok: true, op: r.data };
  const opId = typeof (raw as { opId?: unknown })?.opId === 'string' ? (raw as { opId: string }).opId : '';
  return { ok: false, result: { opId, status: 'rejected', error: { message: 'The operation is malformed', fields: fieldErrorsFromZod(r.error) } } };
}

async function applyBatch(em: EntityManager, user: SessionUser, deviceId: string, outboxSize: number, parsed: Parsed[]): Promise<PushResult[]> {
  const valid = parsed.flatMap((p) => (p.ok ? [p.op] : []));
  const claimed = await claimOps(em, deviceId, user.id, valid);
  const earlier = await storedAnswers(em, user.id, valid.map((o) => o.opId).filter((id) => !claimed.has(id)));
  const changes = new ChangeBuffer();
  const results: PushResult[] = [];
  const thisBatch = new Map<string, PushResult>();
  let savepoint = false;
  for (const p of parsed) {
    if (!p.ok) { results.push(p.result); continue; }
    const { op } = p;
    const first = thisBatch.get(op.opId) ?? earlier.get(op.opId);
    if (first || !claimed.has(op.opId)) {
      results.push(replay(op.opId, first));
      continue;
    }
    // One round trip per op for the savepoint: release the last one and open the next together.
    await em.query(savepoint ? 'RELEASE SAVEPOINT sync_op; SAVEPOINT sync_op' : 'SAVEPOINT sync_op');
    savepoint = true;
    const mark = changes.mark();
    const outcome = await applyOne(em, user, deviceId, op, changes);
    if (outcome.status !== 'applied' && outcome.status !== 'merged') {
      await em.query('ROLLBACK TO SAVEPOINT sync_op'); // the savepoint stays open for the next op
      changes.rollbackTo(mark);
    }
    const result = toResult(op.opId, outcome);
    thisBatch.set(op.opId, result);
    results.push(result);
  }
  await saveAnswers(em, user.id, [...thisBatch.values()]);
  await changes.flush(em);
  await recordPush(em, deviceId, user.id, outboxSize);
  return results;
}

async function applyOne(em: EntityManager, user: SessionUser, deviceId: string, op: SyncOp, changes: ChangeBuffer): Promise<WriteOutcome> {
  try {
    return await writeRecord(em, user, { entity: op.entity, id: op.id, baseRev: op.baseRev, op: op.op, fields: op.fields }, changes, { deviceId });
  } catch (err) {
    if ((err as { code?: string }).code === DEADLOCK) throw err;
    console.error(`[sync] op ${op.opId} failed:`, err);
    return { status: 'rejected', error: { message: readable(err) } };
  }
}

/** A replayed opId: the first answer, marked duplicate, with its status kept in originalStatus. */
function replay(opId: string, first: PushResult | undefined): PushResult {
  if (!first) return { opId, status: 'rejected', error: { message: 'This operation is being applied by another request; retry later' } };
  const { record: _r, ...rest } = first;
  return { ...rest, opId, status: 'duplicate', originalStatus: (first.originalStatus ?? first.status) as SyncStatus };
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

function readable(err: unknown): string {
  const code = (err as { code?: string }).code;
  if (code === '23503') return 'The operation refers to a record the server does not have';
  if (code === '23505') return 'The operation would duplicate a unique value (for example a collar code at this site)';
  return 'The server could not apply this operation';
}
