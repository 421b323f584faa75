import { Injectable, inject } from '@angular/core';
import { DeviceDb } from '../../core/db/device-db';
import { createRecord } from '../../core/db/outbox-writer';
import { SyncEngine } from '../../core/sync/sync-engine';
import { validated } from './visit-writes';

/** Longest edge of a stored photo, px: enough to see a collar and its surroundings, ~0.3–0.6 MB as JPEG. */
export const PHOTO_MAX_EDGE = 1600;
const PHOTO_QUALITY = 0.85;

/** Resizes a camera photo on the device (canvas), so a day of photos fits the phone and a weak uplink. */
export async function resizePhoto(file: Blob, maxEdge = PHOTO_MAX_EDGE): Promise<{ blob: Blob; width: number; height: number }> {
  const bitmap = await createImageBitmap(file);
  const scale = Math.min(1, maxEdge / Math.max(bitmap.width, bitmap.height));
  const width = Math.max(1, Math.round(bitmap.width * scale));
  const height = Math.max(1, Math.round(bitmap.height * scale));
  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  canvas.getContext('2d')!.drawImage(bitmap, 0, 0, width, height);
  bitmap.close();
  const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/jpeg', PHOTO_QUALITY));
  if (!blob) throw new Error('The photo could not be converted on this device');
  return { blob, width, height };
}

export async function sha256Hex(blob: Blob): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', await blob.arrayBuffer());
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

export interface PhotoOwner {
  siteId: string;
  ownerEntity: 'collar' | 'collarEvent' | 'visit';
  ownerId: string;
}

/**
 * Keeps a photo on the device: the attachment record (with its size and SHA-256, queued for sync)
 * and the bytes in the blobs table, in ONE Dexie transaction — there is never a record without
 * its bytes or bytes without a record. The upload of the bytes happens later, from the blobs table.
 */
@Injectable({ providedIn: 'root' })
export class PhotoStore {
  private readonly deviceDb = inject(DeviceDb);
  private readonly engine = inject(SyncEngine);

  async keep(owner: PhotoOwner, blob: Blob, fileName: string): Promise<string> {
    const fields = validated('attachment', {
      ...owner, fileName, mediaType: blob.type || 'image/jpeg', sizeBytes: blob.size, sha256: await sha256Hex(blob),
    });
    const id = await this.deviceDb.run(async (db) =>
      db.transaction('rw', [db.records('attachment'), db.outbox, db.blobs], async () => {
        const rec = await createRecord(db, 'attachment', fields);
        await db.blobs.put({ attachmentId: rec.id, blob, mediaType: String(fields['mediaType']), createdAt: new Date().toISOString(), uploadedAt: null });
        return rec.id;
      }),
    );
    this.engine.requestSync('create');
    return id;
  }
}
