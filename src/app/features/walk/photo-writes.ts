import { Injectable, inject } from '@angular/core';
import type { FileOwner } from '../../core/db/device-files';
import { LocalWrites } from '../../core/sync/local-writes';

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

export interface PhotoOwner extends FileOwner {
  ownerEntity: 'collar' | 'collarEvent' | 'visit';
}

/** Keeps a photo on the device (record and bytes in one transaction; see keepFile) and asks for a sync. */
@Injectable({ providedIn: 'root' })
export class PhotoWrites {
  private readonly writes = inject(LocalWrites);

  keep(owner: PhotoOwner, blob: Blob, fileName: string): Promise<string> {
    return this.writes.keepFile(owner, { blob, fileName, mediaType: blob.type || 'image/jpeg' });
  }
}
