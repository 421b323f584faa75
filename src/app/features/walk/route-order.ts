import type { LocalRecord } from '../../core/db/db-schema';
import { progressCountsText } from '../../../../shared/model/progress-state';
import type { CollarState } from '../../core/map/collar-states';

export type { CollarState };
export type Direction = 'forward' | 'reverse' | 'alternate';

export interface DueSettings {
  dueOffset: boolean;
  dueClosures: number;
  dueProbes: boolean;
}

export interface CollarProgress {
  state: CollarState;
  /** What is still to do at the collar, in the order a crew works. */
  due: string[];
  skipReason: string | null;
}

/**
 * Walking order for a round. "alternate" walks odd rounds forward and even rounds backward, so
 * that treatments are not confounded with time of day; the crew may flip it on the spot.
 */
export function walkingOrder<T>(collarIds: readonly T[], direction: Direction, round: number, flipped: boolean): T[] {
  const reverse = (direction === 'reverse' || (direction === 'alternate' && round % 2 === 0)) !== flipped;
  return reverse ? [...collarIds].reverse() : [...collarIds];
}

/** What the campaign still needs at one collar in one round, from the records on the device. */
export function collarProgress(
  due: DueSettings,
  visits: readonly LocalRecord[],
  offsetSets: readonly LocalRecord[],
  probes: readonly LocalRecord[],
  closures: readonly LocalRecord[],
): CollarProgress {
  const skipped = visits.find((v) => v['skipped'] === true);
  const active = visits.filter((v) => v['skipped'] !== true);
  if (skipped && !active.length) return { state: 'skipped', due: [], skipReason: String(skipped['skipReason'] ?? '') };
  const ids = new Set(active.map((v) => v.id));
  const mine = (r: LocalRecord) => ids.has(String(r['visitId']));
  const left: string[] = [];
  if (due.dueOffset && !offsetSets.some(mine)) left.push('offset');
  const closuresDone = closures.filter(mine).filter((c) => !closures.some((o) => o['redoOfId'] === c.id)).length;
  if (closuresDone < due.dueClosures) {
    const n = due.dueClosures - closuresDone;
    left.push(n === 1 ? 'closure' : `${n} closures`);
  }
  if (due.dueProbes && !probes.some(mine)) left.push('probes');
  // A visit with nothing recorded yet (conditions only) already counts as started.
  const state: CollarState = !left.length ? 'complete' : active.length ? 'partial' : 'due';
  return { state, due: left, skipReason: null };
}

/** The next collar to walk to: the first in walking order that is still due or partly done. */
export function nextDueIndex(states: readonly CollarState[]): number {
  return states.findIndex((s) => s === 'due' || s === 'partial');
}

/** "2 due, 1 partial, 3 complete, 1 skipped": the route's collars counted in the words the Board and the digest use. */
export function routeSummary(states: readonly CollarState[]): string {
  const counts = { due: 0, partial: 0, complete: 0, skipped: 0 };
  for (const s of states) counts[s]++;
  return progressCountsText(counts);
}
