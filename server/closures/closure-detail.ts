import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import type {
  ClosureDetail,
  ClosureResultsWire,
  CollarHistoryEntry,
  DetailClosure,
  ReplicateSpread,
  ReviewState,
} from '../../shared/bench/review-wire';
import { notFound } from '../core/errors';
import { toWire } from '../records/wire';
import { ClosureEntity } from './closure.entity';
import { closureHistory } from './closure-history';
import type { ProfileRow } from './closure-inputs';
import { queueItem } from './review-queue';

/** Mean, SD and CV of replicate fluxes (sample SD, n − 1); spread is what the lab compares. */
export function replicateSpread(fluxes: number[]): ReplicateSpread {
  const n = fluxes.length;
  if (!n) return { n: 0, mean: null, sd: null, cvPct: null };
  const mean = fluxes.reduce((a, b) => a + b, 0) / n;
  const sd = n > 1 ? Math.sqrt(fluxes.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1)) : null;
  return { n, mean, sd, cvPct: sd !== null && mean !== 0 ? (100 * sd) / Math.abs(mean) : null };
}

interface OffsetSetRow {
  id: string;
  taken_at: Date;
  readings_cm: number[];
  mean_cm: number;
  supersedes_id: string | null;
}
interface CollarHistoryRow {
  id: string;
  started_at: Date;
  flux_umol_m2_s: number | null;
  review_state: ReviewState;
  flags: string[];
}
interface ReplicateRow extends CollarHistoryRow {
  redo_of_id: string | null;
  settle_s: number;
  review_settle_s: number | null;
  t_s: (number | null)[];
  co2_ppm: (number | null)[];
}
interface MoveTargetRow {
  id: string;
  round: number;
  collar_id: string;
  code: string;
}

/**
 * The closure record in wire form: the entity's columns are the closure schema's fields plus the
 * derived ones, and `results` holds what the engine stored (closure-results.ts); toWire's answer
 * is untyped, so this is where the record gets its type.
 */
async function detailClosure(ds: DataSource, id: string): Promise<DetailClosure> {
  return toWire(await ds.getRepository(ClosureEntity).findOneByOrFail({ id })) as unknown as DetailClosure;
}

/**
 * Everything the closure view shows in one answer: the record with its series and both fits, its
 * queue context, the offset set and profile version the volume came from, the collar's flux
 * history, the visit's replicates with their spread, and the review history.
 */
export async function closureDetail(ds: DataSource, user: SessionUser, id: string): Promise<ClosureDetail> {
  const context = await queueItem(ds, user, id);
  if (!context) throw notFound(`No closure ${id}`);
  const closure = await detailClosure(ds, id);
  const results: Partial<ClosureResultsWire> = closure.results ?? {};
  const [offsetSet]: OffsetSetRow[] = results.offsetSetId
    ? await ds.query(`SELECT id, taken_at, readings_cm, mean_cm, supersedes_id FROM offset_set WHERE id = $1`, [results.offsetSetId])
    : [];
  const [profile]: Omit<ProfileRow, 'footprint_area_cm2'>[] = results.profileId
    ? await ds.query(
        `SELECT id, name, to_char(valid_from, 'YYYY-MM-DD') AS valid_from, chamber_volume_cm3, loop_volume_cm3 FROM chamber_profile WHERE id = $1`,
        [results.profileId],
      )
    : [];
  const collarHistory: CollarHistoryRow[] = await ds.query(
    `SELECT c.id, c.started_at, c.flux_umol_m2_s, c.review_state, c.flags FROM closure c
      WHERE c.collar_id = $1 AND NOT c.deleted ORDER BY c.started_at`,
    [closure.collarId],
  );
  const replicates: ReplicateRow[] = await ds.query(
    `SELECT c.id, c.started_at, c.flux_umol_m2_s, c.review_state, c.flags, c.redo_of_id, c.settle_s, c.review_settle_s,
            c.series->'tS' AS t_s, c.series->'co2Ppm' AS co2_ppm
       FROM closure c WHERE c.visit_id = $1 AND NOT c.deleted ORDER BY c.started_at`,
    [closure.visitId],
  );
  // The site's chambers and analyzers, for the lab's correction of the closure's system.
  const profiles: { id: string; name: string; valid_from: string }[] = await ds.query(
    `SELECT id, name, to_char(valid_from, 'YYYY-MM-DD') AS valid_from FROM chamber_profile WHERE site_id = $1 AND NOT deleted ORDER BY name, valid_from`,
    [closure.siteId],
  );
  const analyzers: { id: string; name: string; serial: string }[] = await ds.query(
    `SELECT id, name, serial FROM analyzer WHERE site_id = $1 AND NOT deleted ORDER BY name`,
    [closure.siteId],
  );
  // Where the lab may move the closure (a crew tapped the wrong collar): the other visits of its campaign.
  const moveTargets: MoveTargetRow[] = await ds.query(
    `SELECT v.id, v.round, v.collar_id, k.code FROM visit v JOIN collar k ON k.id = v.collar_id
      WHERE v.campaign_id = $1 AND v.id <> $2 AND NOT v.deleted ORDER BY v.round, k.code LIMIT 5000`,
    [closure.campaignId, closure.visitId],
  );
  const counted = replicates.flatMap((r) =>
    r.review_state !== 'rejected' && typeof r.flux_umol_m2_s === 'number' ? [r.flux_umol_m2_s] : [],
  );
  const historyEntry = (r: CollarHistoryRow): CollarHistoryEntry => ({
    id: r.id,
    startedAt: r.started_at.toISOString(),
    fluxUmolM2S: r.flux_umol_m2_s,
    reviewState: r.review_state,
    flags: r.flags,
  });
  return {
    closure,
    context,
    offsetSet: offsetSet
      ? {
          id: offsetSet.id,
          takenAt: offsetSet.taken_at.toISOString(),
          readingsCm: offsetSet.readings_cm,
          meanCm: offsetSet.mean_cm,
          supersedesId: offsetSet.supersedes_id,
        }
      : null,
    profile: profile
      ? {
          id: profile.id,
          name: profile.name,
          validFrom: profile.valid_from,
          chamberVolumeCm3: profile.chamber_volume_cm3,
          loopVolumeCm3: profile.loop_volume_cm3,
        }
      : null,
    collarHistory: collarHistory.map(historyEntry),
    replicates: replicates.map((r) => ({
      ...historyEntry(r),
      redoOfId: r.redo_of_id,
      settleS: r.review_settle_s ?? r.settle_s,
      tS: r.t_s,
      co2Ppm: r.co2_ppm,
    })),
    replicateSpread: replicateSpread(counted),
    history: await closureHistory(ds, id),
    moveTargets: moveTargets.map((v) => ({ visitId: v.id, round: v.round, collarId: v.collar_id, collarCode: v.code })),
    systems: { profiles: profiles.map((p) => ({ id: p.id, name: p.name, validFrom: p.valid_from })), analyzers },
  };
}
