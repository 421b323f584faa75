import type { DataSource } from 'typeorm';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import { notFound } from '../core/errors';

export type ProgressState = 'due' | 'partial' | 'complete' | 'skipped';
interface Item { state: ProgressState; done: number; needed: number }
type StateCounts = Record<ProgressState, number>;

interface Row {
  collar_id: string; code: string; route_id: string | null; plot_id: string; treatment_ids: string[];
  rounds: number; due_offset: boolean; due_closures: number; due_probes: boolean;
  per_round: { round: number; skipped: boolean; skip_reason: string | null; offsets: number; closures: number; probes: number }[] | null;
}

/**
 * One round trip: every collar of the campaign's routes (all live collars of the site when it has
 * no routes) with, per round, whether it was skipped and how many offset sets, non-rejected
 * closures and probe readings its visits hold. States are derived below from those counts.
 */
const PROGRESS_SQL = `
WITH c AS (SELECT * FROM campaign WHERE id = $1 AND NOT deleted),
rc AS (SELECT (x->>'routeId')::uuid AS route_id, u.collar_id, u.ord
         FROM c, jsonb_array_elements(c.routes) x
         JOIN route r ON r.id = (x->>'routeId')::uuid AND NOT r.deleted
         CROSS JOIN LATERAL unnest(r.collar_ids) WITH ORDINALITY u(collar_id, ord)),
cols AS (SELECT k.id, k.code, k.plot_id, array_remove(ARRAY[p.treatment_id, k.treatment_id], NULL) AS treatment_ids,
                (SELECT rc.route_id FROM rc WHERE rc.collar_id = k.id ORDER BY rc.route_id LIMIT 1) AS route_id,
                (SELECT min(rc.ord) FROM rc WHERE rc.collar_id = k.id) AS ord
           FROM c JOIN collar k ON k.site_id = c.site_id AND NOT k.deleted
           JOIN plot p ON p.id = k.plot_id
          WHERE NOT EXISTS (SELECT 1 FROM rc) OR k.id IN (SELECT collar_id FROM rc)),
per AS (SELECT v.collar_id, v.round, bool_or(v.skipped) AS skipped,
               (array_agg(v.skip_reason ORDER BY v.arrived_at DESC) FILTER (WHERE v.skipped))[1] AS skip_reason,
               count(*) FILTER (WHERE EXISTS (SELECT 1 FROM offset_set o WHERE o.visit_id = v.id AND NOT o.deleted)) AS offsets,
               coalesce(sum((SELECT count(*) FROM closure z WHERE z.visit_id = v.id AND NOT z.deleted AND z.review_state <> 'rejected')), 0) AS closures,
               count(*) FILTER (WHERE EXISTS (SELECT 1 FROM probe_reading pr WHERE pr.visit_id = v.id AND NOT pr.deleted)) AS probes
          FROM visit v WHERE v.campaign_id = $1 AND NOT v.deleted AND ($2::int IS NULL OR v.round = $2::int)
         GROUP BY v.collar_id, v.round)
SELECT cols.id AS collar_id, cols.code, cols.route_id, cols.plot_id, cols.treatment_ids,
       c.rounds, c.due_offset, c.due_closures, c.due_probes,
       (SELECT json_agg(json_build_object('round', per.round, 'skipped', per.skipped, 'skip_reason', per.skip_reason,
                 'offsets', per.offsets, 'closures', per.closures, 'probes', per.probes))
          FROM per WHERE per.collar_id = cols.id) AS per_round
  FROM cols CROSS JOIN c
 ORDER BY cols.route_id NULLS LAST, cols.ord NULLS LAST, cols.code`;

const emptyCounts = (): StateCounts => ({ due: 0, partial: 0, complete: 0, skipped: 0 });

function itemState(done: number, needed: number): ProgressState {
  return done >= needed ? 'complete' : done > 0 ? 'partial' : 'due';
}

/** A collar's state over the requested rounds from its per-round counts. */
function collarProgress(row: Row, rounds: number[]) {
  const perRound = new Map((row.per_round ?? []).map((p) => [p.round, p]));
  const needs = { offset: row.due_offset ? 1 : 0, closures: row.due_closures, probes: row.due_probes ? 1 : 0 };
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
  const [camp] = await ds.query(`SELECT site_id, rounds FROM campaign WHERE id = $1 AND NOT deleted`, [campaignId]);
  if (!camp || (!seesAllSites(user.roles) && !user.siteIds.includes(camp.site_id))) throw notFound('No such campaign');
  if (round !== null && round > camp.rounds) throw notFound(`The campaign has ${camp.rounds} round(s)`);
  const rows: Row[] = await ds.query(PROGRESS_SQL, [campaignId, round]);
  const rounds = round === null ? Array.from({ length: camp.rounds }, (_, i) => i + 1) : [round];
  const totals = { byRoute: {} as Record<string, StateCounts>, byPlot: {} as Record<string, StateCounts>, byTreatment: {} as Record<string, StateCounts> };
  const bump = (group: Record<string, StateCounts>, key: string | null, s: ProgressState) => {
    if (key) (group[key] ??= emptyCounts())[s]++;
  };
  const collars = rows.map((row) => {
    const p = collarProgress(row, rounds);
    bump(totals.byRoute, row.route_id, p.state);
    bump(totals.byPlot, row.plot_id, p.state);
    for (const t of row.treatment_ids) bump(totals.byTreatment, t, p.state);
    return { collarId: row.collar_id, code: row.code, routeId: row.route_id, plotId: row.plot_id, ...p };
  });
  return { collars, totals };
}
