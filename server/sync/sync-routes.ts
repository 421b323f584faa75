import pLimit from 'p-limit';
import type { DataSource } from 'typeorm';
import { pullQuerySchema, pushBodySchema } from '../../shared/sync/sync-wire';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { pullChanges } from './sync-pull';
import { pushOps } from './sync-push';

/**
 * Device sync: a batch of outbox operations in, pages of the change log out. Entity rules apply per op.
 * At most `pullSlots` pulls are read and serialised at once (ServerConfig.pullSlots); the rest queue in
 * arrival order, so the pushes' short round trips never wait behind a crowd of page builds.
 */
export function registerSyncRoutes(r: RouteRegistry, ds: DataSource, pullSlots: number): void {
  r.add('post', '/api/sync/push', ALL_ROLES, async (req) => {
    const body = parse(pushBodySchema, req.body, 'The push body is not valid');
    return { results: await pushOps(ds, req.user!, body.deviceId, body.outboxSize, body.ops) };
  });

  const pullSlot = pLimit(pullSlots);
  r.add('get', '/api/sync/pull', ALL_ROLES, async (req, res) => {
    const q = parse(pullQuerySchema, req.query, 'The pull parameters are not valid');
    await pullSlot(async () => {
      if (req.socket.destroyed) return; // the device gave up while waiting: nothing to read for it
      const page = await pullChanges(ds, req.user!, q.deviceId, q.cursor, q.limit);
      res.json(page); // serialised inside the slot: that is most of a page's CPU
    });
  });
}
