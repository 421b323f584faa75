import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import { AppError, notFound } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { toWire } from '../records/wire';
import { AttachmentEntity } from './attachment.entity';
import type { ObjectStorage } from './object-storage';

async function readable(ds: DataSource, user: SessionUser, id: string): Promise<AttachmentEntity> {
  const a = await ds.getRepository(AttachmentEntity).findOneBy({ id });
  if (!a || a.deleted || (!seesAllSites(user.roles) && !user.siteIds.includes(a.siteId))) {
    throw notFound('No such attachment: sync its record first, then send the bytes');
  }
  return a;
}

/**
 * Stores the bytes of an attachment whose record already synced. Size, media type and sha256
 * must match the record, so a retry after a lost answer is harmless and a corrupt upload is
 * refused. On success the record gets its objectKey (a new rev, so devices learn it is safe).
 */
export async function storeAttachmentContent(
  ds: DataSource,
  storage: ObjectStorage,
  user: SessionUser,
  id: string,
  body: Buffer,
  mediaType: string | undefined,
): Promise<Record<string, unknown>> {
  const a = await readable(ds, user, id);
  if (body.length !== a.sizeBytes) {
    throw new AppError(400, `The file has ${body.length} bytes but its record says ${a.sizeBytes}; nothing was stored`);
  }
  if ((mediaType ?? '').split(';')[0].trim() !== a.mediaType) {
    throw new AppError(415, `The file was sent as ${mediaType ?? 'no type'} but its record says ${a.mediaType}`);
  }
  const sha256 = createHash('sha256').update(body).digest('hex');
  if (sha256 !== a.sha256) throw new AppError(400, 'The file does not match its checksum (sha256); send it again');
  const key = `sites/${a.siteId}/attachments/${a.id}`;
  if (a.objectKey === key && (await storage.exists(key))) return toWire(a); // a retry: already stored
  await storage.put(key, body, a.mediaType, sha256);
  return ds.transaction(async (em) => {
    // TypeORM answers an UPDATE … RETURNING as [rows, affected].
    const [[row]] = await em.query(
      `UPDATE attachment SET object_key = $2, rev = rev + 1, updated_at = now(), updated_by = $3 WHERE id = $1 RETURNING rev`,
      [a.id, key, user.id],
    );
    const changes = new ChangeBuffer();
    changes.add({
      entity: 'attachment',
      recordId: a.id,
      rev: Number(row.rev),
      siteId: a.siteId,
      fields: ['objectKey'],
      deleted: false,
      userId: user.id,
      deviceId: null,
    });
    await changes.flush(em);
    return toWire((await em.getRepository(AttachmentEntity).findOneBy({ id: a.id }))!);
  });
}

export async function attachmentContent(ds: DataSource, storage: ObjectStorage, user: SessionUser, id: string) {
  const a = await readable(ds, user, id);
  if (!a.objectKey) throw new AppError(404, 'The file has not reached the server yet: its device has not uploaded it');
  const obj = await storage.get(a.objectKey);
  return { ...obj, fileName: a.fileName, mediaType: a.mediaType };
}
