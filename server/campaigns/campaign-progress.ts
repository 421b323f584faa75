import type { DataSource, EntityManager } from 'typeorm';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import { notFound } from '../core/errors';
import type { ProgressState } from '../../shared/model/progress-state';
export type { ProgressState };
interface Item { state: ProgressState; done: number; needed: number }
type StateCounts = Record<ProgressState, number>;
type ItemCounts = Record<'offset' | 'closures' | 'probes', number>;

/**
 * The campaign's collars as parallel arrays: place in walking order (from 1), id, code, route
 * number (from 1 into routes; null when the campaign has no routes), plot id, plot's and collar's
 * treatment ids.
 */
interface Collars {
  routes: string[]; pos: number[]; id: string[]; code: string[]; route: (number | null)[]; plot: string[];
  plot_treatment: (string | null)[]; treatment: (string | null)[];
}
/**
 * The campaign's visits as parallel arrays: collar id, round, what it holds packed in one number
 * (8 × closures done + 4 if a probe reading + 2 if an offset set: one array instead of three); and
 * for the skipped visits only: collar id, round, arrival (µs since 1970, exact as a JS number), reason.
 */
interface Visits {
  collar: string[]; round: number[]; done: number[];
  skip_collar: string[]; skip_round: number[]; skip_at: number[]; skip_reason: (string | null)[];
}
/**
 * What the visits hold, per collar (by place in walking order) and asked round, at index
 * place × rounds + round index; skippedAt is -Infinity for a round not skipped.
 */
interface Tally { offsets: Int32Array; closures: Int32Array; probes: Int32Array; skippedAt: Float64Array; skipReason: (string | null)[] }

/*
 * Two queries that do not depend on each other, so they run at once on two connections (their
 * snapshots may be a moment apart: a visit written in between counts or not, as for a later ask). Each
 * answers one JSON text of parallel arrays (json_agg in one pass, so element i of every array comes
 * from the same row) rather than rows: for 5 000 collars the driver's row objects (and collecting
 * them) cost more than PostgreSQL's work, and JSON.parse makes few objects (tools/bench-progress).
 */

/**
 * Every collar of the campaign's routes (all live collars of the site when it has no routes) with
 * its place in walking order. A collar on several routes belongs to the lowest route id, at its
 * first place on any of them; routes are numbered in id order so that both are a min() over integers.
 */
const COLLARS_SQL = `
WITH c AS MATERIALIZED (SELECT site_id, routes FROM campaign WHERE id = $1 AND NOT deleted),
routes AS (SELECT r.id, r.collar_ids, row_number() OVER (ORDER BY r.id) AS no
             FROM route r WHERE NOT r.deleted AND r.id IN (SELECT (x->>'routeId')::uuid FROM c, jsonb_array_elements(c.routes) x)),
rc AS (SELECT routes.no, u.collar_id, u.ord FROM routes CROSS JOIN LATERAL unnest(routes.collar_ids) WITH ORDINALITY u(collar_id, ord)),
rfirst AS (SELECT collar_id, min(no) AS route_no, min(ord) AS ord FROM rc GROUP BY collar_id),
-- Route and place as one sort key: with two, every tie on the route fetched the place from the tuple again.
cols AS (SELECT k.id, k.code, k.plot_id, p.treatment_id AS plot_treatment_id, k.treatment_id, rf.route_no,
                row_number() OVER (ORDER BY rf.route_no * 4294967296 + rf.ord NULLS LAST, k.code) AS pos
           FROM c JOIN collar k ON k.site_id = c.site_id AND NOT k.deleted
           JOIN plot p ON p.id = k.plot_id
           LEFT JOIN rfirst rf ON rf.collar_id = k.id
          WHERE rf.collar_id IS NOT NULL OR NOT EXISTS (SELECT 1 FROM rc))
SELECT json_build_object('routes', (SELECT coalesce(json_agg(id ORDER BY no), '[]') FROM routes),
         'pos', coalesce(json_agg(pos), '[]'), 'id', coalesce(json_agg(id), '[]'), 'code', coalesce(json_agg(code), '[]'),
         'route', coalesce(json_agg(route_no), '[]'), 'plot', coalesce(json_agg(plot_id), '[]'),
         'plot_treatment', coalesce(json_agg(plot_treatment_id), '[]'), 'treatment', coalesce(json_agg(treatment_id), '[]'))::text AS collars
  FROM cols`;

/**
 * Every visit of the campaign (of the asked round) with whether it holds an offset set, a probe
 * reading and how many non-rejected closures with samples (a chamber tap alone is not a closure
 * yet; closure_progress_idx holds exactly those, so no series is read). Readings are marked per
 * visit in one pass (indexes on campaign_id, visit_id), never looked up per collar: correlated
 * subqueries measured 2.5 s for 5 000 collars × 20 campaigns.
 */
const VISITS_SQL = `
WITH done AS (SELECT visit_id, bool_or(kind = 0) AS has_offset, count(*) FILTER (WHERE kind = 1) AS closures, bool_or(kind = 2) AS has_probe
                FROM (SELECT visit_id, 0 AS kind FROM offset_set WHERE campaign_id = $1 AND NOT deleted
                      UNION ALL
                      SELECT visit_id, 1 FROM closure WHERE campaign_id = $1 AND NOT deleted AND review_state <> 'rejected'
                         AND jsonb_array_length(series->'tS') > 0
                      UNION ALL
                      SELECT visit_id, 2 FROM probe_reading WHERE campaign_id = $1 AND NOT deleted) m
               GROUP BY visit_id)
SELECT json_build_object(
         'collar', coalesce(json_agg(v.collar_id), '[]'), 'round', coalesce(json_agg(v.round), '[]'),
         'done', coalesce(json_agg(8 * coalesce(d.closures, 0) + 4 * coalesce(d.has_probe, false)::int + 2 * coalesce(d.has_offset, false)::int), '[]'),
         'skip_collar', coalesce(json_agg(v.collar_id) FILTER (WHERE v.skipped), '[]'), 'skip_round', coalesce(json_agg(v.round) FILTER (WHERE v.skipped), '[]'),
         'skip_at', coalesce(json_agg((extract(epoch FROM v.arrived_at) * 1000000)::bigint) FILTER (WHERE v.skipped), '[]'),
         'skip_reason', coalesce(json_agg(v.skip_reason) FILTER (WHERE v.skipped), '[]'))::text AS visits
  FROM visit v LEFT JOIN done d ON d.visit_id = v.id
 WHERE v.campaign_id = $1 AND NOT v.deleted AND ($2::int IS NULL OR v.round = $2::int)`;

const emptyCounts = (): StateCounts => ({ due: 0, partial: 0, complete: 0, skipped: 0 });

function itemState(done: number, needed: number): ProgressState {
  return done >= needed ? 'complete' : done > 0 ? 'partial' : 'due';
}

/** Sums the visits per collar and asked round; the latest skipped visit of a round gives the reason. */
function tallyVisits(v: Visits, placeOf: Map<string, number>, rounds: number[]): Tally {
  const size = placeOf.size * rounds.length;
  const t: Tally = { offsets: new Int32Array(size), closures: new Int32Array(size), probes: new Int32Array(size),
    skippedAt: new Float64Array(size).fill(-Infinity), skipReason: new Array(size).fill(null) };
  // Visits of collars off the campaign's routes, or of rounds not asked, count nowhere.
  const at = (collarId: string, round: number) => {
    const place = placeOf.get(collarId), r = rounds.indexOf(round);
    return place === undefined || r < 0 ? -1 : place * rounds.length + r;
  };
  for (let i = 0; i < v.collar.length; i++) {
    const x = at(v.collar[i], v.round[i]);
    if (x < 0) continue;
    t.offsets[x] += (v.done[i] >> 1) & 1;
    t.probes[x] += (v.done[i] >> 2) & 1;
    t.closures[x] += v.done[i] >> 3;
  }
  for (let i = 0; i < v.skip_collar.length; i++) {
    const x = at(v.skip_collar[i], v.skip_round[i]);
    if (x >= 0 && v.skip_at[i] >= t.skippedAt[x]) { t.skippedAt[x] = v.skip_at[i]; t.skipReason[x] = v.skip_reason[i]; }
  }
  return t;
}

/** A collar's state over the requested rounds from its per-round counts (plain loops: it runs for every collar). */
function collarProgress(t: Tally, place: number, needs: ItemCounts, rounds: number[]) {
  let offsetDone = 0, closuresDone = 0, probesDone = 0;
  let skippedRounds = 0, completeRounds = 0, dueRounds = 0;
  let skipReason: string | null = null;
  for (let x = place * rounds.length; x < (place + 1) * rounds.length; x++) {
    if (t.skippedAt[x] > -Infinity) { skippedRounds++; skipReason = t.skipReason[x]; continue; }
    // Extra closures in one round do not fill another.
    const offset = Math.min(t.offsets[x], needs.offset), closures = Math.min(t.closures[x], needs.closures);
    const probes = Math.min(t.probes[x], needs.probes);
    offsetDone += offset; closuresDone += closures; probesDone += probes;
    if (offset >= needs.offset && closures >= needs.closures && probes >= needs.probes) completeRounds++;
    else if (offset + closures + probes === 0) dueRounds++;
  }
  const allSkipped = skippedRounds === rounds.length;
  const item = (done: number, need: number): Item => ({
    state: allSkipped ? 'skipped' : itemState(done, need * (rounds.length - skippedRounds)), done, needed: need * rounds.length });
  const items: Partial<Record<keyof ItemCounts, Item>> = {};
  if (needs.offset) items.offset = item(offsetDone, needs.offset);
  if (needs.closures) items.closures = item(closuresDone, needs.closures);
  if (needs.probes) items.probes = item(probesDone, needs.probes);
  const state: ProgressState = allSkipped ? 'skipped'
    : completeRounds + skippedRounds === rounds.length ? 'complete'
    // A skipped round is handled, not progress: skipped + untouched rounds are still "due".
    : dueRounds + skippedRounds === rounds.length ? 'due' : 'partial';
  return { state, skipReason: skippedRounds ? skipReason : null, items };
}

/** The collars' parallel arrays, for each place in walking order the index into them, and each collar's place. */
function readCollars(text: string): { c: Collars; order: Int32Array; placeOf: Map<string, number> } {
  const c = JSON.parse(text) as Collars;
  const order = new Int32Array(c.id.length);
  const placeOf = new Map<string, number>();
  for (let i = 0; i < c.id.length; i++) {
    order[c.pos[i] - 1] = i;
    placeOf.set(c.id[i], c.pos[i] - 1);
  }
  return { c, order, placeOf };
}

/** A campaign's progress; inside a write (an EntityManager) it counts the transaction's own records too. */
export async function campaignProgress(ds: DataSource | EntityManager, user: SessionUser, campaignId: string, round: number | null) {
  const [camp] = await ds.query(
    `SELECT site_id, rounds, due_offset, due_closures, due_probes FROM campaign WHERE id = $1 AND NOT deleted`, [campaignId]);
  if (!camp || (!seesAllSites(user.roles) && !user.siteIds.includes(camp.site_id))) throw notFound('No such campaign');
  if (round !== null && round > camp.rounds) throw notFound(`The campaign has ${camp.rounds} round(s)`);
  // The collar list is read while the visits query still runs.
  const [{ c, order, placeOf }, [{ visits }]]: [ReturnType<typeof readCollars>, [{ visits: string }]] = await Promise.all([
    ds.query(COLLARS_SQL, [campaignId]).then(([answer]) => readCollars(answer.collars)), ds.query(VISITS_SQL, [campaignId, round])]);
  const needs: ItemCounts = { offset: camp.due_offset ? 1 : 0, closures: camp.due_closures, probes: camp.due_probes ? 1 : 0 };
  const rounds = round === null ? Array.from({ length: camp.rounds }, (_, i) => i + 1) : [round];
  const tally = tallyVisits(JSON.parse(visits), placeOf, rounds);
  // Counted in maps (no property lookups by fresh id strings), handed out as objects in first-seen order.
  const byRoute = new Map<string, StateCounts>(), byPlot = new Map<string, StateCounts>(), byTreatment = new Map<string, StateCounts>();
  const bump = (group: Map<string, StateCounts>, key: string | null, s: ProgressState) => {
    if (!key) return;
    let counts = group.get(key);
    if (!counts) group.set(key, counts = emptyCounts());
    counts[s]++;
  };
  const collars = Array.from(order, (i, place) => {
    const routeId = c.route[i] === null ? null : c.routes[c.route[i]! - 1];
    const { state, skipReason, items } = collarProgress(tally, place, needs, rounds);
    bump(byRoute, routeId, state);
    bump(byPlot, c.plot[i], state);
    bump(byTreatment, c.plot_treatment[i], state);
    bump(byTreatment, c.treatment[i], state);
    return { collarId: c.id[i], code: c.code[i], routeId, plotId: c.plot[i], state, skipReason, items };
  });
  const totals = { byRoute: Object.fromEntries(byRoute), byPlot: Object.fromEntries(byPlot), byTreatment: Object.fromEntries(byTreatment) };
  return { collars, totals };
}
