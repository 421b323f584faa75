import type { DataSource } from 'typeorm';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import { notFound } from '../core/errors';

export type ProgressState = 'due' | 'partial' | 'complete' | 'skipped';
interface Item { state: ProgressState; done: number; needed: number }
type StateCounts = Record<ProgressState, number>;

/** One row per collar and round with visits (a collar with none comes once, round null). */
interface Row {
  collar_id: string; code: string; route_id: string | null; plot_id: string; treatment_ids: string[];
  round: number | null; skipped: boolean | null; skip_reason: string | null; offsets: string | null; closures: string | null; probes: string | null;
}
interface Needs { due_offset: boolean; due_closures: number; due_probes: boolean }
type PerRound = Map<number, Row>;

/**
 * One round trip: every collar of the campaign's routes (all live collars of the site when it has
 * no routes) with, per round, whether it was skipped and how many offset sets, non-rejected
 * closures with samples (a chamber tap alone is not a closure yet) and probe readings its visits hold. States are derived below from those counts.
 * Readings are grouped per visit once and joined (indexes on campaign_id, visit_id), never looked
 * up per collar: 5 000 collars × 20 campaigns measured 2.5 s with correlated subqueries, ~60 ms this way.
 */
const PROGRESS_SQL = `
WITH c AS (SELECT * FROM campaign WHERE id = $1 AND NOT deleted),
rc AS (SELECT (x->>'routeId')::uuid AS route_id, u.collar_id, u.ord
         FROM c, jsonb_array_elements(c.routes) x
         JOIN route r ON r.id = (x->>'routeId')::uuid AND NOT r.deleted
         CROSS JOIN LATERAL unnest(r.collar_ids) WITH ORDINALITY u(collar_id, ord)),
rfirst AS (SELECT collar_id, (array_agg(route_id ORDER BY route_id))[1] AS route_id, min(ord) AS ord FROM rc GROUP BY collar_id),
cols AS (SELECT k.id, k.code, k.plot_id, array_remove(ARRAY[p.treatment_id, k.treatment_id], NULL) AS treatment_ids, rf.route_id, rf.ord
           FROM c JOIN collar k ON k.site_id = c.site_id AND NOT k.deleted
           JOIN plot p ON p.id = k.plot_id
           LEFT JOIN rfirst rf ON rf.collar_id = k.id
          WHERE rf.collar_id IS NOT NULL OR NOT EXISTS (SELECT 1 FROM rc)),
vv AS (SELECT v.id, v.collar_id, v.round, v.skipped, v.skip_reason, v.arrived_at FROM visit v
        WHERE v.campaign_id = $1 AND NOT v.deleted AND ($2::int IS NULL OR v.round = $2::int)),
o AS (SELECT DISTINCT visit_id FROM offset_set WHERE campaign_id = $1 AND NOT deleted),
z AS (SELECT visit_id, count(*) AS n FROM closure WHERE campaign_id = $1 AND NOT deleted AND review_state <> 'rejected'
         AND jsonb_array_length(series->'tS') > 0 GROUP BY visit_id),
pr AS (SELECT DISTINCT visit_id FROM probe_reading WHERE campaign_id = $1 AND NOT deleted),
per AS (SELECT vv.collar_id, vv.round, bool_or(vv.skipped) AS skipped,
               (array_agg(vv.skip_reason ORDER BY vv.arrived_at DESC) FILTER (WHERE vv.skipped))[1] AS skip_reason,
               count(o.visit_id) AS offsets, coalesce(sum(z.n), 0) AS closures, count(pr.visit_id) AS probes
          FROM vv LEFT JOIN o ON o.visit_id = vv.id LEFT JOIN z ON z.visit_id = vv.id LEFT JOIN pr ON pr.visit_id = vv.id
         GROUP BY vv.collar_id, vv.round)
SELECT cols.id AS collar_id, cols.code, cols.route_id, cols.plot_id, cols.treatment_ids,
       per.round, per.skipped, per.skip_reason, per.offsets, per.closures, per.probes
  FROM cols LEFT JOIN per ON per.collar_id = cols.id
 ORDER BY cols.route_id NULLS LAST, cols.ord NULLS LAST, cols.code, per.round`;

const emptyCounts = (): StateCounts => ({ due: 0, partial: 0, complete: 0, skipped: 0 });

function itemState(done: number, needed: number): ProgressState {
  return done >= needed ? 'complete' : done > 0 ? 'partial' : 'due';
}

/** A collar's state over the requested rounds from its per-round counts. */
function collarProgress(perRound: PerRound, camp: Needs, rounds: number[]) {
  const needs = { offset: camp.due_offset ? 1 : 0, closures: camp.due_closures, probes: camp.due_probes ? 1 : 0 };
  const items: Record<string, Item> = {};
  const roundStates: ProgressState[] = [];
  let skipReason: string | null = null;
  for (const key of ['offset', 'closures', 'probes'] as const) {
    if (!needs[key]) continue;
    items[key] = { state: 'due', done: 0, needed: needs[key] * rounds.length };
  }
  for (const r of rounds) {
    const p = perRound.get(r);
    if (p?.skipped) { roundStates.push('skipped'); skipReason = p.skip_reason; continue; }
    const counts = { offset: Number(p?.offsets ?? 0), closures: Number(p?.closures ?? 0), probes: Number(p?.probes ?? 0) };
    let doneAll = true, any = false;
    for (const key of Object.keys(items) as ('offset' | 'closures' | 'probes')[]) {
      const done = Math.min(counts[key], needs[key]); // extra closures in one round do not fill another
      items[key].done += done;
      if (done < needs[key]) doneAll = false;
      if (done > 0) any = true;
    }
    roundStates.push(doneAll ? 'complete' : any ? 'partial' : 'due');
  }
  const skippedRounds = roundStates.filter((s) => s === 'skipped').length;
  for (const [key, item] of Object.entries(items)) {
    const neededUnskipped = needs[key as 'offset'] * (rounds.length - skippedRounds);
    item.state = skippedRounds === rounds.length ? 'skipped' : itemState(item.done, neededUnskipped);
  }
  const state: ProgressState = skippedRounds === rounds.length ? 'skipped'
    : roundStates.every((s) => s === 'complete' || s === 'skipped') ? 'complete'
    // A skipped round is handled, not progress: skipped + untouched rounds are still "due".
    : roundStates.filter((s) => s !== 'skipped').every((s) => s === 'due') ? 'due' : 'partial';
  return { state, skipReason: skippedRounds ? skipReason : null, items };
}

export async function campaignProgress(ds: DataSource, user: SessionUser, campaignId: string, round: number | null) {
  const [camp] = await ds.query(
    `SELECT site_id, rounds, due_offset, due_closures, due_probes FROM campaign WHERE id = $1 AND NOT deleted`, [campaignId]);
  if (!camp || (!seesAllSites(user.roles) && !user.siteIds.includes(camp.site_id))) throw notFound('No such campaign');
  if (round !== null && round > camp.rounds) throw notFound(`The campaign has ${camp.rounds} round(s)`);
  const rows: Row[] = await ds.query(PROGRESS_SQL, [campaignId, round]);
  const rounds = round === null ? Array.from({ length: camp.rounds }, (_, i) => i + 1) : [round];
  const totals = { byRoute: {} as Record<string, StateCounts>, byPlot: {} as Record<string, StateCounts>, byTreatment: {} as Record<string, StateCounts> };
  const bump = (group: Record<string, StateCounts>, key: string | null, s: ProgressState) => {
    if (key) (group[key] ??= emptyCounts())[s]++;
  };
  const byCollar = new Map<string, { row: Row; perRound: PerRound }>();
  for (const row of rows) {
    const entry = byCollar.get(row.collar_id) ?? { row, perRound: new Map() };
    if (row.round !== null) entry.perRound.set(row.round, row);
    byCollar.set(row.collar_id, entry);
  }
  const collars = [...byCollar.values()].map(({ row, perRound }) => {
    const p = collarProgress(perRound, camp, rounds);
    bump(totals.byRoute, row.route_id, p.state);
    bump(totals.byPlot, row.plot_id, p.state);
    for (const t of row.treatment_ids) bump(totals.byTreatment, t, p.state);
    return { collarId: row.collar_id, code: row.code, routeId: row.route_id, plotId: row.plot_id, ...p };
  });
  return { collars, totals };
}
