import { SYNC_ENTITIES, type SyncEntityName } from '../../../../shared/model/entity-names';
import type { PullAnswer } from '../../../../shared/sync/sync-wire';
import { META, type FluxDb, type LocalRecord, type OutboxOp } from './db-schema';
import { overlay } from './record-values';

const KNOWN = new Set<string>(SYNC_ENTITIES);

function opsByRecord(ops: OutboxOp[]): Map<string, OutboxOp[]> {
  const map = new Map<string, OutboxOp[]>();
  for (const op of ops) {
    const key = `${op.entity}:${op.id}`;
    map.set(key, [...(map.get(key) ?? []), op]);
  }
  return map;
}

export async function readCursor(db: FluxDb): Promise<number> {
  const row = await db.meta.get(META.cursor);
  return typeof row?.value === 'number' ? row.value : 0;
}

/**
 * Writes one pull page and the new cursor in one transaction, so a crash never leaves the cursor
 * ahead of the records. Each copy gets its schema's defaults for fields it lacks (pulled-record.ts). Queued ops stay laid over the server's copy (the person keeps seeing
 * their edit until the push answers), and a copy newer than the page (from a push answer) is kept.
 */
export async function applyPullPage(db: FluxDb, answer: PullAnswer, opts: { fresh?: boolean } = {}): Promise<number> {
  const byEntity = new Map<SyncEntityName, PullAnswer['changes']>();
  for (const c of answer.changes) {
    if (!KNOWN.has(c.entity)) continue; // a newer server may sync more entities than this build knows
    const e = c.entity as SyncEntityName;
    const list = byEntity.get(e);
    if (list) list.push(c);
    else byEntity.set(e, [c]);
  }
  // Only the tables this page touches: a narrower transaction is measurably cheaper on big pulls.
  const tables = [...byEntity.keys()].map((e) => db.anyRecords(e));
  // Loaded before the transaction (an import inside it would let the transaction end); zod stays out of the first chunks.
  const { pulledRecord } = await import('./pulled-record');
  let written = 0;
  await db.transaction('rw', [...tables, db.outbox, db.meta], async () => {
    const pending = (await db.outbox.count()) ? opsByRecord(await db.outbox.orderBy('seq').toArray()) : new Map<string, OutboxOp[]>();
    for (const [entity, changes] of byEntity) {
      const table = db.anyRecords(entity);
      // A download from cursor 0 has no newer copies to protect (created-here records are rev 0).
      const current = opts.fresh ? [] : await table.bulkGet(changes.map((c) => c.id));
      const puts: LocalRecord[] = [];
      const deletes: string[] = [];
      changes.forEach((c, i) => {
        const have = current[i];
        // Removals for lost access always apply; otherwise a newer copy (from a push answer) wins.
        if (have && have.rev > c.rev && c.reason !== 'access') return;
        const ops = pending.size ? (pending.get(`${entity}:${c.id}`) ?? []) : [];
        // The same rev is the same copy (every server change bumps it): typically this device's own
        // change, stored from the push answer. Writing it again would wake every live query on the table.
        if (have && have.rev === c.rev && !c.deleted && c.record && !ops.length && c.reason !== 'access') return;
        const server = c.deleted || !c.record ? null : pulledRecord(entity, { ...c.record, id: c.id, rev: c.rev });
        const shown = c.reason === 'access' ? null : overlay(server, ops);
        if (shown) puts.push(shown);
        else if (have) deletes.push(c.id);
      });
      if (puts.length) await table.bulkPut(puts);
      if (deletes.length) await table.bulkDelete(deletes);
      written += puts.length + deletes.length;
    }
    await db.meta.put({ key: META.cursor, value: answer.cursor });
  });
  return written;
}

/**
 * After a 410 (the device was away longer than the server keeps deletions): forget every server
 * copy and the cursor, keep the outbox, conflicts and rejected ops, and put back records created
 * here that the server has not seen yet. A full pull then lays the queued edits over fresh copies.
 */
export async function resetForRedownload(db: FluxDb): Promise<void> {
  const tables = SYNC_ENTITIES.map((e) => db.anyRecords(e));
  await db.transaction('rw', [...tables, db.outbox, db.meta], async () => {
    await Promise.all(tables.map((t) => t.clear()));
    const ops = await db.outbox.orderBy('seq').toArray();
    for (const [, recordOps] of opsByRecord(ops)) {
      if (recordOps[0].baseRev !== null) continue;
      const rec = overlay(null, recordOps);
      if (rec) await db.anyRecords(recordOps[0].entity).put(rec);
    }
    await db.meta.put({ key: META.cursor, value: 0 });
  });
}
