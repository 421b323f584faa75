import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { Role } from '../../shared/auth/roles';
import { AppError, notFound } from '../core/errors';
import { DATA_LICENCE_IDS } from '../../shared/results/data-licences';
import type { RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { enqueueJob, jobProgress } from '../jobs/job-store';
import { loadSite } from './results-data';
import { defineExportJob, EXPORT_JOB, type ExportRequest } from './results-export';
import { seasonalSummary, temperatureResponses, treatmentSummary } from './results-service';
import { importTemperatureLog, temperatureLogImportSchema } from './temperature-log-import';

/** Results are the lab's work; admins may read them too. */
export const RESULTS_ROLES: readonly Role[] = ['lab', 'admin'];

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Days are YYYY-MM-DD');
const base = z.object({
  siteId: z.string().uuid('siteId must be a UUID'),
  closures: z.enum(['accepted', 'not-rejected']).default('accepted'),
});
const seasonalQuery = base.extend({
  model: z.enum(['lloyd-taylor', 'q10', 'lloyd-taylor-log', 'q10-log']).default('lloyd-taylor'),
  from: day.optional(),
  to: day.optional(),
});
const LICENCE_HELP = `Choose a licence for the data package by its SPDX id: one of ${DATA_LICENCE_IDS.join(', ')}`;
const exportRequest = seasonalQuery.extend({ license: z.enum(DATA_LICENCE_IDS, { message: LICENCE_HELP }) });
const idParams = z.object({ id: z.string().uuid('Export ids are UUIDs') });

export function registerResultsRoutes(r: RouteRegistry, ds: DataSource): void {
  defineExportJob();

  r.add('get', '/api/results/summary', RESULTS_ROLES, (req) => {
    const q = parse(base, req.query, 'Some result filters are not valid');
    return treatmentSummary(ds, q.siteId, q.closures);
  });
  r.add('get', '/api/results/responses', RESULTS_ROLES, (req) => {
    const q = parse(base, req.query, 'Some result filters are not valid');
    return temperatureResponses(ds, q.siteId, q.closures);
  });
  r.add('get', '/api/results/seasonal', RESULTS_ROLES, (req) => {
    const q = parse(seasonalQuery, req.query, 'Some result filters are not valid');
    return seasonalSummary(ds, q.siteId, q.closures, q);
  });
  r.add('post', '/api/results/exports', RESULTS_ROLES, async (req, res) => {
    const body = (req.body ?? {}) as { license?: unknown };
    // A package without a licence is one a repository cannot publish and a stranger cannot reuse.
    if (typeof body.license !== 'string' || !DATA_LICENCE_IDS.includes(body.license)) {
      throw new AppError(400, LICENCE_HELP, [
        {
          path: 'license',
          message: body.license === undefined ? 'No licence was chosen' : `${String(body.license)} is not one of the listed licences`,
        },
      ]);
    }
    const q = parse(exportRequest, body, 'Some export settings are not valid');
    await loadSite(ds, q.siteId);
    const data: ExportRequest = { siteId: q.siteId, selection: q.closures, model: q.model, license: q.license, userId: req.user!.id };
    const jobId = await ds.transaction((em) => enqueueJob(em, EXPORT_JOB, { ...data }, { siteId: q.siteId, createdBy: req.user!.id }));
    res.status(202);
    return { jobId };
  });
  r.add('get', '/api/results/exports/:id', RESULTS_ROLES, async (req) => {
    const { id } = parse(idParams, req.params);
    const job = await jobProgress(ds, id);
    if (!job || job.name !== EXPORT_JOB) throw notFound(`No export ${id}`);
    return { job };
  });
  r.add('get', '/api/results/exports/:id/file', RESULTS_ROLES, async (req, res) => {
    const { id } = parse(idParams, req.params);
    const [f] = await ds.query(`SELECT file_name, sha256, bytes FROM result_export WHERE id = $1`, [id]);
    if (!f) throw notFound(`Export ${id} is not ready or does not exist`);
    res.setHeader('Content-Type', 'application/zip');
    res.setHeader('Content-Disposition', `attachment; filename="${f.file_name}"`);
    res.setHeader('X-Content-SHA256', f.sha256);
    res.end(f.bytes);
  });
  r.add('post', '/api/results/temperature-logs/import', RESULTS_ROLES, async (req, res) => {
    const body = parse(temperatureLogImportSchema, req.body, 'The temperature log import is not valid');
    const out = await importTemperatureLog(ds, req.user!, body);
    res.status(201);
    return out;
  });
}
