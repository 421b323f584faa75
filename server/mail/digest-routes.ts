import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { siteForActor } from '../setup/site-access';
import { buildDigest } from './digest-content';
import { askForDigest, defineDigestJob } from './digest-job';
import { localClock } from './local-clock';
import type { Mailer } from './mailer';

const siteParams = z.object({ siteId: z.string().uuid('Site ids are UUIDs') });

/** The digest's content for the Board, and "send now" (to the person who asks) through the job queue. */
export function registerDigestRoutes(r: RouteRegistry, ds: DataSource, mailer: Mailer): void {
  defineDigestJob(mailer);

  r.add('get', '/api/sites/:siteId/digest', ['lead', 'admin'], async (req) => {
    const { siteId } = parse(siteParams, req.params);
    await siteForActor(ds, req.user!, siteId);
    return { digest: await buildDigest(ds, siteId) };
  });

  r.add('post', '/api/sites/:siteId/digest/send', ['lead', 'admin'], async (req, res) => {
    const { siteId } = parse(siteParams, req.params);
    const site = await siteForActor(ds, req.user!, siteId);
    const run = await ds.transaction((em) => askForDigest(em, siteId, localClock(new Date(), site.timezone).date, req.user!.id));
    res.status(202);
    return { jobId: run!.jobId, to: req.user!.email };
  });
}
