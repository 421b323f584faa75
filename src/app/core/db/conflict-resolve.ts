import type { ConflictRow, FluxDb, LocalRecord } from './db-schema';
import { unsentOp } from './outbox-writer';
import { nowIso, overlay } from './record-values';
import { v4 as uuidv4 } from 'uuid';

export type Side = 'mine' | 'theirs';

/** The fields the resolution sends: my fields the server did not touch, plus each conflicting field the person kept. */
export function resolutionFields(c: ConflictRow, choice: Record<string, Side>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(c.mine)) {
    if (!c.fields.includes(k) || choice[k] === 'mine') out[k] = v;
  }
  return out;
}

/**
 * Settles a conflict in one transaction: the server's copy becomes the local base, and whatever
 * the person kept of theirs is queued as a new op based on the server's rev (so it applies
 * cleanly). Keeping all of theirs queues nothing.
 */
export async function resolveConflict(db: FluxDb, c: ConflictRow, choice: Record<string, Side>, now = new Date()): Promise<string | null> {
  const table = db.anyRecords(c.entity);
  const at = nowIso(now);
  return db.transaction('rw', [table, db.outbox, db.conflicts], async () => {
    await db.conflicts.delete(c.opId);
    const local = await table.get(c.recordId);
    // The server's copy at its rev (an entity named at run time: the untyped bag); a tombstone is no copy.
    const copy: LocalRecord | null = c.theirs ? { ...c.theirs, id: c.recordId, rev: c.serverRev } : null;
    const theirs = copy && !copy.deleted ? copy : null;
    let server: LocalRecord | null = local ?? null;
    if (theirs && (!local || local.rev <= c.serverRev)) server = theirs;
    const pending = await unsentOp(db, c.entity, c.recordId);
    const keepMineDelete = c.wasDelete && Object.values(choice).some((s) => s === 'mine');
    const fields = c.wasDelete ? {} : resolutionFields(c, choice);
    if (!keepMineDelete && !Object.keys(fields).length) {
      const shown = overlay(server, pending ? [pending] : []);
      if (shown) await table.put(shown);
      return null;
    }
    const opId = uuidv4();
    if (pending) {
      // An edit queued after the conflicted one: the resolution joins it on the server's rev.
      await db.outbox.put({
        ...pending,
        op: keepMineDelete ? 'delete' : pending.op,
        fields: keepMineDelete ? {} : { ...fields, ...pending.fields },
        baseRev: pending.baseRev === null ? null : Math.max(pending.baseRev, c.serverRev),
        updatedAt: at,
      });
    } else {
      await db.outbox.add({
        opId,
        entity: c.entity,
        id: c.recordId,
        baseRev: c.serverRev,
        op: keepMineDelete ? 'delete' : 'upsert',
        fields,
        base: theirs ? Object.fromEntries(Object.keys(fields).map((k) => [k, theirs[k] ?? null])) : {},
        sentAt: null,
        createdAt: at,
        updatedAt: at,
      });
    }
    const after = await unsentOp(db, c.entity, c.recordId);
    const shown = overlay(server, after ? [after] : []);
    if (shown) await table.put(shown);
    else await table.delete(c.recordId);
    return pending?.opId ?? opId;
  });
}
