import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { syncOpSchema, type PushResult, type SyncOp, type SyncStatus } from '../../shared/sync/sync-wire';
import { fieldErrorsFromZod } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { ENTITY_DEFS } from '../records/entity-registry';
import { warmReferences } from '../records/record-references';
import {
  batchableCreate,
  finishBatchedCreate,
  insertPrepared,
  prepareBatchedCreate,
  writeRecord,
  type PreparedCreate,
} from '../records/record-writer';
import type { WriteOutcome } from '../records/write-outcome';
import { recordPush } from './device-service';
import { LedgerRace, saveAnswers, storedAnswers } from './op-ledger';

const DEADLOCK = '40P01';
const MAX_ATTEMPTS = 5;

export type Parsed = { ok: true; op: SyncOp } | { ok: false; result: PushResult };

/**
 * Applies a device's batch in one transaction with a savepoint per op, so one bad op never sinks
 * its neighbours and a crash mid-batch leaves nothing half-applied (the retry applies it all once).
 * An opId with an answer in the user's ledger is answered from it; the others are applied and
 * their ledger rows written once, with their answers, at the end (one statement). A replay racing
 * in another request meets that row at commit and runs again, answered from the ledger then.
 */
export async function pushOps(
  ds: DataSource,
  user: SessionUser,
  deviceId: string,
  outboxSize: number,
  ops: unknown[],
): Promise<PushResult[]> {
  const parsed = ops.map(parseOp);
  for (let attempt = 1; ; attempt++) {
    try {
      return await inPushTransaction(ds, (em, changes) => applyBatch(em, user, deviceId, outboxSize, parsed, { changes }));
    } catch (err) {
      // Two batches touching the same records in opposite order: PostgreSQL aborts one; run it again.
      // The same opId answered by another request meanwhile: run again, answered from the ledger.
      if (((err as { code?: string }).code === DEADLOCK || err instanceof LedgerRace) && attempt < MAX_ATTEMPTS) continue;
      throw err;
    }
  }
}

/**
 * The push's transaction, committed by its change buffer (ChangeBuffer.commit: the change log's lock,
 * its rows and the COMMIT go to PostgreSQL together, so the lock every writer queues for is never
 * held while this process serves other requests). Rolled back when the batch throws.
 */
async function inPushTransaction<T>(ds: DataSource, work: (em: EntityManager, changes: ChangeBuffer) => Promise<T>): Promise<T> {
  const qr = ds.createQueryRunner();
  await qr.connect();
  let ending = false;
  try {
    await qr.startTransaction();
    const changes = new ChangeBuffer();
    const out = await work(qr.manager, changes);
    ending = true;
    await changes.commit(qr);
    return out;
  } catch (err) {
    if (!ending && qr.isTransactionActive) await qr.rollbackTransaction().catch(() => undefined);
    throw err;
  } finally {
    await qr.release();
  }
}

export function parseOp(raw: unknown): Parsed {
  const r = syncOpSchema.safeParse(raw);
  if (r.success) return { ok: true, op: r.data };
  const opId = typeof (raw as { opId?: unknown })?.opId === 'string' ? (raw as { opId: string }).opId : '';
  return {
    ok: false,
    result: { opId, status: 'rejected', error: { message: 'The operation is malformed', fields: fieldErrorsFromZod(r.error) } },
  };
}

/**
 * One push inside the caller's transaction. `batchCreates: false` applies every op alone (the
 * reference the batched creates are tested against: both must give the same answers and rows).
 */
export async function applyBatch(
  em: EntityManager,
  user: SessionUser,
  deviceId: string,
  outboxSize: number,
  parsed: Parsed[],
  opts: { batchCreates?: boolean; deferEdits?: boolean; changes?: ChangeBuffer } = {},
): Promise<PushResult[]> {
  const batching = opts.batchCreates ?? true;
  const deferFrom = opts.deferEdits === false ? parsed.length : independentTail(parsed);
  const lastMention = lastMentions(parsed);
  const valid = parsed.flatMap((p) => (p.ok ? [p.op] : []));
  const earlier = await storedAnswers(
    em,
    user.id,
    valid.map((o) => o.opId),
  );
  const byOpId = new Map<string, SyncOp>();
  for (const o of valid) if (!byOpId.has(o.opId)) byOpId.set(o.opId, o); // a repeat in the batch is answered as the first
  if (batching) {
    const creates = valid.filter((o) => batchableCreate(o) && !earlier.has(o.opId));
    await warmReferences(
      em,
      creates.map((o) => ({ d: ENTITY_DEFS[o.entity], rec: o.fields })),
    );
  }
  // A caller that passes its buffer writes the change log itself, at its commit.
  const changes = opts.changes ?? new ChangeBuffer();
  const results: PushResult[] = [];
  const thisBatch = new Map<string, PushResult>();
  let savepoint = false;
  // One round trip per op for the savepoint: release the last one and open the next together.
  const nextSavepoint = async () => {
    await em.query(savepoint ? 'RELEASE SAVEPOINT sync_op; SAVEPOINT sync_op' : 'SAVEPOINT sync_op');
    savepoint = true;
  };
  const answer = (at: number, opId: string, outcome: WriteOutcome) => {
    const result = toResult(opId, outcome);
    thisBatch.set(opId, result);
    results[at] = result;
  };
  const perOp = async (op: SyncOp, at: number) => {
    await nextSavepoint();
    const mark = changes.mark();
    const outcome = await applyOne(em, user, deviceId, op, changes);
    if (outcome.status !== 'applied' && outcome.status !== 'merged') {
      await em.query('ROLLBACK TO SAVEPOINT sync_op'); // the savepoint stays open for the next op
      changes.rollbackTo(mark);
    }
    answer(at, op.opId, outcome);
  };
  // Creates that passed every check wait here in op order and are stored together (one INSERT per
  // table) before any op that is not such a create, so every op still sees the ones before it.
  let run: Pending[] = [];
  const inRun = new Set<string>(); // opIds and record ids of the run
  const flush = async () => {
    if (!run.length) return;
    const pending = run;
    run = [];
    inRun.clear();
    await storeRun(em, user, deviceId, pending, changes, nextSavepoint, answer, perOp);
  };
  // Edits that nothing later in the batch names wait until the end (see lastMentions).
  const deferred: { op: SyncOp; at: number }[] = [];
  for (const p of parsed) {
    const at = results.length;
    results.push(undefined as unknown as PushResult); // filled in op order by answer()
    if (!p.ok) {
      results[at] = p.result;
      continue;
    }
    const { op } = p;
    if (inRun.has(op.opId) || inRun.has(op.id)) await flush();
    const first = thisBatch.get(op.opId) ?? earlier.get(op.opId);
    if (first) {
      results[at] = replay(op.opId, first);
      continue;
    }
    if (at + 1 >= deferFrom && isIndependentEdit(op) && lastMention.get(op.id.toLowerCase()) === at) {
      deferred.push({ op, at });
      continue;
    }
    if (batching && batchableCreate(op)) {
      const prepared = await prepareOne(em, user, deviceId, op, changes);
      if (prepared) {
        run.push({ op, at, prepared });
        inRun.add(op.opId).add(op.id);
        continue;
      }
    }
    // Refused by a check or not a plain create: the single-op path gives the answer, after the run is stored.
    await flush();
    await perOp(op, at);
  }
  await flush();
  await recordPush(em, deviceId, user.id, outboxSize);
  // Edits of records other devices may edit too take their row locks last, in record order (so two
  // pushes never wait on each other in a cycle), and hold them only for the answers and the commit.
  deferred.sort((a, b) => a.op.entity.localeCompare(b.op.entity) || a.op.id.localeCompare(b.op.id) || a.at - b.at);
  for (const d of deferred) await perOp(d.op, d.at);
  await saveAnswers(em, deviceId, user.id, byOpId, [...thisBatch.values()]);
  if (!opts.changes) await changes.flush(em);
  return results;
}

/** A create: an upsert with no base rev (the device never had the record). */
const isCreate = (op: SyncOp) => op.op === 'upsert' && op.baseRev === null;
/** An edit (an upsert of a record the device already had) of an entity whose edits touch only their own record. */
const isIndependentEdit = (op: SyncOp) => op.op === 'upsert' && op.baseRev !== null && !!ENTITY_DEFS[op.entity].independentEdits;

/**
 * Where the batch's tail of creates and independent edits starts (every valid op from there on).
 * An edit may wait for the end of the batch only if every op after it is in that tail: a delete or
 * an edit of another kind of record may run checks that read other records by more than their id.
 */
function independentTail(parsed: readonly Parsed[]): number {
  let from = parsed.length;
  while (from > 0) {
    const p = parsed[from - 1];
    if (p.ok && !isCreate(p.op) && !isIndependentEdit(p.op)) break;
    from--;
  }
  return from;
}

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;

/**
 * For each id the batch names (an op's own record, or any id inside its fields: a visit's collar, a
 * campaign's routes), the position of the last op that names it. An edit whose record no later op
 * names can be applied at the end of the batch with the same answers: no later op reads it, writes
 * it or refers to it (a reference or lock check on it is the only way one op sees another).
 */
function lastMentions(parsed: readonly Parsed[]): Map<string, number> {
  const last = new Map<string, number>();
  parsed.forEach((p, at) => {
    if (!p.ok) return;
    last.set(p.op.id.toLowerCase(), at);
    idsIn(p.op.fields, (id) => last.set(id.toLowerCase(), at));
  });
  return last;
}

const UUID_LENGTH = 36;

/** Every id-shaped text in a value, in its keys and values at any depth (walked, not serialised and scanned). */
function idsIn(value: unknown, found: (id: string) => void): void {
  if (typeof value === 'string') {
    if (value.length >= UUID_LENGTH) for (const id of value.match(UUID) ?? []) found(id);
  } else if (Array.isArray(value)) {
    for (const v of value) idsIn(v, found);
  } else if (value !== null && typeof value === 'object') {
    for (const key in value) {
      idsIn(key, found);
      idsIn((value as Record<string, unknown>)[key], found);
    }
  }
}

interface Pending {
  op: SyncOp;
  at: number;
  prepared: PreparedCreate;
}

/** The create's checks without its insert; null when a check refuses it (the single-op path answers then). */
async function prepareOne(
  em: EntityManager,
  user: SessionUser,
  deviceId: string,
  op: SyncOp,
  changes: ChangeBuffer,
): Promise<PreparedCreate | null> {
  try {
    const p = await prepareBatchedCreate(
      em,
      user,
      { entity: op.entity, id: op.id, baseRev: op.baseRev, op: op.op, fields: op.fields },
      changes,
      { deviceId },
    );
    return 'status' in p ? null : p;
  } catch (err) {
    if ((err as { code?: string }).code === DEADLOCK) throw err;
    return null;
  }
}

/**
 * Stores a run of prepared creates under one savepoint: one INSERT per table, then each create's
 * change log entry, listeners and answer in op order. A create whose id (or another unique value)
 * was taken, and every create of the run when anything fails, goes through the single-op path,
 * so the answers are the ones it would have given.
 */
async function storeRun(
  em: EntityManager,
  user: SessionUser,
  deviceId: string,
  run: Pending[],
  changes: ChangeBuffer,
  nextSavepoint: () => Promise<void>,
  answer: (at: number, opId: string, o: WriteOutcome) => void,
  perOp: (op: SyncOp, at: number) => Promise<void>,
): Promise<void> {
  await nextSavepoint();
  const mark = changes.mark();
  const outcomes: [Pending, WriteOutcome][] = [];
  const taken: Pending[] = [];
  try {
    const stored = new Set<string>();
    for (const entity of new Set(run.map((r) => r.op.entity))) {
      const ids = await insertPrepared(
        em,
        entity,
        run.filter((r) => r.op.entity === entity).map((r) => r.prepared),
      );
      ids.forEach((id) => stored.add(id));
    }
    for (const r of run) {
      if (!stored.has(r.op.id)) {
        taken.push(r);
        continue;
      }
      outcomes.push([r, await finishBatchedCreate(em, user, r.op.entity, r.prepared, changes, { deviceId })]);
    }
  } catch (err) {
    if ((err as { code?: string }).code === DEADLOCK) throw err;
    await em.query('ROLLBACK TO SAVEPOINT sync_op');
    changes.rollbackTo(mark);
    for (const r of run) await perOp(r.op, r.at);
    return;
  }
  for (const [r, o] of outcomes) answer(r.at, r.op.opId, o);
  for (const r of taken) await perOp(r.op, r.at);
}

async function applyOne(em: EntityManager, user: SessionUser, deviceId: string, op: SyncOp, changes: ChangeBuffer): Promise<WriteOutcome> {
  try {
    return await writeRecord(em, user, { entity: op.entity, id: op.id, baseRev: op.baseRev, op: op.op, fields: op.fields }, changes, {
      deviceId,
    });
  } catch (err) {
    if ((err as { code?: string }).code === DEADLOCK) throw err;
    console.error(`[sync] op ${op.opId} failed:`, err);
    return { status: 'rejected', error: { message: readable(err) } };
  }
}

/** A replayed opId: the first answer, marked duplicate, with its status kept in originalStatus. */
function replay(opId: string, first: PushResult): PushResult {
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
