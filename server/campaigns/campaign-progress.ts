import { DataSource, type EntityManager } from 'typeorm';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import {
  addVisit,
  collarProgress,
  emptyTally,
  type DueSettings,
  type ProgressState,
  type RoundTally,
} from '../../shared/progress/visit-progress';
import { notFound } from '../core/errors';

export type { ProgressState };

type StateCounts = Record<ProgressState, number>;

/**
 * The campaign's collars as parallel arrays: place in walking order (from 1), id, code, route
 * number (from 1 into routes; null when the campaign has no routes), plot id, plot's and collar's
 * treatment ids.
 */
interface Collars {
  routes: string[];
  pos: number[];
  id: string[];
  code: string[];
  route: (number | null)[];
  plot: string[];
  plot_treatment: (string | null)[];
  treatment: (string | null)[];
}
/**
 * The campaign's live visits as parallel arrays. Worked (not skipped) visits: collar id, round and
 * what the visit holds as the shared rule counts it, packed in one number (8 × closures + 4 if a
 * probe reading + 2 if an offset set: one array instead of three). Skipped visits: collar id,
 * round, id, arrival (ms since 1970) and reason (their readings never count).
 */
interface Visits {
  collar: string[];
  round: number[];
  done: number[];
  skip_collar: string[];
  skip_round: number[];
  skip_id: string[];
  skip_at: number[];
  skip_reason: (string | null)[];
}

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
 * Every live visit of the campaign (of the asked round) with what it holds by the shared rule
 * (shared/progress/visit-progress.ts), as the visit_progress table keeps it: triggers recount a
 * visit in the transaction that writes it or its offset sets, probe readings and closures
 * (server/migrations/20261204232500-visit-progress.ts). test/api/progress-rule.test.ts proves the
 * counts equal the rule's on seeded campaigns. One narrow row per visit: nothing is aggregated on ask.
 */
const VISITS_SQL = `
SELECT json_build_object(
         'collar', coalesce(json_agg(collar_id) FILTER (WHERE NOT skipped), '[]'),
         'round', coalesce(json_agg(round) FILTER (WHERE NOT skipped), '[]'),
         'done', coalesce(json_agg(8 * closures + 4 * probes + 2 * offsets) FILTER (WHERE NOT skipped), '[]'),
         'skip_collar', coalesce(json_agg(collar_id) FILTER (WHERE skipped), '[]'), 'skip_round', coalesce(json_agg(round) FILTER (WHERE skipped), '[]'),
         'skip_id', coalesce(json_agg(visit_id) FILTER (WHERE skipped), '[]'),
         'skip_at', coalesce(json_agg(floor(extract(epoch FROM arrived_at) * 1000)::bigint) FILTER (WHERE skipped), '[]'),
         'skip_reason', coalesce(json_agg(skip_reason) FILTER (WHERE skipped), '[]'))::text AS visits
  FROM visit_progress
 WHERE campaign_id = $1 AND ($2::int IS NULL OR round = $2::int)`;

const emptyCounts = (): StateCounts => ({ due: 0, partial: 0, complete: 0, skipped: 0 });
const NO_VISIT: RoundTally = Object.freeze(emptyTally());

/**
 * Each collar's rounds (by place in walking order, at place × rounds + round index), summed visit by
 * visit with the shared rule's addVisit; a round without a visit stays NO_VISIT.
 */
function tallyVisits(v: Visits, placeOf: Map<string, number>, rounds: number[]): RoundTally[] {
  const t: RoundTally[] = new Array(placeOf.size * rounds.length).fill(NO_VISIT);
  // Visits of collars off the campaign's routes, or of rounds not asked, count nowhere.
  const at = (collarId: string, round: number) => {
    const place = placeOf.get(collarId),
      r = rounds.indexOf(round);
    return place === undefined || r < 0 ? -1 : place * rounds.length + r;
  };
  const add = (x: number, visit: Parameters<typeof addVisit>[1]) => {
    if (t[x] === NO_VISIT) t[x] = emptyTally();
    addVisit(t[x], visit);
  };
  for (let i = 0; i < v.collar.length; i++) {
    const x = at(v.collar[i], v.round[i]);
    if (x < 0) continue;
    add(x, {
      id: '',
      skipped: false,
      skipReason: null,
      arrivedMs: 0,
      offsets: (v.done[i] >> 1) & 1,
      probes: (v.done[i] >> 2) & 1,
      closures: v.done[i] >> 3,
    });
  }
  for (let i = 0; i < v.skip_collar.length; i++) {
    const x = at(v.skip_collar[i], v.skip_round[i]);
    if (x < 0) continue;
    add(x, { id: v.skip_id[i], skipped: true, skipReason: v.skip_reason[i], arrivedMs: v.skip_at[i], offsets: 0, probes: 0, closures: 0 });
  }
  return t;
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

type CollarList = ReturnType<typeof readCollars>;
const LISTS = new Map<string, { layout: string | null; list: CollarList }>();
const KEPT_LISTS = 8;

/**
 * The campaign's collar list, reused while the site's latest collar/plot/route/campaign change-log
 * seq is the one it was read at (seqs are handed out in commit order, never reused). Inside a
 * transaction it is always read afresh: the transaction's own changes reach the log only at its end.
 */
async function collarList(ds: DataSource | EntityManager, campaignId: string, layout: string | null): Promise<CollarList> {
  const shared = ds instanceof DataSource;
  const kept = shared ? LISTS.get(campaignId) : undefined;
  if (kept && kept.layout === layout) return kept.list;
  const [answer] = await ds.query(COLLARS_SQL, [campaignId]);
  const list = readCollars(answer.collars);
  if (shared) {
    LISTS.delete(campaignId);
    LISTS.set(campaignId, { layout, list });
    if (LISTS.size > KEPT_LISTS) LISTS.delete(LISTS.keys().next().value!);
  }
  return list;
}

/** A campaign's progress; inside a write (an EntityManager) it counts the transaction's own records too. */
export async function campaignProgress(ds: DataSource | EntityManager, user: SessionUser, campaignId: string, round: number | null) {
  const [camp] = await ds.query(
    `SELECT site_id, rounds, due_offset, due_closures, due_probes,
            (SELECT max(seq) FROM change_log l WHERE l.site_id = campaign.site_id AND l.entity IN ('collar', 'plot', 'route', 'campaign'))::text AS layout
       FROM campaign WHERE id = $1 AND NOT deleted`,
    [campaignId],
  );
  if (!camp || (!seesAllSites(user.roles) && !user.siteIds.includes(camp.site_id))) throw notFound('No such campaign');
  if (round !== null && round > camp.rounds) throw notFound(`The campaign has ${camp.rounds} round(s)`);
  // The collar list is read while the visits query still runs.
  const [{ c, order, placeOf }, [{ visits }]]: [CollarList, [{ visits: string }]] = await Promise.all([
    collarList(ds, campaignId, camp.layout),
    ds.query(VISITS_SQL, [campaignId, round]),
  ]);
  const due: DueSettings = { dueOffset: camp.due_offset, dueClosures: camp.due_closures, dueProbes: camp.due_probes };
  const rounds = round === null ? Array.from({ length: camp.rounds }, (_, i) => i + 1) : [round];
  const tally = tallyVisits(JSON.parse(visits), placeOf, rounds);
  // Counted in maps (no property lookups by fresh id strings), handed out as objects in first-seen order.
  const byRoute = new Map<string, StateCounts>(),
    byPlot = new Map<string, StateCounts>(),
    byTreatment = new Map<string, StateCounts>();
  const bump = (group: Map<string, StateCounts>, key: string | null, s: ProgressState) => {
    if (!key) return;
    let counts = group.get(key);
    if (!counts) group.set(key, (counts = emptyCounts()));
    counts[s]++;
  };
  // One array reused for every collar's rounds (no slice per collar).
  const mine: RoundTally[] = new Array(rounds.length);
  const collars = Array.from(order, (i, place) => {
    const routeId = c.route[i] === null ? null : c.routes[c.route[i]! - 1];
    for (let r = 0; r < rounds.length; r++) mine[r] = tally[place * rounds.length + r];
    const { state, skipReason, items } = collarProgress(due, mine);
    bump(byRoute, routeId, state);
    bump(byPlot, c.plot[i], state);
    bump(byTreatment, c.plot_treatment[i], state);
    bump(byTreatment, c.treatment[i], state);
    return { collarId: c.id[i], code: c.code[i], routeId, plotId: c.plot[i], state, skipReason, items };
  });
  const totals = { byRoute: Object.fromEntries(byRoute), byPlot: Object.fromEntries(byPlot), byTreatment: Object.fromEntries(byTreatment) };
  return { collars, totals };
}
