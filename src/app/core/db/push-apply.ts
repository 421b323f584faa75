import type { PushResult, SyncOp, SyncStatus } from '../../../../shared/sync/sync-wire';
import type { FluxDb, LocalRecord, OutboxOp } from './db-schema';
import { nowIso, overlay } from './record-values';

/** Push bodies stay well under the server's 5 MiB limit, with room for the envelope. */
export const PUSH_BUDGET_BYTES = 4 * 1024 * 1024;
export const PUSH_MAX_OPS = 500;

const encoder = new TextEncoder();

export function toWire(op: OutboxOp): SyncOp {
  return { opId: op.opId, entity: op.entity, id: op.id, baseRev: op.baseRev, op: op.op, fields: op.fields };
}

/**
 * The next batch: oldest first, one op per record (a second op on the same record waits for the
 * first one's answer, whose rev becomes its base), within the byte budget. An op bigger than the
 * budget goes alone. The ops are marked sent in the same transaction, so an edit made while the
 * request is out becomes a new op instead of changing one the server may already have applied.
 */
export async function takeBatch(db: FluxDb, budget = PUSH_BUDGET_BYTES, maxOps = PUSH_MAX_OPS, now = new Date()): Promise<OutboxOp[]> {
  return db.transaction('rw', db.outbox, async () => {
    const seen = new Set<string>();
    const batch: OutboxOp[] = [];
    let bytes = 0;
    await db.outbox
      .orderBy('seq')
      .until(() => batch.length >= maxOps)
      .each((op) => {
        const key = `${op.entity}:${op.id}`;
        if (seen.has(key)) return;
        seen.add(key);
        const size = encoder.encode(JSON.stringify(toWire(op))).length + 1;
        if (batch.length && bytes + size > budget) return;
        if (!batch.length || bytes + size <= budget) {
          batch.push(op);
          bytes += size;
        }
      });
    const sentAt = nowIso(now);
    for (const op of batch) if (op.sentAt === null) await db.outbox.update(op.seq!, { sentAt });
    return batch;
  });
}

export interface PushTally {
  done: number;
  conflicts: number;
  rejected: number;
}

/** What an answer means for the device: a replay reports the first answer's status. */
export function effectiveStatus(r: PushResult): SyncStatus {
  if (r.status === 'duplicate' && r.originalStatus && r.originalStatus !== 'duplicate') return r.originalStatus;
  return r.status;
}

/** Puts the edited fields back to their base values (where known); a create is removed. */
function revert(rec: LocalRecord | undefined, op: OutboxOp): LocalRecord | null {
  if (op.baseRev === null) return null;
  if (!rec) return null;
  return { ...rec, ...op.base };
}

/**
 * Applies one push answer in one transaction: acknowledged ops leave the outbox and their record
 * takes the server's copy (with later queued ops laid over it, rebased on the new rev); conflicts
 * go to the conflicts list; rejected ops go to the rejected list with the server's message.
 */
export async function applyPushResults(db: FluxDb, sent: OutboxOp[], results: PushResult[], now = new Date()): Promise<PushTally> {
  const tally: PushTally = { done: 0, conflicts: 0, rejected: 0 };
  // Only the tables of the answered ops: a transaction over every table costs the device more on each push.
  const tables = [...new Set(sent.map((op) => op.entity))].map((e) => db.anyRecords(e));
  const byOpId = new Map(results.map((r) => [r.opId, r]));
  const at = nowIso(now);
  await db.transaction('rw', [...tables, db.outbox, db.conflicts, db.rejected, db.acked], async () => {
    for (const op of sent) {
      const r = byOpId.get(op.opId);
      if (!r) continue; // no answer for it: it stays queued and goes out again (same opId, so at most once)
      const table = db.anyRecords(op.entity);
      const status = effectiveStatus(r);
      await db.outbox.delete(op.seq!);
      const later = await db.outbox.where('[entity+id]').equals([op.entity, op.id]).sortBy('seq');
      const local = await table.get(op.id);
      let server: LocalRecord | null;
      if (status === 'applied' || status === 'merged' || status === 'duplicate') {
        tally.done++;
        await db.acked.put({ opId: op.opId, at });
        if (r.rev !== undefined) {
          for (const next of later) {
            if (next.baseRev !== null && next.baseRev < r.rev) await db.outbox.update(next.seq!, { baseRev: r.rev });
            else if (next.baseRev === null && op.baseRev === null) await db.outbox.update(next.seq!, { baseRev: r.rev });
          }
        }
        if (op.op === 'delete') server = null;
        else if (r.record) server = { ...r.record, id: op.id, rev: r.rev ?? Number(r.record['rev']) } as LocalRecord;
        else server = local ? { ...local, rev: Math.max(local.rev, r.rev ?? local.rev) } : null;
      } else if (status === 'conflict') {
        tally.conflicts++;
        const theirs = r.conflict?.server ?? r.record ?? null;
        await db.conflicts.put({
          opId: op.opId,
          entity: op.entity,
          recordId: op.id,
          fields: r.conflict?.fields ?? Object.keys(op.fields),
          mine: op.fields,
          base: op.base,
          theirs,
          serverRev: r.conflict?.serverRev ?? r.rev ?? 0,
          wasDelete: op.op === 'delete',
          at,
        });
        server =
          theirs && !theirs['deleted']
            ? ({ ...theirs, id: op.id, rev: r.conflict?.serverRev ?? Number(theirs['rev']) } as LocalRecord)
            : revert(local, op);
      } else {
        tally.rejected++;
        await db.rejected.put({
          opId: op.opId,
          entity: op.entity,
          id: op.id,
          op: op.op,
          fields: op.fields,
          baseRev: op.baseRev,
          message: r.error?.message ?? 'The server refused this change',
          problems: r.error?.fields ?? [],
          at,
        });
        server = revert(local, op);
      }
      const shown = overlay(server, later);
      if (shown) await table.put(shown);
      else await table.delete(op.id);
    }
  });
  return tally;
}
