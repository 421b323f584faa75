import { Signal } from '@angular/core';
import type { LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';

export interface WalkOptions {
  site: LocalRecord | null;
  campaigns: LocalRecord[];
  routes: LocalRecord[];
  analyzers: LocalRecord[];
}

/** Campaigns that are open, the site's routes and analyzers, live from the device store. */
export function walkOptions(siteId: () => string | null): Signal<WalkOptions | undefined> {
  return liveSignal(
    siteId,
    async (db, site) => {
      if (!site) return { site: null, campaigns: [], routes: [], analyzers: [] };
      const [s, campaigns, routes, analyzers] = await Promise.all([
        db.records('site').get(site),
        db.records('campaign').where('siteId').equals(site).toArray(),
        db.records('route').where('siteId').equals(site).toArray(),
        db.records('analyzer').where('siteId').equals(site).toArray(),
      ]);
      const byName = (a: LocalRecord, b: LocalRecord) => String(a['name']).localeCompare(String(b['name']));
      return {
        site: s ?? null,
        campaigns: campaigns
          .filter((c) => !c['locked'] && !c.deleted)
          .sort((a, b) => String(b['startsOn']).localeCompare(String(a['startsOn']))),
        routes: routes.filter((r) => !r.deleted).sort(byName),
        analyzers: analyzers.filter((a) => !a.deleted).sort(byName),
      };
    },
    undefined as WalkOptions | undefined,
  );
}

/** Start of the device's local day, as an ISO instant (checks count for the day they were made). */
export function localDayStart(now: Date = new Date()): string {
  return new Date(now.getFullYear(), now.getMonth(), now.getDate()).toISOString();
}

/** Today's analyzer checks at the site, newest first per kind. */
export function todayChecks(params: () => { siteId: string | null; since: string }): Signal<LocalRecord[]> {
  return liveSignal(
    params,
    async (db, p) => {
      if (!p.siteId) return [];
      const all = await db
        .records('analyzerCheck')
        .where('siteId')
        .equals(p.siteId)
        .filter((c) => String(c['at']) >= p.since && !c.deleted)
        .toArray();
      return all.sort((a, b) => String(b['at']).localeCompare(String(a['at'])));
    },
    [] as LocalRecord[],
  );
}
