import {
  collarProgress as roundProgress,
  countVisits,
  dueItems,
  tallyRound,
  type ClosureFacts,
  type DueSettings,
  type ReadingFacts,
  type VisitFacts,
} from '../../../../shared/progress/visit-progress';
import { progressCountsText } from '../../../../shared/model/progress-state';
import type { CollarState } from '../../core/map/collar-states';

export type { CollarState, DueSettings };
export type Direction = 'forward' | 'reverse' | 'alternate';

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

/**
 * What the campaign still needs at one collar in one round, from the records on the device, by the
 * one progress rule (shared/progress/visit-progress.ts) that the Board's progress route follows too.
 */
export function collarProgress(
  due: DueSettings,
  visits: readonly VisitFacts[],
  offsetSets: readonly ReadingFacts[],
  probes: readonly ReadingFacts[],
  closures: readonly ClosureFacts[],
): CollarProgress {
  const tally = tallyRound(countVisits(visits, offsetSets, probes, closures));
  const { state, skipReason } = roundProgress(due, [tally]);
  return { state, due: dueItems(due, tally), skipReason };
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
