import type { Response } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { importRequestSchema } from './collar-csv';
import { commitCollarImport, previewCollarImport } from './collar-import';
import { blankTagQuerySchema, blankTagSheet, collarTagSheet, tagQuerySchema } from './collar-tags-pdf';
import { createProfileVersion, newVersionSchema, previewSchema, profileUsage, recomputePreview } from './profile-versions';

const siteParam = z.object({ siteId: z.string().uuid('Site ids are UUIDs') });
const idParam = z.object({ id: z.string().uuid('Chamber profile ids are UUIDs') });

const SITE_KEEPERS = ['lead', 'admin'] as const;
const ADMIN = ['admin'] as const;

/** A tag sheet as a download named after the site and paper, with the tag count for scripts. */
function sendTagSheet(res: Response, sheet: { pdf: Buffer; count: number; siteName: string }, kind: string, paper: string): void {
  const site =
    sheet.siteName
      .replace(/[^A-Za-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .toLowerCase() || 'site';
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `attachment; filename="${kind}-${site}-${paper}.pdf"`);
  res.setHeader('X-Tag-Count', String(sheet.count));
  res.send(sheet.pdf);
}

/**
 * Setup work that is more than one record: collar import (preview, then all-or-nothing commit),
 * the printable tag sheet, and chamber-profile versions. Registered before the generic record
 * routes. Profile edits and deletes, and a collar's own treatment, are guarded in the writer, on every path.
 */
export function registerSetupRoutes(r: RouteRegistry, ds: DataSource, appOrigin: string): void {
  r.add('post', '/api/sites/:siteId/collar-import/preview', SITE_KEEPERS, async (req) => {
    const { siteId } = parse(siteParam, req.params);
    return previewCollarImport(ds, req.user!, siteId, parse(importRequestSchema, req.body, 'The import request is not valid'));
  });

  r.add('post', '/api/sites/:siteId/collar-import/commit', SITE_KEEPERS, async (req, res) => {
    const { siteId } = parse(siteParam, req.params);
    const result = await commitCollarImport(ds, req.user!, siteId, parse(importRequestSchema, req.body, 'The import request is not valid'));
    res.status(201);
    return result;
  });

  r.add('get', '/api/sites/:siteId/collar-tags.pdf', SITE_KEEPERS, async (req, res) => {
    const { siteId } = parse(siteParam, req.params);
    const q = parse(tagQuerySchema, req.query, 'The tag sheet options are not valid');
    sendTagSheet(res, await collarTagSheet(ds, req.user!, siteId, q, appOrigin), 'collar-tags', q.paper);
  });

  r.add('get', '/api/sites/:siteId/blank-collar-tags.pdf', SITE_KEEPERS, async (req, res) => {
    const { siteId } = parse(siteParam, req.params);
    const q = parse(blankTagQuerySchema, req.query, 'The blank tag options are not valid');
    sendTagSheet(res, await blankTagSheet(ds, req.user!, siteId, q, appOrigin), 'new-collar-tags', q.paper);
  });

  r.add('get', '/api/chamber-profiles/:id/usage', ['lead', 'lab', 'admin'], async (req) => {
    const { id } = parse(idParam, req.params);
    return profileUsage(ds, req.user!, id);
  });

  r.add('post', '/api/sites/:siteId/chamber-profiles/recompute-preview', ADMIN, async (req) => {
    const { siteId } = parse(siteParam, req.params);
    const { validFrom } = parse(previewSchema, req.body);
    return recomputePreview(ds, req.user!, siteId, validFrom);
  });

  r.add('post', '/api/chamber-profiles/:id/versions', ADMIN, async (req, res) => {
    const { id } = parse(idParam, req.params);
    const result = await createProfileVersion(
      ds,
      req.user!,
      id,
      parse(newVersionSchema, req.body, 'Some chamber profile fields are not valid'),
    );
    res.status(201);
    return result;
  });
}
