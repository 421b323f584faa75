import { Signal } from '@angular/core';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import { collarProgress, walkingOrder, type CollarProgress, type Direction, type DueSettings } from './route-order';

export interface WalkOptions {
  site: LocalRecord | null;
  campaigns: LocalRecord[];
  routes: LocalRecord[];
  analyzers: LocalRecord[];
}

/** Campaigns that are open, the site's routes and analyzers, live from the device store. */
export function walkOptions(siteId: () => string | null): Signal<WalkOptions | undefined> {
  return liveSignal(siteId, async (db, site) => {
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
      campaigns: campaigns.filter((c) => !c['locked'] && !c.deleted).sort((a, b) => String(b['startsOn']).localeCompare(String(a['startsOn']))),
      routes: routes.filter((r) => !r.deleted).sort(byName),
      analyzers: analyzers.filter((a) => !a.deleted).sort(byName),
    };
  }, undefined as WalkOptions | undefined);
}

export interface RouteRow extends CollarProgress {
  id: string;
  code: string;
  plotCode: string;
  latitude: number | null;
  longitude: number | null;
  status: string;
}

export interface RouteView {
  rows: RouteRow[];
  due: DueSettings;
  direction: Direction;
  rounds: number;
}

export interface RouteParams {
  campaignId: string | null;
  routeId: string | null;
  round: number;
  flipped: boolean;
}

async function recordsOfCampaign(db: FluxDb, entity: 'offsetSet' | 'probeReading' | 'closure', visitIds: string[]): Promise<LocalRecord[]> {
  return visitIds.length ? db.records(entity).where('visitId').anyOf(visitIds).toArray() : [];
}

/** The route's collars in walking order with their state in this round. */
export async function loadRoute(db: FluxDb, p: RouteParams): Promise<RouteView | null> {
  if (!p.campaignId || !p.routeId) return null;
  const [campaign, route] = await Promise.all([db.records('campaign').get(p.campaignId), db.records('route').get(p.routeId)]);
  if (!campaign || !route) return null;
  const plan = (campaign['routes'] as { routeId: string; direction: Direction }[] | undefined)?.find((r) => r.routeId === p.routeId);
  const direction = plan?.direction ?? 'forward';
  const ids = walkingOrder(route['collarIds'] as string[], direction, p.round, p.flipped);
  const [collars, visits] = await Promise.all([
    db.records('collar').bulkGet(ids),
    db.records('visit').where('campaignId').equals(p.campaignId).filter((v) => v['round'] === p.round && !v.deleted).toArray(),
  ]);
  const visitIds = visits.map((v) => v.id);
  const [sets, probes, closures] = await Promise.all([
    recordsOfCampaign(db, 'offsetSet', visitIds), recordsOfCampaign(db, 'probeReading', visitIds), recordsOfCampaign(db, 'closure', visitIds),
  ]);
  const plots = new Map((await db.records('plot').bulkGet(collars.map((c) => String(c?.['plotId'])))).filter(Boolean).map((pl) => [pl!.id, pl!]));
  const due: DueSettings = {
    dueOffset: campaign['dueOffset'] !== false,
    dueClosures: Number(campaign['dueClosures'] ?? 1),
    dueProbes: campaign['dueProbes'] !== false,
  };
  const rows: RouteRow[] = [];
  for (const c of collars) {
    if (!c) continue;
    const of = <T extends LocalRecord>(list: T[]) => list.filter((r) => r['collarId'] === c.id && !r.deleted);
    rows.push({
      id: c.id,
      code: String(c['code']),
      plotCode: String(plots.get(String(c['plotId']))?.['code'] ?? ''),
      latitude: (c['latitude'] as number | null) ?? null,
      longitude: (c['longitude'] as number | null) ?? null,
      status: String(c['status'] ?? 'active'),
      ...collarProgress(due, of(visits), of(sets), of(probes), of(closures)),
    });
  }
  return { rows, due, direction, rounds: Number(campaign['rounds'] ?? 1) };
}

export function routeView(params: () => RouteParams): Signal<RouteView | null | undefined> {
  return liveSignal(params, loadRoute, undefined as RouteView | null | undefined);
}

/** Today's analyzer checks at the site, newest first per kind; `since` is the site day's start (shared/time siteDayStart). */
export function todayChecks(params: () => { siteId: string | null; since: string }): Signal<LocalRecord[]> {
  return liveSignal(params, async (db, p) => {
    if (!p.siteId) return [];
    const all = await db.records('analyzerCheck').where('siteId').equals(p.siteId).filter((c) => String(c['at']) >= p.since && !c.deleted).toArray();
    return all.sort((a, b) => String(b['at']).localeCompare(String(a['at'])));
  }, [] as LocalRecord[]);
}
