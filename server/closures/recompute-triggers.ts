import type { DataSource } from 'typeorm';
import { sameValue } from '../records/wire';
import type { WrittenRecord } from '../records/after-write';
import { defineJob } from '../jobs/job-registry';
import { enqueueJob } from '../jobs/job-store';
import { localDay } from '../../shared/time/site-time';
import { recomputeClosures, recomputeScopeSchema, scopeHasClosures, type RecomputeScope } from './closure-recompute';
import { isWriteOf } from './entity-write';
import { AMBIENT_MAX_GAP_H } from '../../shared/flux';

export const RECOMPUTE_JOB = 'closure-recompute';

/** Site fields a closure's flux depends on (time zone → local day, elevation → default pressure, ambient margin → flag, slope basis → flux). */
const SITE_INPUTS = ['timezone', 'elevationM', 'ambientMarginPpm', 'defaultProfileId', 'slopeBasis', 'defaultAirTempC'];
/** Collar fields that enter its inside area. */
const COLLAR_INPUTS = ['shape', 'diameterCm', 'sideACm', 'sideBCm', 'areaCm2'];
/** Profile fields that enter the volume or the day it applies from. */
const PROFILE_INPUTS = ['validFrom', 'chamberVolumeCm3', 'loopVolumeCm3', 'footprintAreaCm2', 'deleted'];

/**
 * Which closures a write may have changed the flux of, or null when none: an offset set added,
 * superseding another or removed (that collar's closures); a chamber profile version added, changed
 * or removed (the site's closures from its day on); a site default changed (all the site's closures);
 * an ambient reading (the site's closures within reach of it, for the start-above-ambient flag).
 */
export async function recomputeScopeFor(w: WrittenRecord): Promise<RecomputeScope | null> {
  const changedAny = (fields: string[]) => w.action !== 'update' || fields.some((f) => w.before && !sameValue(w.before[f], w.after[f]));
  if (isWriteOf(w, 'offsetSet')) {
    // A set serves its collar's closures from its own day on, and earlier ones that had no set before
    // them (they borrowed a later one, flagged offset-after); a superseded set, those of its day too.
    const a = w.after;
    const [s]: { timezone: string }[] = await w.em.query(`SELECT timezone FROM site WHERE id = $1`, [a.siteId]);
    const [superseded]: { taken_at: Date }[] = a.supersedesId
      ? await w.em.query(`SELECT taken_at FROM offset_set WHERE id = $1`, [a.supersedesId])
      : [];
    const days = [a.takenAt, w.before?.takenAt, superseded?.taken_at]
      .filter((t) => t !== undefined)
      .map((t) => localDay(new Date(t), s?.timezone ?? 'UTC'))
      .sort();
    return {
      siteId: a.siteId,
      collarId: a.collarId,
      fromDay: days[0] ?? null,
      orFlagged: 'offset-after',
      reason: a.supersedesId ? 'offset set superseded' : `offset set ${w.action === 'delete' ? 'removed' : 'added'}`,
    };
  }
  if (isWriteOf(w, 'chamberProfile')) {
    if (!changedAny(PROFILE_INPUTS)) return null;
    const days = [w.after.validFrom, w.before?.validFrom].filter((d) => d !== undefined).sort();
    return {
      siteId: w.after.siteId,
      fromDay: days[0] ?? null,
      reason: w.action === 'create' ? 'chamber profile version added' : 'chamber profile changed',
    };
  }
  if (isWriteOf(w, 'collar'))
    // A is the collar's own inside area: a corrected diameter or side moves its closures' fluxes.
    return w.action === 'update' && changedAny(COLLAR_INPUTS)
      ? { siteId: w.after.siteId, collarId: w.id, reason: 'collar area changed' }
      : null;
  if (isWriteOf(w, 'site'))
    return w.action === 'update' && changedAny(SITE_INPUTS) ? { siteId: w.id, reason: 'site defaults changed' } : null;
  if (isWriteOf(w, 'analyzerCheck')) {
    if (w.after.kind !== 'ambient' && w.before?.kind !== 'ambient') return null;
    // A reading serves the closures within AMBIENT_MAX_GAP_H of it (chamber-system.ts); a moved reading, those of its old time too.
    const times = [w.after.at, w.before?.at].filter((t) => t !== undefined).map((t) => Date.parse(t));
    const gapMs = AMBIENT_MAX_GAP_H * 3600_000;
    return {
      siteId: w.after.siteId,
      fromAt: new Date(Math.min(...times) - gapMs).toISOString(),
      toAt: new Date(Math.max(...times) + gapMs).toISOString(),
      reason: 'ambient reading recorded',
    };
  }
  if (isWriteOf(w, 'visit'))
    // The visit's air temperature stands in for a missing chamber temperature.
    return w.action === 'update' && w.before && !sameValue(w.before.conditions.airTempC ?? null, w.after.conditions.airTempC ?? null)
      ? { siteId: w.after.siteId, collarId: w.after.collarId, reason: 'visit air temperature changed' }
      : null;
  return null;
}

/** After-write listener: asks for a recompute job in the same transaction as the write that makes it necessary, when a stored closure is affected. */
export async function requestRecompute(w: WrittenRecord): Promise<void> {
  const scope = await recomputeScopeFor(w);
  if (!scope || !(await scopeHasClosures(w.em, scope))) return;
  await enqueueJob(
    w.em,
    RECOMPUTE_JOB,
    { ...scope },
    {
      dedupeKey: [RECOMPUTE_JOB, scope.siteId, scope.collarId, scope.fromDay, scope.fromAt, scope.toAt, scope.orFlagged]
        .map((x) => x ?? '*')
        .join(':'),
      siteId: scope.siteId,
      createdBy: w.actorId,
    },
  );
}

export function defineRecomputeJob(): void {
  defineJob({
    name: RECOMPUTE_JOB,
    handler: (data, ctx) => recomputeClosures(ctx.ds, recomputeScopeSchema.parse(data), { jobId: ctx.jobId, progress: ctx.progress }),
  });
}

/** A recompute asked for from the Bench (e.g. after a fix outside the app), recorded like any other. */
export async function requestSiteRecompute(ds: DataSource, siteId: string, userId: string): Promise<string> {
  return enqueueJob(
    ds,
    RECOMPUTE_JOB,
    { siteId, reason: 'asked for from the Bench' },
    { siteId, createdBy: userId, dedupeKey: `${RECOMPUTE_JOB}:${siteId}:*:*` },
  );
}
