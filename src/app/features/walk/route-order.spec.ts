import { PROGRESS_STATE_WORDS } from '../../../../shared/model/progress-state';
import { routeSummary } from './route-order';

describe('Walk route summary words', () => {
  it('when the route list is summed up, then it counts each state with the word the Board and the digest use', () => {
    const text = routeSummary(['complete', 'due', 'skipped', 'partial', 'due', 'complete', 'complete']);
    const w = PROGRESS_STATE_WORDS;
    expect(text).toBe(`2 ${w.due}, 1 ${w.partial}, 3 ${w.complete}, 1 ${w.skipped}`);
  });

  it('when a route is empty, then every state counts zero', () => {
    expect(routeSummary([])).toBe(`0 ${PROGRESS_STATE_WORDS.due}, 0 ${PROGRESS_STATE_WORDS.partial}, 0 ${PROGRESS_STATE_WORDS.complete}, 0 ${PROGRESS_STATE_WORDS.skipped}`);
  });
});
