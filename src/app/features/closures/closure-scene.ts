import type { Signal } from '@angular/core';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import type { AmbientCheck } from '../../../../shared/flux';
import { campaignFields } from '../../../../shared/model/field-records';
import type { SpotInputs } from './closure-flux';
import { liveOffsetSets } from '../../../../shared/model/live-offset-sets';

/** An earlier closure of the collar with its flux, for "this collar before". */
export interface PreviousFlux {
  id: string;
  startedAt: string;
  fluxUmolM2S: number;
}

export interface ClosureScene {
  /** This visit's closures, oldest first (redos after the closure they redo). */
  closures: LocalRecord<'closure'>[];
  inputs: SpotInputs;
  /** The collar's earlier closures with a flux (the server's), newest first. */
  previous: PreviousFlux[];
  /** Closures the campaign asks for at each visit (the schema's default when no campaign is chosen). */
  dueClosures: number;
  /** The site's analyzers (for today's choice). */
  analyzers: LocalRecord<'analyzer'>[];
}

export interface SceneParams {
  collarId: string;
  campaignId: string | null;
  visitId: string | null;
  analyzerId: string | null;
}

/** Without a campaign on this device, the closures a campaign asks for by default (its schema's default). */
export const DEFAULT_DUE_CLOSURES = campaignFields.shape.dueClosures.parse(undefined);

const live = (r: { deleted?: boolean }) => !r.deleted;

/** The usable ambient readings among analyzer checks (live, not skipped, with a value), with their analyzer. */
export function ambientChecks(checks: readonly LocalRecord<'analyzerCheck'>[]): AmbientCheck[] {
  return checks.flatMap((c) =>
    live(c) && c.kind === 'ambient' && !c.skipped && c.co2Ppm !== null
      ? [{ id: c.id, analyzerId: c.analyzerId, at: c.at, co2Ppm: c.co2Ppm }]
      : [],
  );
}

/** When a closure started: its chamber-on tap, else the start its series gave it. */
const startOf = (c: LocalRecord<'closure'>): string => c.chamberOnAt ?? c.startedAt;

export async function loadScene(db: FluxDb, p: SceneParams): Promise<ClosureScene | null> {
  const collar = await db.records('collar').get(p.collarId);
  if (!collar) return null;
  const siteId = collar.siteId;
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
      .filter((c) => c.kind === 'ambient')
      .toArray(),
    p.visitId ? db.records('visit').get(p.visitId) : Promise.resolve(undefined),
  ]);
  const analyzer = analyzers.find((a) => a.id === p.analyzerId);
  const here = closures.filter((c) => p.visitId !== null && c.visitId === p.visitId).sort((a, b) => startOf(a).localeCompare(startOf(b)));
  const previous = closures
    .flatMap((c) =>
      c.visitId !== p.visitId && typeof c.fluxUmolM2S === 'number'
        ? [{ id: c.id, startedAt: c.startedAt, fluxUmolM2S: c.fluxUmolM2S }]
        : [],
    )
    .sort((a, b) => b.startedAt.localeCompare(a.startedAt))
    .slice(0, 6);
  return {
    closures: here,
    previous,
    dueClosures: campaign?.dueClosures ?? DEFAULT_DUE_CLOSURES,
    analyzers,
    inputs: {
      site: site ?? null,
      collar,
      profiles,
      offsetSets: liveOffsetSets(sets),
      analyzer: analyzer ?? null,
      ambientChecks: ambientChecks(checks),
      visitAirTempC: visit?.conditions.airTempC ?? null,
    },
  };
}

/** The visit's closures and what their flux depends on, live from the device store. */
export function closureScene(params: () => SceneParams): Signal<ClosureScene | null | undefined> {
  return liveSignal(params, loadScene, undefined as ClosureScene | null | undefined);
}
