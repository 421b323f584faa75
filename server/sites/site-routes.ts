import type { DataSource } from 'typeorm';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { SiteEntity } from './site.entity';
import { In } from 'typeorm';

/** Sites the signed-in user may read (the site picker). Field data adds the rest of the site API. */
export function registerSiteListRoute(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/sites', ALL_ROLES, async (req) => {
    const ids = req.user!.siteIds;
    const items = ids.length
      ? await ds.getRepository(SiteEntity).find({ where: { id: In(ids), deleted: false }, order: { name: 'ASC' } })
      : [];
    return { items, total: items.length };
  });
}
