import type { EntityFields } from '../model/entities';
import { PROGRESS_STATES, type ProgressState } from '../model/progress-state';

/**
 * The one rule for a collar's progress in a campaign, used by Walk (on the device) and by the
 * Board's progress route (on the server, which counts the per-visit part in SQL and proves it
 * equal in test/api/progress-rule.test.ts).
 *
 * Per visit: only a live, not-skipped visit counts; it holds an offset set or a probe reading if a
 * live one names it, and its closures are the live ones that have samples (a chamber tap alone is
 * not a closure yet), that the lab has not rejected and that no live closure redoes (the redo
 * replaces the closure it names).
 * Per round: skipped when the round has skipped visits and no counted one (a crew that came back
 * and worked the collar wins over a skip); complete when every due item is done; partial once a
 * counted visit exists (a visit with only its conditions is started); otherwise due.
 * All rounds: skipped when every round is; complete when every round is complete or skipped; due
 * when every round is due or skipped; otherwise partial. An item's done count sums the rounds
 * not skipped, each capped at that round's need (extra closures in one round do not fill another).
 */
export { PROGRESS_STATES, type ProgressState };
export type ItemKey = 'offset' | 'closures' | 'probes';

/** What a campaign asks at each collar in each round. */
export interface DueSettings {
  dueOffset: boolean;
  dueClosures: number;
  dueProbes: boolean;
}

type Live = { id: string; deleted?: boolean };
export type VisitFacts = Live & Pick<EntityFields<'visit'>, 'skipped' | 'skipReason' | 'arrivedAt'>;
export type ReadingFacts = { deleted?: boolean } & Pick<EntityFields<'offsetSet'>, 'visitId'>;
export type ClosureFacts = Live &
  Pick<EntityFields<'closure'>, 'visitId' | 'redoOfId' | 'reviewState'> & { series: { tS: readonly unknown[] } };

/** What one visit holds, as counted by the rule (the server's SQL answers exactly these numbers). */
export interface VisitCount {
  id: string;
  skipped: boolean;
  skipReason: string | null;
  /** Arrival, ms since 1970: the latest skipped visit of a round gives the reason. */
  arrivedMs: number;
  offsets: number;
  probes: number;
  closures: number;
}

/** One collar's round, summed over its visits. */
export interface RoundTally {
  /** Live visits that are not skipped. */
  worked: number;
  skips: number;
  skipReason: string | null;
  skipMs: number;
  skipId: string;
  offsets: number;
  probes: number;
  closures: number;
}

export const emptyTally = (): RoundTally => ({
  worked: 0,
  skips: 0,
  skipReason: null,
  skipMs: -Infinity,
  skipId: '',
  offsets: 0,
  probes: 0,
  closures: 0,
});

/** The closures that count, by visit id: live, with samples, not rejected, not redone by a live closure. */
export function countedClosures(closures: readonly ClosureFacts[]): Map<string, number> {
  const live = closures.filter((c) => !c.deleted);
  const redone = new Set(live.map((c) => c.redoOfId).filter((id): id is string => !!id));
  const byVisit = new Map<string, number>();
  for (const c of live) {
    if (c.reviewState === 'rejected' || !c.series.tS.length || redone.has(c.id)) continue;
    byVisit.set(c.visitId, (byVisit.get(c.visitId) ?? 0) + 1);
  }
  return byVisit;
}

/** Each live visit with what it holds, from the records that name it. */
export function countVisits(
  visits: readonly VisitFacts[],
  offsetSets: readonly ReadingFacts[],
  probes: readonly ReadingFacts[],
  closures: readonly ClosureFacts[],
): VisitCount[] {
  const has = (list: readonly ReadingFacts[]) => new Set(list.filter((r) => !r.deleted).map((r) => r.visitId));
  const offsets = has(offsetSets),
    probed = has(probes),
    closed = countedClosures(closures);
  return visits
    .filter((v) => !v.deleted)
    .map((v) => ({
      id: v.id,
      skipped: v.skipped,
      skipReason: v.skipReason,
      arrivedMs: Date.parse(v.arrivedAt),
      offsets: offsets.has(v.id) ? 1 : 0,
      probes: probed.has(v.id) ? 1 : 0,
      closures: closed.get(v.id) ?? 0,
    }));
}

/** Adds one live visit to its round's tally: a skipped visit adds its skip only, never its readings. */
export function addVisit(t: RoundTally, v: VisitCount): RoundTally {
  if (v.skipped) {
    t.skips++;
    if (v.arrivedMs > t.skipMs || (v.arrivedMs === t.skipMs && v.id > t.skipId)) {
      t.skipMs = v.arrivedMs;
      t.skipId = v.id;
      t.skipReason = v.skipReason;
    }
    return t;
  }
  t.worked++;
  t.offsets += v.offsets;
  t.probes += v.probes;
  t.closures += v.closures;
  return t;
}

export function tallyRound(visits: readonly VisitCount[]): RoundTally {
  return visits.reduce(addVisit, emptyTally());
}

export interface ItemProgress {
  state: ProgressState;
  done: number;
  needed: number;
}
export interface CollarProgress {
  state: ProgressState;
  skipReason: string | null;
  items: Partial<Record<ItemKey, ItemProgress>>;
}

const roundSkipped = (t: RoundTally) => t.skips > 0 && t.worked === 0;

/**
 * Item answers are few distinct values repeated over thousands of collars: one frozen object per
 * value (the server builds 20 000 collars' items per ask; fresh objects were most of its garbage).
 */
const ITEMS = new Map<number, ItemProgress>();
function sharedItem(state: ProgressState, done: number, needed: number): ItemProgress {
  const key = (needed * 65536 + done) * 4 + PROGRESS_STATES.indexOf(state);
  let it = ITEMS.get(key);
  if (!it) {
    it = Object.freeze({ state, done, needed });
    if (ITEMS.size < 10_000) ITEMS.set(key, it);
  }
  return it;
}

function itemState(done: number, needed: number): ProgressState {
  return done >= needed ? 'complete' : done > 0 ? 'partial' : 'due';
}

/**
 * A collar's progress over the asked rounds (one tally per round; one tally for a single round).
 * Plain loops: the server runs it for every collar of a campaign.
 */
export function collarProgress(due: DueSettings, rounds: readonly RoundTally[]): CollarProgress {
  const need = { offset: due.dueOffset ? 1 : 0, closures: due.dueClosures, probes: due.dueProbes ? 1 : 0 };
  let offsetDone = 0,
    closuresDone = 0,
    probesDone = 0,
    skipped = 0,
    complete = 0,
    untouched = 0;
  let skipReason: string | null = null;
  for (const t of rounds) {
    if (roundSkipped(t)) {
      skipped++;
      skipReason = t.skipReason;
      continue;
    }
    const offset = Math.min(t.offsets, need.offset),
      closures = Math.min(t.closures, need.closures),
      probes = Math.min(t.probes, need.probes);
    offsetDone += offset;
    closuresDone += closures;
    probesDone += probes;
    if (offset >= need.offset && closures >= need.closures && probes >= need.probes) complete++;
    else if (t.worked === 0) untouched++;
  }
  const n = rounds.length,
    allSkipped = skipped === n;
  const item = (done: number, per: number): ItemProgress =>
    sharedItem(allSkipped ? 'skipped' : itemState(done, per * (n - skipped)), done, per * n);
  const items: CollarProgress['items'] = {};
  if (need.offset) items.offset = item(offsetDone, need.offset);
  if (need.closures) items.closures = item(closuresDone, need.closures);
  if (need.probes) items.probes = item(probesDone, need.probes);
  const state: ProgressState = allSkipped
    ? 'skipped'
    : complete + skipped === n
      ? 'complete'
      : // A skipped round is handled, not progress: skipped + untouched rounds are still "due".
        untouched + skipped === n
        ? 'due'
        : 'partial';
  return { state, skipReason: skipped ? skipReason : null, items };
}

/** What is still to do at the collar in one round, in the order a crew works ("offset", "2 closures", "probes"). */
export function dueItems(due: DueSettings, t: RoundTally): string[] {
  if (roundSkipped(t)) return [];
  const left: string[] = [];
  if (due.dueOffset && t.offsets < 1) left.push('offset');
  const closures = due.dueClosures - t.closures;
  if (closures > 0) left.push(closures === 1 ? 'closure' : `${closures} closures`);
  if (due.dueProbes && t.probes < 1) left.push('probes');
  return left;
}
