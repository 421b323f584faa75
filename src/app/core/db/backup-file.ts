import { SYNC_ENTITIES, type SyncEntityName } from '../../../../shared/model/entity-names';
import { META, type ConflictRow, type FluxDb, type OutboxOp, type RejectedOp } from './db-schema';
import { overlay } from './record-values';

export const BACKUP_FORMAT = 'fluxwalk-backup';
export const BACKUP_VERSION = 1;

/** Everything on a device the server does not have yet, in a file the person can keep or send. */
export interface BackupFile {
  format: typeof BACKUP_FORMAT;
  version: number;
  createdAt: string;
  user: { id: string; email: string; displayName: string };
  deviceId: string | null;
  outbox: Omit<OutboxOp, 'seq'>[];
  conflicts: ConflictRow[];
  rejected: RejectedOp[];
}

export class BackupFileError extends Error {}

export async function makeBackup(db: FluxDb, user: BackupFile['user'], now = new Date()): Promise<BackupFile> {
  return db.transaction('r', [db.outbox, db.conflicts, db.rejected, db.meta], async () => {
    const device = await db.meta.get(META.deviceId);
    return {
      format: BACKUP_FORMAT,
      version: BACKUP_VERSION,
      createdAt: now.toISOString(),
      user,
      deviceId: typeof device?.value === 'string' ? device.value : null,
      outbox: (await db.outbox.orderBy('seq').toArray()).map(({ seq: _seq, ...op }) => op),
      conflicts: await db.conflicts.toArray(),
      rejected: await db.rejected.toArray(),
    };
  });
}

const ENTITIES = new Set<string>(SYNC_ENTITIES);

function isOp(v: unknown): v is Omit<OutboxOp, 'seq'> {
  const o = v as Partial<OutboxOp> | null;
  return (
    !!o &&
    typeof o.opId === 'string' &&
    typeof o.id === 'string' &&
    ENTITIES.has(String(o.entity)) &&
    (o.op === 'upsert' || o.op === 'delete') &&
    typeof o.fields === 'object' &&
    o.fields !== null &&
    (o.baseRev === null || typeof o.baseRev === 'number')
  );
}

/** Reads a backup file's text; a file that is not one says so in words. */
export function parseBackup(text: string): BackupFile {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new BackupFileError('This file is not a Fluxwalk backup file (it is not JSON).');
  }
  const b = raw as Partial<BackupFile> | null;
  if (!b || b.format !== BACKUP_FORMAT) throw new BackupFileError('This file is not a Fluxwalk backup file.');
  if (typeof b.version !== 'number' || b.version > BACKUP_VERSION)
    throw new BackupFileError('This backup file comes from a newer Fluxwalk: update the app first.');
  if (!b.user || typeof b.user.id !== 'string') throw new BackupFileError('This backup file does not say whose work it holds.');
  if (!Array.isArray(b.outbox) || !b.outbox.every(isOp)) throw new BackupFileError('The changes in this backup file cannot be read.');
  return {
    ...b,
    conflicts: Array.isArray(b.conflicts) ? b.conflicts : [],
    rejected: Array.isArray(b.rejected) ? b.rejected : [],
  } as BackupFile;
}

export interface ImportTally {
  queued: number;
  skipped: number;
}

/**
 * Queues a backup's ops on this device for the same user, skipping ops this device already holds
 * or has had acknowledged (the server would answer `duplicate` for them anyway). Imported ops keep
 * their opIds, so an op applied from the original device is never applied twice.
 */
export async function importBackup(db: FluxDb, file: BackupFile, userId: string): Promise<ImportTally> {
  if (file.user.id !== userId) {
    throw new BackupFileError(
      `This backup file holds the work of ${file.user.email}; only they can load it. It can still be opened read-only.`,
    );
  }
  const tables = SYNC_ENTITIES.map((e) => db.anyRecords(e));
  const tally: ImportTally = { queued: 0, skipped: 0 };
  await db.transaction('rw', [...tables, db.outbox, db.acked, db.rejected], async () => {
    for (const op of file.outbox) {
      const known =
        (await db.outbox.where('opId').equals(op.opId).count()) || (await db.acked.get(op.opId)) || (await db.rejected.get(op.opId));
      if (known) {
        tally.skipped++;
        continue;
      }
      await db.outbox.add({ ...op, base: op.base ?? {}, sentAt: null });
      const table = db.anyRecords(op.entity as SyncEntityName);
      const shown = overlay((await table.get(op.id)) ?? null, [{ ...op, sentAt: null }]);
      if (shown) await table.put(shown);
      else await table.delete(op.id);
      tally.queued++;
    }
    for (const r of file.rejected) if (!(await db.rejected.get(r.opId))) await db.rejected.put(r);
  });
  return tally;
}

export interface BackupSummaryRow {
  entity: string;
  id: string;
  op: 'upsert' | 'delete';
  created: boolean;
  fields: string[];
  at: string;
}

/** A read-only view of someone's backup (a lead checking a crew's progress without signal). */
export function summarizeBackup(file: BackupFile): BackupSummaryRow[] {
  return file.outbox.map((op) => ({
    entity: op.entity,
    id: op.id,
    op: op.op,
    created: op.baseRev === null,
    fields: Object.keys(op.fields),
    at: op.updatedAt,
  }));
}
