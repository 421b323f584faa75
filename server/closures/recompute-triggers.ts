import type { DataSource } from 'typeorm';
import { sameValue } from '../records/wire';
import type { WrittenRecord } from '../records/after-write';
import { defineJob } from '../jobs/job-registry';
import { enqueueJob } from '../jobs/job-store';
import { recomputeClosures, type RecomputeScope } from './closure-recompute';
import { AMBIENT_MAX_GAP_H } from '../../shared/flux';
import { localDay } from './closure-inputs';

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
 * an ambient reading (that day's closures of the site, for the start-above-ambient flag).
 */
export async function recomputeScopeFor(w: WrittenRecord): Promise<RecomputeScope | null> {
  const a = w.after;
  const siteId = String(a['siteId'] ?? (w.entity === 'site' ? w.id : ''));
  const changedAny = (fields: string[]) => w.action !== 'update' || fields.some((f) => w.before && !sameValue(w.before[f], a[f]));
  switch (w.entity) {
    case 'offsetSet':
      return { siteId, collarId: String(a['collarId']), reason: a['supersedesId'] ? 'offset set superseded' : `offset set ${w.action === 'delete' ? 'removed' : 'added'}` };
    case 'chamberProfile': {
      if (!changedAny(PROFILE_INPUTS)) return null;
      const days = [a['validFrom'], w.before?.['validFrom']].filter((d): d is string => typeof d === 'string').sort();
      return { siteId, fromDay: days[0] ?? null, reason: w.action === 'create' ? 'chamber profile version added' : 'chamber profile changed' };
    }
    case 'collar':
      // A is the collar's own inside area: a corrected diameter or side moves its closures' fluxes.
      return w.action === 'update' && changedAny(COLLAR_INPUTS) ? { siteId, collarId: w.id, reason: 'collar area changed' } : null;
    case 'site':
      return w.action === 'update' && changedAny(SITE_INPUTS) ? { siteId: w.id, reason: 'site defaults changed' } : null;
    case 'analyzerCheck': {
      if (a['kind'] !== 'ambient' && w.before?.['kind'] !== 'ambient') return null;
      const [s] = await w.em.query(`SELECT timezone FROM site WHERE id = $1`, [siteId]);
      // A reading serves closures up to AMBIENT_MAX_GAP_H before it (chamber-system.ts).
      const from = new Date(Date.parse(String(a['at'])) - AMBIENT_MAX_GAP_H * 3600_000);
      return { siteId, fromDay: localDay(from, s?.timezone ?? 'UTC'), reason: 'ambient reading recorded' };
    }
    case 'visit':
      // The visit's air temperature stands in for a missing chamber temperature.
      return w.action === 'update' && w.before && !sameValue((w.before['conditions'] as { airTempC?: unknown } | null)?.airTempC ?? null,
        (a['conditions'] as { airTempC?: unknown } | null)?.airTempC ?? null)
        ? { siteId, collarId: String(a['collarId']), reason: 'visit air temperature changed' } : null;
    default:
      return null;
  }
}

/** After-write listener: asks for a recompute job in the same transaction as the write that makes it necessary. */
export async function requestRecompute(w: WrittenRecord): Promise<void> {
  const scope = await recomputeScopeFor(w);
  if (!scope) return;
  await enqueueJob(w.em, RECOMPUTE_JOB, { ...scope }, {
    dedupeKey: `${RECOMPUTE_JOB}:${scope.siteId}:${scope.collarId ?? '*'}:${scope.fromDay ?? '*'}`,
    siteId: scope.siteId, createdBy: w.actorId,
  });
}

export function defineRecomputeJob(): void {
  defineJob({
    name: RECOMPUTE_JOB,
    handler: (data, ctx) => recomputeClosures(ctx.ds, data as unknown as RecomputeScope, { jobId: ctx.jobId, progress: ctx.progress }),
  });
}

/** A recompute asked for from the Bench (e.g. after a fix outside the app), recorded like any other. */
export async function requestSiteRecompute(ds: DataSource, siteId: string, userId: string): Promise<string> {
  return enqueueJob(ds, RECOMPUTE_JOB, { siteId, reason: 'asked for from the Bench' }, { siteId, createdBy: userId, dedupeKey: `${RECOMPUTE_JOB}:${siteId}:*:*` });
}
