import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { seesAllSites, type Role } from '../../shared/auth/roles';
import { notFound } from '../core/errors';
import type { RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { jobProgress, recentJobs } from './job-store';

/** Jobs so far recompute fluxes; those who review or manage sites follow them. */
export const JOB_READERS: readonly Role[] = ['lab', 'lead', 'admin'];

const idParams = z.object({ id: z.string().uuid('Job ids are UUIDs') });
const listQuery = z.object({
  name: z
    .string()
    .regex(/^[a-z][a-z0-9-]*$/)
    .optional(),
  limit: z.coerce.number().int().min(1).max(100).default(20),
});

export function registerJobRoutes(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/jobs', JOB_READERS, async (req) => {
    const q = parse(listQuery, req.query, 'Some job filters are not valid');
    const user = req.user!;
    return { items: await recentJobs(ds, q.name ?? null, seesAllSites(user.roles) ? null : user.siteIds, q.limit) };
  });
  r.add('get', '/api/jobs/:id', JOB_READERS, async (req) => {
    const { id } = parse(idParams, req.params);
    const job = await jobProgress(ds, id);
    const user = req.user!;
    if (!job || (job.siteId && !seesAllSites(user.roles) && !user.siteIds.includes(job.siteId))) throw notFound(`No job ${id}`);
    return { job };
  });
}
