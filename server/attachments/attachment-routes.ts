import express from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { MAX_ATTACHMENT_BYTES } from '../../shared/model/field-records';
import { AppError } from '../core/errors';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { attachmentContent, storeAttachmentContent } from './attachment-content';
import type { ObjectStorage } from './object-storage';

const idParam = z.object({ id: z.string().uuid('Attachment ids are UUIDs') });

/** Bytes of logger files and photos: PUT after the attachment record synced; GET for the lab and leads. */
export function registerAttachmentRoutes(r: RouteRegistry, ds: DataSource, storage: ObjectStorage | null): void {
  const need = (): ObjectStorage => {
    if (!storage) throw new AppError(503, 'File storage is not configured on this server (S3_ENDPOINT, S3_BUCKET)');
    return storage;
  };
  const raw = express.raw({ type: () => true, limit: MAX_ATTACHMENT_BYTES });

  r.add(
    'put',
    '/api/attachments/:id/content',
    ['crew', 'lead', 'admin'],
    async (req) => {
      const { id } = parse(idParam, req.params);
      const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
      return { record: await storeAttachmentContent(ds, need(), req.user!, id, body, req.headers['content-type']) };
    },
    [raw],
  );

  r.add('get', '/api/attachments/:id/content', ALL_ROLES, async (req, res) => {
    const { id } = parse(idParam, req.params);
    const file = await attachmentContent(ds, need(), req.user!, id);
    res.setHeader('Content-Type', file.mediaType);
    res.setHeader('Content-Disposition', `attachment; filename="${file.fileName.replace(/[^\w.-]/g, '_') || id}"`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    await new Promise<void>((resolve, reject) => file.body.pipe(res).on('finish', resolve).on('error', reject));
  });
}
