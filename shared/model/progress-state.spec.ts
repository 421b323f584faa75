import {
  NOT_DUE_WORDS,
  PROGRESS_STATE_WORDS,
  PROGRESS_STATES,
  REVIEW_STATE_WORDS,
  progressCountsText,
  progressStateWords,
  reviewStateWords,
} from './progress-state';

describe('progress and review state words (one table for every surface)', () => {
  it('when a collar state is shown, then the word is the design vocabulary: due · partial · complete · skipped', () => {
    expect(PROGRESS_STATES).toEqual(['due', 'partial', 'complete', 'skipped']);
    expect(PROGRESS_STATES.map((s) => PROGRESS_STATE_WORDS[s])).toEqual(['due', 'partial', 'complete', 'skipped']);
    expect(NOT_DUE_WORDS).toBe('not due');
  });

  it('when a review state is shown, then the word is the design vocabulary: unreviewed · accepted · rejected', () => {
    expect(Object.values(REVIEW_STATE_WORDS)).toEqual(['unreviewed', 'accepted', 'rejected']);
    expect(reviewStateWords('rejected')).toBe('rejected');
  });

  it('when a newer server sends a state this build does not know, then it reads as itself', () => {
    expect(progressStateWords('paused')).toBe('paused');
    expect(reviewStateWords('queued')).toBe('queued');
  });

  it('when counts are written out, then they follow the table order with each state word', () => {
    expect(progressCountsText({ due: 3, partial: 1, complete: 5, skipped: 0 })).toBe('3 due, 1 partial, 5 complete, 0 skipped');
    expect(progressCountsText({ due: 0, partial: 0, complete: 2, skipped: 1 }, ' · ')).toBe('0 due · 0 partial · 2 complete · 1 skipped');
  });
});
