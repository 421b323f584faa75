import type { DataSource } from 'typeorm';
import { pullQuerySchema, pushBodySchema } from '../../shared/sync/sync-wire';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { pullChanges } from './sync-pull';
import { pushOps } from './sync-push';

/** Device sync: a batch of outbox operations in, pages of the change log out. Entity rules apply per op. */
export function registerSyncRoutes(r: RouteRegistry, ds: DataSource): void {
  r.add('post', '/api/sync/push', ALL_ROLES, async (req) => {
    const body = parse(pushBodySchema, req.body, 'The push body is not valid');
    return { results: await pushOps(ds, req.user!, body.deviceId, body.outboxSize, body.ops) };
  });

  r.add('get', '/api/sync/pull', ALL_ROLES, (req) => {
    const q = parse(pullQuerySchema, req.query, 'The pull parameters are not valid');
    return pullChanges(ds, req.user!, q.deviceId, q.cursor, q.limit);
  });
}
