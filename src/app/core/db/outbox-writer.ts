import { v4 as uuidv4 } from 'uuid';
import type { EntityFields, SyncEntityName } from '../../../../shared/model/entities';
import type { FluxDb, LocalRecord, OutboxOp, RecordBag } from './db-schema';
import { editableFields, nowIso, sameValue } from './record-values';

/**
 * Local writes. Each one puts the record and its outbox op in ONE Dexie transaction (never a
 * network call inside it), and merges into the record's unsent op so the device never conflicts
 * with itself: the first `baseRev` is kept, later field values win, and a delete of a record
 * whose create was never sent drops both.
 */

export class RecordMissingError extends Error {
  constructor(entity: string, id: string) {
    super(`This ${entity} (${id}) is not on this device`);
  }
}

/** The record's op that has not gone out yet (an op that was sent is never changed again). */
export async function unsentOp(db: FluxDb, entity: SyncEntityName, id: string): Promise<OutboxOp | undefined> {
  return db.outbox
    .where('[entity+id]')
    .equals([entity, id])
    .filter((o) => o.sentAt === null)
    .first();
}

function newOp(
  entity: SyncEntityName,
  id: string,
  baseRev: number | null,
  op: OutboxOp['op'],
  fields: Record<string, unknown>,
  base: Record<string, unknown>,
  now: string,
): OutboxOp {
  return { opId: uuidv4(), entity, id, baseRev, op, fields, base, sentAt: null, createdAt: now, updatedAt: now };
}

/**
 * Changes some fields of a record on this device and queues them. Returns the op (new or merged),
 * or null when nothing actually changed. The changes are typed by the entity; the table is moved
 * as the untyped bag every entity shares (the sync machinery's boundary).
 */
export async function saveEdit<E extends SyncEntityName>(
  db: FluxDb,
  entity: E,
  id: string,
  changes: Partial<EntityFields<E>>,
  opts: { baseRev?: number; now?: Date } = {},
): Promise<OutboxOp | null> {
  const table = db.anyRecords(entity);
  const now = nowIso(opts.now);
  return db.transaction('rw', [table, db.outbox], async () => {
    const rec = await table.get(id);
    if (!rec) throw new RecordMissingError(entity, id);
    const wanted = editableFields(changes);
    const changed = Object.keys(wanted).filter((k) => !sameValue(wanted[k], rec[k]));
    if (!changed.length && opts.baseRev === undefined) return null;
    const fields = Object.fromEntries(changed.map((k) => [k, wanted[k]]));
    const pending = await unsentOp(db, entity, id);
    let op: OutboxOp;
    if (pending) {
      if (pending.op === 'delete') throw new Error(`This ${entity} is queued for deletion and cannot be edited`);
      const base = { ...pending.base };
      // The value before the first queued edit is the base; only known while the copy is still at baseRev.
      for (const k of changed) if (!(k in base) && pending.baseRev !== null && rec.rev === pending.baseRev) base[k] = rec[k] ?? null;
      op = { ...pending, fields: { ...pending.fields, ...fields }, base, updatedAt: now };
      if (opts.baseRev !== undefined && pending.baseRev !== null) op.baseRev = Math.max(pending.baseRev, opts.baseRev);
      await db.outbox.put(op);
    } else {
      // A record created here whose create is already out: the create makes rev 1 on the server.
      const baseRev = opts.baseRev ?? (rec.rev > 0 ? rec.rev : 1);
      const base = Object.fromEntries(changed.map((k) => [k, rec[k] ?? null]));
      op = newOp(entity, id, baseRev, 'upsert', fields, base, now);
      op.seq = await db.outbox.add(op);
    }
    await table.put({ ...rec, ...fields });
    return op;
  });
}

/**
 * Creates a record on this device (rev 0 until the server has it) and queues its create. The
 * fields are the entity's parsed fields (`validated(entity, …)`), so the stored copy is a
 * `LocalRecord<E>` with every defaulted field set.
 */
export async function createRecord<E extends SyncEntityName>(
  db: FluxDb,
  entity: E,
  fields: EntityFields<E>,
  opts: { id?: string; now?: Date } = {},
): Promise<LocalRecord<E>> {
  const table = db.anyRecords(entity);
  const id = opts.id ?? uuidv4();
  const now = nowIso(opts.now);
  const clean = editableFields(fields);
  const rec: RecordBag = { ...clean, id, rev: 0, deleted: false };
  await db.transaction('rw', [table, db.outbox], async () => {
    if (await table.get(id)) throw new Error(`A ${entity} with id ${id} already exists on this device`);
    await table.add(rec);
    await db.outbox.add(newOp(entity, id, null, 'upsert', clean, {}, now));
  });
  // Boundary: the bag holds E's parsed fields plus the meta set above, which is what LocalRecord<E> says.
  return rec as LocalRecord<E>;
}

/** Deletes a record on this device and queues the delete (or drops an unsent create entirely). */
export async function deleteRecord(db: FluxDb, entity: SyncEntityName, id: string, opts: { now?: Date } = {}): Promise<OutboxOp | null> {
  const table = db.anyRecords(entity);
  const now = nowIso(opts.now);
  return db.transaction('rw', [table, db.outbox], async () => {
    const rec = await table.get(id);
    const pending = await unsentOp(db, entity, id);
    await table.delete(id);
    if (pending && pending.baseRev === null) {
      // Created here and never sent: the server never needs to hear of it.
      await db.outbox.delete(pending.seq!);
      return null;
    }
    if (pending) {
      const op: OutboxOp = { ...pending, op: 'delete', fields: {}, updatedAt: now };
      await db.outbox.put(op);
      return op;
    }
    if (!rec) throw new RecordMissingError(entity, id);
    const op = newOp(entity, id, rec.rev > 0 ? rec.rev : 1, 'delete', {}, {}, now);
    op.seq = await db.outbox.add(op);
    return op;
  });
}
