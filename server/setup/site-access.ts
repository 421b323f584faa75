import type { DataSource, EntityManager } from 'typeorm';
import { seesAllSites } from '../../shared/auth/roles';
import { AppError } from '../core/errors';
import type { Actor } from '../records/record-writer';

export interface SiteRow {
  id: string;
  name: string;
  timezone: string;
}

/** The live site, if the actor may work on it: 404 for no such site, 403 for someone else's site. */
export async function siteForActor(db: DataSource | EntityManager, actor: Actor, siteId: string): Promise<SiteRow> {
  const [site] = await db.query(`SELECT id, name, timezone FROM site WHERE id = $1 AND NOT deleted`, [siteId]);
  if (!site) throw new AppError(404, 'There is no such site');
  if (!seesAllSites(actor.roles) && !actor.siteIds.includes(siteId)) throw new AppError(403, 'You are not a member of this site');
  return site as SiteRow;
}
