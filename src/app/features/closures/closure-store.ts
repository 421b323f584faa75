import type { Signal } from '@angular/core';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import type { AmbientCheck } from '../../../../shared/flux';
import type { SpotInputs } from './closure-flux';

export interface ClosureScene {
  /** This visit's closures, oldest first (redos after the closure they redo). */
  closures: LocalRecord[];
  inputs: SpotInputs;
  /** The collar's earlier closures with a flux (server's or none), newest first. */
  previous: { id: string; startedAt: string; fluxUmolM2S: number }[];
  /** Closures the campaign asks for at each visit. */
  dueClosures: number;
  /** The site's analyzers (for today's choice). */
  analyzers: LocalRecord[];
}

const live = (r: LocalRecord) => !r.deleted;

/** The usable ambient readings among analyzer checks (live, not skipped, with a value), with their analyzer. */
export function ambientChecks(checks: readonly LocalRecord[]): AmbientCheck[] {
  return checks
    .filter((c) => live(c) && c['kind'] === 'ambient' && !c['skipped'] && typeof c['co2Ppm'] === 'number')
    .map((c) => ({ id: c.id, analyzerId: (c['analyzerId'] as string | null) ?? null, at: String(c['at']), co2Ppm: Number(c['co2Ppm']) }));
}

export async function loadScene(
  db: FluxDb,
  p: { collarId: string; campaignId: string | null; visitId: string | null; analyzerId: string | null },
): Promise<ClosureScene | null> {
  const collar = await db.records('collar').get(p.collarId);
  if (!collar) return null;
  const siteId = String(collar['siteId']);
  const [site, profiles, sets, closures, analyzers, campaign, checks, visit] = await Promise.all([
    db.records('site').get(siteId),
    db.records('chamberProfile').where('siteId').equals(siteId).filter(live).toArray(),
    db.records('offsetSet').where('collarId').equals(p.collarId).filter(live).toArray(),
    db.records('closure').where('collarId').equals(p.collarId).filter(live).toArray(),
    db.records('analyzer').where('siteId').equals(siteId).filter(live).toArray(),
    p.campaignId ? db.records('campaign').get(p.campaignId) : Promise.resolve(undefined),
    db
      .records('analyzerCheck')
      .where('siteId')
      .equals(siteId)
      .filter((c) => c['kind'] === 'ambient')
      .toArray(),
    p.visitId ? db.records('visit').get(p.visitId) : Promise.resolve(undefined),
  ]);
  const air = (visit?.['conditions'] as { airTempC?: unknown } | undefined)?.airTempC;
  const analyzer = analyzers.find((a) => a.id === p.analyzerId);
  const superseded = new Set(sets.map((s) => s['supersedesId']).filter(Boolean));
  const here = closures
    .filter((c) => p.visitId !== null && c['visitId'] === p.visitId)
    .sort((a, b) => String(a['chamberOnAt'] ?? a['startedAt']).localeCompare(String(b['chamberOnAt'] ?? b['startedAt'])));
  const previous = closures
    .filter((c) => c['visitId'] !== p.visitId && typeof c['fluxUmolM2S'] === 'number')
    .sort((a, b) => String(b['startedAt']).localeCompare(String(a['startedAt'])))
    .slice(0, 6)
    .map((c) => ({ id: c.id, startedAt: String(c['startedAt']), fluxUmolM2S: Number(c['fluxUmolM2S']) }));
  return {
    closures: here,
    previous,
    dueClosures: Number(campaign?.['dueClosures'] ?? 1),
    analyzers,
    inputs: {
      site: site ?? null,
      collar,
      profiles,
      offsetSets: sets.filter((s) => !superseded.has(s.id)),
      analyzer: analyzer ?? null,
      ambientChecks: ambientChecks(checks),
      visitAirTempC: typeof air === 'number' ? air : null,
    },
  };
}

export function closureScene(
  params: () => { collarId: string; campaignId: string | null; visitId: string | null; analyzerId: string | null },
): Signal<ClosureScene | null | undefined> {
  return liveSignal(params, loadScene, undefined as ClosureScene | null | undefined);
}
