import { Signal } from '@angular/core';
import type { LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';

export interface WalkOptions {
  site: LocalRecord<'site'> | null;
  campaigns: LocalRecord<'campaign'>[];
  routes: LocalRecord<'route'>[];
  analyzers: LocalRecord<'analyzer'>[];
}

const byName = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name);

/** Campaigns that are open, the site's routes and analyzers, live from the device store. */
export function walkOptions(siteId: () => string | null): Signal<WalkOptions | undefined> {
  return liveSignal(
    siteId,
    async (db, site): Promise<WalkOptions> => {
      if (!site) return { site: null, campaigns: [], routes: [], analyzers: [] };
      const [s, campaigns, routes, analyzers] = await Promise.all([
        db.records('site').get(site),
        db.records('campaign').where('siteId').equals(site).toArray(),
        db.records('route').where('siteId').equals(site).toArray(),
        db.records('analyzer').where('siteId').equals(site).toArray(),
      ]);
      return {
        site: s ?? null,
        campaigns: campaigns.filter((c) => !c.locked && !c.deleted).sort((a, b) => b.startsOn.localeCompare(a.startsOn)),
        routes: routes.filter((r) => !r.deleted).sort(byName),
        analyzers: analyzers.filter((a) => !a.deleted).sort(byName),
      };
    },
    undefined as WalkOptions | undefined,
  );
}

/** Today's analyzer checks at the site (made since `since`, the site's midnight: siteDayStart), newest first. */
export function todayChecks(params: () => { siteId: string | null; since: string }): Signal<LocalRecord<'analyzerCheck'>[]> {
  return liveSignal(
    params,
    async (db, p) => {
      if (!p.siteId) return [];
      const all = await db
        .records('analyzerCheck')
        .where('siteId')
        .equals(p.siteId)
        .filter((c) => c.at >= p.since && !c.deleted)
        .toArray();
      return all.sort((a, b) => b.at.localeCompare(a.at));
    },
    [] as LocalRecord<'analyzerCheck'>[],
  );
}
