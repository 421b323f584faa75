import type { StoredRecord } from '../../../../shared/model/stored-record';
import type { FluxDb } from '../db/db-schema';
import { overlay } from '../db/record-values';

/** Sends one attachment's bytes; resolves with the server's record (which then has objectKey). */
export type PutContent = (id: string, mediaType: string, blob: Blob) => Promise<StoredRecord<'attachment'>>;

export interface UploadTally {
  uploaded: number;
  /** Bytes whose record the server has not acknowledged yet (they go after a later push). */
  waiting: number;
}

/**
 * The upload step of a sync round, after push: every blob not yet uploaded whose attachment record
 * the server has (rev > 0) is PUT; the server checks size, type and sha256, so sending again after
 * a lost answer is harmless. The server's answer (with objectKey) replaces the local copy and the
 * blob is marked uploaded; the bytes stay on the device. A failure stops the step and is thrown
 * for the engine's back-off — the blob stays queued, never dropped.
 */
export async function uploadPendingBlobs(db: FluxDb, put: PutContent, now: () => Date = () => new Date()): Promise<UploadTally> {
  const tally: UploadTally = { uploaded: 0, waiting: 0 };
  const pending = await db.blobs.filter((b) => b.uploadedAt === null).toArray();
  for (const row of pending.sort((a, b) => a.createdAt.localeCompare(b.createdAt))) {
    const id = row.attachmentId;
    const rec = await db.records('attachment').get(id);
    if (!rec || rec.rev === 0) {
      tally.waiting++;
      continue;
    }
    // Already stored (the answer was lost after the server kept the bytes, and a pull told us).
    let server: StoredRecord<'attachment'> | null = null;
    if (typeof rec.objectKey !== 'string') {
      try {
        server = await put(id, row.mediaType, row.blob);
      } catch (err) {
        await db.blobs.update(id, { attempts: (row.attempts ?? 0) + 1, lastError: err instanceof Error ? err.message : String(err) });
        throw err;
      }
    }
    await db.transaction('rw', [db.records('attachment'), db.outbox, db.blobs], async () => {
      if (server) {
        const current = await db.records('attachment').get(id);
        // Keep a newer copy (a pull may have brought it) and lay any queued edit over the answer.
        if (!current || current.rev <= server.rev) {
          const ops = await db.outbox.where('[entity+id]').equals(['attachment', id]).sortBy('seq');
          const shown = overlay({ ...server, id }, ops);
          if (shown) await db.anyRecords('attachment').put(shown);
        }
      }
      await db.blobs.update(id, { uploadedAt: now().toISOString(), lastError: null });
    });
    tally.uploaded++;
  }
  return tally;
}
