import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { Role } from '../../shared/auth/roles';
import { notFound } from '../core/errors';
import type { RouteRegistry } from '../core/route-registry';
import { queueFilterSchema } from '../../shared/bench/review-wire';
import { excludePointsSchema, restorePointsSchema } from '../../shared/model/point-exclusion';
import { parse } from '../core/validate';
import { answer } from '../records/record-routes';
import { siteForActor } from '../setup/site-access';
import { bulkAccept } from './bulk-accept';
import { closureDetail } from './closure-detail';
import { closureHistory } from './closure-history';
import { changeExclusions } from './point-exclusions';
import { moveClosure, moveClosureSchema } from './closure-move';
import { defineRecomputeJob, requestSiteRecompute } from './recompute-triggers';
import { queueItem, reviewQueue } from './review-queue';

/** The Bench is the lab's; leads and admins may look (decisions stay the lab's: the writer enforces it). */
const BENCH_READERS: readonly Role[] = ['lab', 'lead', 'admin'];
const idParams = z.object({ id: z.string().uuid('Closure ids are UUIDs') });
/** Bulk accept always names a site: an empty filter must never accept every site's closures. */
const bulkAcceptFilter = queueFilterSchema.extend({
  siteId: z.string({ message: 'Name the site whose closures to accept' }).uuid('Site ids are UUIDs'),
});
/** Leaving points out of a fit or moving a closure changes the data a flux stands on: the lab's, and admins' (the writer enforces it too). */
const FIT_DATA_EDITORS: readonly Role[] = ['lab', 'admin'];
const recomputeBody = z.object({ siteId: z.string().uuid('siteId must be a UUID') });

/**
 * Bench routes, plus what the Bench needs from the write path: a history row for each review
 * decision and a recompute job whenever an offset set, a profile version or a site default changes.
 */
export function registerBenchRoutes(r: RouteRegistry, ds: DataSource): void {
  defineRecomputeJob();

  r.add('get', '/api/bench/queue', BENCH_READERS, (req) => reviewQueue(ds, req.user!, req.query));
  r.add('get', '/api/bench/closures/:id', BENCH_READERS, (req) => closureDetail(ds, req.user!, parse(idParams, req.params).id));
  r.add('get', '/api/bench/closures/:id/history', BENCH_READERS, async (req) => {
    const { id } = parse(idParams, req.params);
    if (!(await queueItem(ds, req.user!, id))) throw notFound(`No closure ${id}`);
    return { items: await closureHistory(ds, id) };
  });
  r.add('post', '/api/bench/closures/:id/exclusions', FIT_DATA_EDITORS, async (req, res) => {
    const { id } = parse(idParams, req.params);
    const exclude = parse(excludePointsSchema, req.body, 'Name the points to leave out and why');
    return answer(res, await changeExclusions(ds, req.user!, id, { exclude }));
  });
  r.add('post', '/api/bench/closures/:id/exclusions/restore', FIT_DATA_EDITORS, async (req, res) => {
    const { id } = parse(idParams, req.params);
    const restore = parse(restorePointsSchema, req.body, 'Name the excluded points to put back');
    return answer(res, await changeExclusions(ds, req.user!, id, { restore }));
  });
  r.add('post', '/api/bench/closures/:id/move', FIT_DATA_EDITORS, async (req, res) => {
    const { id } = parse(idParams, req.params);
    const { visitId } = parse(moveClosureSchema, req.body ?? {}, 'Name the visit to move the closure to');
    return answer(res, await moveClosure(ds, req.user!, id, visitId));
  });
  r.add('post', '/api/bench/bulk-accept', ['lab'], (req) =>
    bulkAccept(ds, req.user!, parse(bulkAcceptFilter, stringify(req.body), 'Some queue filters are not valid')),
  );
  r.add('post', '/api/bench/recompute', ['lab', 'admin'], async (req, res) => {
    const { siteId } = parse(recomputeBody, req.body);
    // No job for a site that does not exist (404); the lab and admins see every site.
    await siteForActor(ds, req.user!, siteId);
    res.status(202);
    return { jobId: await requestSiteRecompute(ds, siteId, req.user!.id) };
  });
}

/** The bulk body carries the queue's filter as the query string would (the schema coerces strings). */
function stringify(body: unknown): Record<string, string> {
  const o = (body ?? {}) as Record<string, unknown>;
  return Object.fromEntries(
    Object.entries(o)
      .filter(([, v]) => v !== null && v !== undefined && v !== '')
      .map(([k, v]) => [k, String(v)]),
  );
}
