import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { collarProgress, walkingOrder, type CollarProgress, type Direction, type DueSettings } from './route-order';

/** One collar of the route as the crew's screens show it, with its state in the round. */
export interface RouteRow extends CollarProgress {
  id: string;
  code: string;
  plotCode: string;
  latitude: number | null;
  longitude: number | null;
  status: string;
}

export interface RouteView {
  rows: RouteRow[];
  due: DueSettings;
  direction: Direction;
  rounds: number;
  /** The round these rows are in (the list says so, so a test can wait for a new round's order). */
  round: number;
}

export interface RouteParams {
  campaignId: string | null;
  routeId: string | null;
  round: number;
  flipped: boolean;
}

/** The route's collars in walking order, without the round's records (these change at every save). */
export interface RoutePlan {
  collars: Omit<RouteRow, keyof CollarProgress>[];
  due: DueSettings;
  direction: Direction;
  rounds: number;
}

/** The round's records of a campaign: they change with every save at a visit. */
export interface RoundRecords {
  visits: LocalRecord<'visit'>[];
  offsetSets: LocalRecord<'offsetSet'>[];
  probes: LocalRecord<'probeReading'>[];
  closures: LocalRecord<'closure'>[];
}

const live = (r: { deleted?: boolean }) => !r.deleted;

export async function loadRoutePlan(db: FluxDb, p: RouteParams): Promise<RoutePlan | null> {
  if (!p.campaignId || !p.routeId) return null;
  const [campaign, route] = await Promise.all([db.records('campaign').get(p.campaignId), db.records('route').get(p.routeId)]);
  if (!campaign || !route) return null;
  const plan = campaign.routes.find((r) => r.routeId === p.routeId);
  const direction = plan?.direction ?? 'forward';
  const ids = walkingOrder(route.collarIds, direction, p.round, p.flipped);
  const collars = (await db.records('collar').bulkGet(ids)).filter((c): c is LocalRecord<'collar'> => !!c);
  // A site has a handful of plots: each is read once, not once per collar.
  const plotIds = [...new Set(collars.map((c) => c.plotId))];
  const plots = new Map(
    (await db.records('plot').bulkGet(plotIds)).filter((pl): pl is LocalRecord<'plot'> => !!pl).map((pl) => [pl.id, pl]),
  );
  return {
    collars: collars.map((c) => ({
      id: c.id,
      code: c.code,
      plotCode: plots.get(c.plotId)?.code ?? '',
      latitude: c.latitude,
      longitude: c.longitude,
      status: c.status,
    })),
    due: { dueOffset: campaign.dueOffset, dueClosures: campaign.dueClosures, dueProbes: campaign.dueProbes },
    direction,
    rounds: campaign.rounds,
  };
}

export async function loadRoundRecords(db: FluxDb, p: { campaignId: string | null; round: number }): Promise<RoundRecords> {
  if (!p.campaignId) return { visits: [], offsetSets: [], probes: [], closures: [] };
  const visits = await db
    .records('visit')
    .where('campaignId')
    .equals(p.campaignId)
    .filter((v) => v.round === p.round && live(v))
    .toArray();
  const ids = visits.map((v) => v.id);
  const of = <E extends 'offsetSet' | 'probeReading' | 'closure'>(entity: E): Promise<LocalRecord<E>[]> =>
    ids.length ? db.records(entity).where('visitId').anyOf(ids).filter(live).toArray() : Promise.resolve([]);
  const [offsetSets, probes, closures] = await Promise.all([of('offsetSet'), of('probeReading'), of('closure')]);
  return { visits, offsetSets, probes, closures };
}

/** Groups records by their collar in one pass over them. */
function byCollar<R extends { collarId: string }>(records: readonly R[]): Map<string, R[]> {
  const out = new Map<string, R[]>();
  for (const r of records) {
    const id = r.collarId;
    const list = out.get(id);
    if (list) list.push(r);
    else out.set(id, [r]);
  }
  return out;
}

/** Rows of collars with nothing recorded in the round, made once per plan: a save elsewhere on the route leaves them as they are. */
const untouchedRows = new WeakMap<RoutePlan, Map<string, RouteRow>>();

/**
 * Each collar's state in the round. The round's records are grouped by collar once, so the work
 * grows with collars + records, not collars × records (5 000 collars on a route); a collar with
 * nothing recorded keeps its row object from one save to the next.
 */
export function routeRows(plan: RoutePlan, round: RoundRecords): RouteRow[] {
  const visits = byCollar(round.visits),
    sets = byCollar(round.offsetSets),
    probes = byCollar(round.probes),
    closures = byCollar(round.closures);
  const none: [] = [];
  let untouched = untouchedRows.get(plan);
  if (!untouched) untouchedRows.set(plan, (untouched = new Map()));
  return plan.collars.map((c) => {
    const v = visits.get(c.id);
    if (v) return { ...c, ...collarProgress(plan.due, v, sets.get(c.id) ?? none, probes.get(c.id) ?? none, closures.get(c.id) ?? none) };
    // A collar with no visit in this round has nothing of its own yet: it is due in full.
    let row = untouched.get(c.id);
    if (!row) untouched.set(c.id, (row = { ...c, ...collarProgress(plan.due, none, none, none, none) }));
    return row;
  });
}
