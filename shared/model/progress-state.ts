/**
 * The words every surface shows for a collar's state in a campaign round (Walk's route list and
 * map, the Board's table, map and counts, the digest panel and mail, the progress CSV) and for a
 * closure's review state (Bench, data package). One table, so the crew, the lead and the lab read
 * the same word for the same state. The words are DESIGN.md's vocabulary.
 */
import { REVIEW_STATES } from './field-records';

export const PROGRESS_STATES = ['due', 'partial', 'complete', 'skipped'] as const;
export type ProgressState = (typeof PROGRESS_STATES)[number];

export const PROGRESS_STATE_WORDS: Readonly<Record<ProgressState, string>> = {
  due: 'due',
  partial: 'partial',
  complete: 'complete',
  skipped: 'skipped',
};

/** An item (offset, closures, probes) the round does not ask for at this collar. */
export const NOT_DUE_WORDS = 'not due';

export type ReviewState = (typeof REVIEW_STATES)[number];
export { REVIEW_STATES };

export const REVIEW_STATE_WORDS: Readonly<Record<ReviewState, string>> = {
  unreviewed: 'unreviewed',
  accepted: 'accepted',
  rejected: 'rejected',
};

/** The word for a progress state; an unknown state (a newer server) reads as itself. */
export function progressStateWords(state: string): string {
  return (PROGRESS_STATE_WORDS as Record<string, string>)[state] ?? state;
}

/** The state's word at the start of a line ("Due (4): …", "Partial C12: …"). */
export function progressStateHeading(state: ProgressState): string {
  const w = PROGRESS_STATE_WORDS[state];
  return w.charAt(0).toUpperCase() + w.slice(1);
}

/** The word for a review state; an unknown state reads as itself. */
export function reviewStateWords(state: string): string {
  return (REVIEW_STATE_WORDS as Record<string, string>)[state] ?? state;
}

/** "3 due, 1 partial, 5 complete, 0 skipped": counts per state in the table's order. */
export function progressCountsText(counts: Readonly<Record<ProgressState, number>>, separator = ', '): string {
  return PROGRESS_STATES.map((s) => `${counts[s]} ${PROGRESS_STATE_WORDS[s]}`).join(separator);
}
