import type { DataSource, EntityManager } from 'typeorm';
import { z } from 'zod';
import { ChangeBuffer } from '../records/change-buffer';
import type { ClosureResultsWire } from '../../shared/bench/review-wire';
import type { ClosureModel } from '../../shared/flux';
import type { StoredRecord } from '../../shared/model/stored-record';
import { resultsFor, type ClosureFitFields } from './closure-results';
import { ClosureInputs } from './closure-inputs';
import { canonicalJson } from './canonical-json';

/** Which closures a recompute looks at; every one of them is recomputed, only changed ones are written. Parsed from a job's data. */
export const recomputeScopeSchema = z.object({
  siteId: z.string(),
  collarId: z.string().nullish(),
  /** Local days, inclusive; a closure outside them is not looked at. */
  fromDay: z.string().nullish(),
  /** Instants (ISO), inclusive: closures started between them, when a write affects only a stretch of time. */
  fromAt: z.string().nullish(),
  toAt: z.string().nullish(),
  /** Closures carrying this flag are in scope whatever their day (e.g. a volume taken from a later offset set). */
  orFlagged: z.string().nullish(),
  reason: z.string(),
});
export type RecomputeScope = z.infer<typeof recomputeScopeSchema>;

export interface RecomputeOutcome {
  examined: number;
  changed: number;
  /** Closures of locked campaigns keep their published results (as the profile-version screen does). */
  lockedKept: number;
  changedIds: string[];
}

const PAGE = 1000;
/** Ids listed in a job's result; beyond this only the counts are kept. */
const MAX_LISTED = 2000;

/** One closure of a recompute page as the driver hands it over, with its campaign's lock. */
interface RecomputeRow {
  id: string;
  rev: string;
  site_id: string;
  collar_id: string;
  analyzer_id: string | null;
  profile_id: string | null;
  visit_id: string;
  started_at: Date;
  settle_s: number;
  series: StoredRecord<'closure'>['series'];
  review_state: StoredRecord<'closure'>['reviewState'];
  review_settle_s: number | null;
  review_window_end_s: number | null;
  review_model: ClosureModel | null;
  review_exclusions: StoredRecord<'closure'>['reviewExclusions'];
  results: ClosureResultsWire | null;
  flags: string[];
  flux_umol_m2_s: number | null;
  locked: boolean;
}

/** A closure of a page in wire form: what the fit reads and what the comparison with the stored results needs. */
interface RecomputeClosure extends ClosureFitFields {
  id: string;
  rev: number;
  reviewState: StoredRecord<'closure'>['reviewState'];
  results: ClosureResultsWire | null;
  flags: string[];
  fluxUmolM2S: number | null;
  locked: boolean;
}

const COLUMNS = `c.id, c.rev, c.site_id, c.collar_id, c.analyzer_id, c.profile_id, c.visit_id, c.started_at, c.settle_s, c.series, c.review_state,
  c.review_settle_s, c.review_window_end_s, c.review_model, c.review_exclusions, c.results, c.flags, c.flux_umol_m2_s, p.locked`;

/**
 * Recomputes the closures of a scope with the engine and writes only those whose results,
 * flags or flux differ from what is stored — so running it twice changes nothing the second time
 * (idempotent), and "exactly the affected closures" get a new revision and a change-log entry.
 * A reviewed closure keeps its decision; when its flux moves, `results.recomputedSinceReview`
 * keeps the flux it had when it was reviewed beside the new one, and the history says why.
 */
/** The closures of a scope: the site's live closures, of one collar and from a site-local day on when given. */
const SCOPE_WHERE = `c.site_id = $1 AND NOT c.deleted AND ($2::uuid IS NULL OR c.collar_id = $2)
    AND ((($3::date IS NULL OR (c.started_at AT TIME ZONE s.timezone)::date >= $3::date)
      AND ($4::timestamptz IS NULL OR c.started_at >= $4) AND ($5::timestamptz IS NULL OR c.started_at <= $5))
      OR ($6::text IS NOT NULL AND $6 = ANY(c.flags)))`;
const scopeArgs = (scope: RecomputeScope) => [
  scope.siteId,
  scope.collarId ?? null,
  scope.fromDay ?? null,
  scope.fromAt ?? null,
  scope.toAt ?? null,
  scope.orFlagged ?? null,
];

/** Whether any stored closure falls in the scope (a closure written later computes with the inputs of its day itself). */
export async function scopeHasClosures(db: Pick<DataSource, 'query'>, scope: RecomputeScope): Promise<boolean> {
  const [row] = await db.query(
    `SELECT EXISTS (SELECT 1 FROM closure c JOIN site s ON s.id = c.site_id WHERE ${SCOPE_WHERE}) AS any`,
    scopeArgs(scope),
  );
  return row.any === true;
}

export async function recomputeClosures(
  ds: DataSource,
  scope: RecomputeScope,
  opts: { jobId?: string | null; progress?: (done: number, total: number) => Promise<void> } = {},
): Promise<RecomputeOutcome> {
  const where = SCOPE_WHERE;
  const args = scopeArgs(scope);
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM closure c JOIN site s ON s.id = c.site_id WHERE ${where}`, args);
  const out: RecomputeOutcome = { examined: 0, changed: 0, lockedKept: 0, changedIds: [] };
  const inputs = new ClosureInputs(ds);
  const page = (after: string): Promise<RecomputeRow[]> =>
    ds.query(
      `SELECT ${COLUMNS} FROM closure c JOIN site s ON s.id = c.site_id JOIN campaign p ON p.id = c.campaign_id
      WHERE ${where} AND c.id > $7 ORDER BY c.id LIMIT ${PAGE}`,
      [...args, after],
    );
  // A pipeline over three connections: while this page is fitted, the next one is read and the
  // previous one written, so PostgreSQL's work and the engine's overlap instead of taking turns.
  let next = page('00000000-0000-0000-0000-000000000000');
  let writing: Promise<void> = Promise.resolve();
  for (;;) {
    const rows = await next;
    if (!rows.length) break;
    next = page(rows[rows.length - 1].id);
    next.catch(() => undefined); // awaited on the next turn; a failure surfaces there
    const updates = await computePage(inputs, rows, scope, out);
    await writing;
    writing = updates.length ? ds.transaction((em) => writeUpdates(em, updates, opts.jobId ?? null, out)) : Promise.resolve();
    out.examined += rows.length;
    await opts.progress?.(out.examined, n);
  }
  await writing;
  return out;
}

interface Update {
  id: string;
  rev: number;
  siteId: string;
  results: string;
  flags: string[];
  flux: number | null;
  oldFlux: number | null;
  reviewed: boolean;
}

async function computePage(inputs: ClosureInputs, rows: RecomputeRow[], scope: RecomputeScope, out: RecomputeOutcome): Promise<Update[]> {
  const closures = rows.map(wireOf);
  await inputs.preload(closures);
  const updates: Update[] = [];
  for (const c of closures) {
    if (c.locked) {
      out.lockedKept++;
      continue;
    }
    const next = resultsFor(c, await inputs.contextFor(c));
    const stored = c.results;
    const { recomputedSinceReview: prior, ...storedResults } = stored ?? {};
    const oldFlux = c.fluxUmolM2S;
    const same =
      stored !== null &&
      canonicalJson(storedResults) === canonicalJson(next.results) &&
      canonicalJson(c.flags) === canonicalJson(next.flags) &&
      oldFlux === next.fluxUmolM2S;
    if (same) continue;
    const reviewed = c.reviewState !== 'unreviewed';
    const results =
      reviewed && (prior || oldFlux !== next.fluxUmolM2S)
        ? {
            ...next.results,
            recomputedSinceReview: {
              at: new Date().toISOString(),
              reason: scope.reason,
              oldFluxUmolM2S: prior ? prior.oldFluxUmolM2S : oldFlux,
              newFluxUmolM2S: next.fluxUmolM2S,
            },
          }
        : next.results;
    updates.push({
      id: c.id,
      rev: c.rev,
      siteId: c.siteId,
      results: JSON.stringify(results),
      flags: next.flags,
      flux: next.fluxUmolM2S,
      oldFlux,
      reviewed,
    });
  }
  return updates;
}

/** One statement per page; a closure whose revision moved since it was read was rewritten by the writer with current inputs and is left alone. */
async function writeUpdates(em: EntityManager, updates: Update[], jobId: string | null, out: RecomputeOutcome) {
  const answer = await em.query(
    `UPDATE closure c SET results = u.results::jsonb, flags = string_to_array(u.flags, ','), flux_umol_m2_s = u.flux,
            rev = c.rev + 1, updated_at = now(), updated_by = NULL
       FROM unnest($1::uuid[], $2::bigint[], $3::text[], $4::text[], $5::float8[]) AS u(id, rev, results, flags, flux)
      WHERE c.id = u.id AND c.rev = u.rev
      RETURNING c.id, c.rev, c.site_id`,
    [
      updates.map((u) => u.id),
      updates.map((u) => u.rev),
      updates.map((u) => u.results),
      updates.map((u) => u.flags.join(',')),
      updates.map((u) => u.flux),
    ],
  );
  // TypeORM answers an UPDATE … RETURNING on PostgreSQL as [rows, affected count].
  const written: { id: string; rev: string; site_id: string }[] = Array.isArray(answer[0]) ? answer[0] : answer;
  const byId = new Map(updates.map((u) => [u.id, u]));
  const changes = new ChangeBuffer();
  for (const w of written) {
    changes.add({
      entity: 'closure',
      recordId: w.id,
      rev: Number(w.rev),
      siteId: w.site_id,
      fields: ['results', 'flags', 'fluxUmolM2S'],
      deleted: false,
      userId: null,
      deviceId: null,
    });
  }
  const ids = written.map((w) => w.id);
  // History for reviewed closures only: their decision stands on a flux that has now moved. An
  // unreviewed closure's new flux is in the change log like any other derived value.
  const reviewedIds = ids.filter((id) => byId.get(id)!.reviewed);
  if (reviewedIds.length)
    await em.query(
      `INSERT INTO closure_review_history (closure_id, site_id, user_id, kind, field, old_value, new_value, old_flux_umol_m2_s, new_flux_umol_m2_s, job_id)
     SELECT u.id, u.site, NULL, 'recompute', 'fluxUmolM2S', to_jsonb(u.old), to_jsonb(u.new), u.old, u.new, $5
       FROM unnest($1::uuid[], $2::uuid[], $3::float8[], $4::float8[]) AS u(id, site, old, new)`,
      [
        reviewedIds,
        reviewedIds.map((id) => byId.get(id)!.siteId),
        reviewedIds.map((id) => byId.get(id)!.oldFlux),
        reviewedIds.map((id) => byId.get(id)!.flux),
        jobId,
      ],
    );
  await changes.flush(em);
  out.changed += written.length;
  for (const id of ids) if (out.changedIds.length < MAX_LISTED) out.changedIds.push(id);
}

function wireOf(r: RecomputeRow): RecomputeClosure {
  return {
    id: r.id,
    rev: Number(r.rev),
    siteId: r.site_id,
    collarId: r.collar_id,
    analyzerId: r.analyzer_id,
    profileId: r.profile_id,
    visitId: r.visit_id,
    startedAt: r.started_at.toISOString(),
    settleS: r.settle_s,
    series: r.series,
    reviewState: r.review_state,
    reviewSettleS: r.review_settle_s,
    reviewWindowEndS: r.review_window_end_s,
    reviewModel: r.review_model,
    reviewExclusions: r.review_exclusions,
    results: r.results,
    flags: r.flags,
    fluxUmolM2S: r.flux_umol_m2_s,
    locked: r.locked,
  };
}
