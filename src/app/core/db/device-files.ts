import type { EntityFields } from '../../../../shared/model/entities';
import type { AttachmentOwner } from '../../../../shared/model/field-records';
import type { FluxDb } from './db-schema';
import { createRecord } from './outbox-writer';
import { validated } from './validated';

export interface FileOwner {
  siteId: string;
  ownerEntity: AttachmentOwner;
  ownerId: string;
}

export async function sha256Hex(blob: Blob): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', await blob.arrayBuffer());
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * The attachment record of a file (size, SHA-256, type; checked by the shared schema), ready to
 * keep. Hashing is asynchronous work outside IndexedDB, so it is done before any transaction opens
 * (a Dexie transaction commits as soon as it waits on something else).
 */
export async function attachmentFor(
  owner: FileOwner,
  blob: Blob,
  fileName: string,
  mediaType: string,
): Promise<EntityFields<'attachment'>> {
  return validated('attachment', { ...owner, fileName, mediaType, sizeBytes: blob.size, sha256: await sha256Hex(blob) });
}

/**
 * Keeps a file on the device: its attachment record (queued for sync) and its bytes in the blobs
 * table, in ONE transaction — never a record without its bytes or bytes without a record. Called
 * inside a wider transaction (one that also covers these tables), it joins that one. The bytes
 * are uploaded later, from the blobs table, once the record has synced.
 */
export async function keepFile(db: FluxDb, fields: EntityFields<'attachment'>, blob: Blob): Promise<string> {
  return db.transaction('rw', [db.records('attachment'), db.outbox, db.blobs], async () => {
    const rec = await createRecord(db, 'attachment', fields);
    await db.blobs.put({
      attachmentId: rec.id,
      blob,
      mediaType: fields.mediaType,
      createdAt: new Date().toISOString(),
      uploadedAt: null,
    });
    return rec.id;
  });
}

/** A text file's media type from its name (the server accepts these three for text). */
export function textMediaType(fileName: string): 'text/csv' | 'text/tab-separated-values' | 'text/plain' {
  if (/\.csv$/i.test(fileName)) return 'text/csv';
  if (/\.tsv$/i.test(fileName)) return 'text/tab-separated-values';
  return 'text/plain';
}
