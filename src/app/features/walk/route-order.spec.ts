import { PROGRESS_STATE_WORDS } from '../../../../shared/model/progress-state';
import type { LocalRecord } from '../../core/db/db-schema';
import { collarProgress, nextDueIndex, routeSummary, type DueSettings } from './route-order';

const DUE: DueSettings = { dueOffset: true, dueClosures: 1, dueProbes: true };
const rec = (id: string, fields: Record<string, unknown>): LocalRecord => ({ id, rev: 1, ...fields });
const visit = (id: string, extra: Record<string, unknown> = {}) =>
  rec(id, { collarId: 'k', round: 1, arrivedAt: '2026-06-01T08:00:00.000Z', skipped: false, skipReason: null, ...extra });
const closure = (id: string, extra: Record<string, unknown> = {}) =>
  rec(id, { visitId: 'v', collarId: 'k', redoOfId: null, reviewState: 'unreviewed', series: { tS: [0, 1], co2Ppm: [420, 421] }, ...extra });
const done = [rec('o', { visitId: 'v' })];

describe('Walk: a collar in a round', () => {
  it('when the lab rejected the only closure, then a closure is due again (as on the Board)', () => {
    expect(collarProgress(DUE, [visit('v')], done, done, [closure('c', { reviewState: 'rejected' })])).toEqual({
      state: 'partial',
      due: ['closure'],
      skipReason: null,
    });
  });

  it('when the only closure has no samples yet, then it is not done', () => {
    expect(collarProgress(DUE, [visit('v')], done, done, [closure('c', { series: { tS: [], co2Ppm: [] } })]).due).toEqual(['closure']);
  });

  it('when a closure was redone, then the pair counts once', () => {
    const p = collarProgress({ ...DUE, dueClosures: 2 }, [visit('v')], done, done, [closure('a'), closure('b', { redoOfId: 'a' })]);
    expect(p).toEqual({ state: 'partial', due: ['closure'], skipReason: null });
  });

  it('when a skipped and a worked visit share the round, then the worked one wins; skipped alone gives its reason', () => {
    expect(collarProgress(DUE, [visit('s', { skipped: true, skipReason: 'flooded' }), visit('v')], done, done, [closure('c')]).state).toBe(
      'complete',
    );
    expect(collarProgress(DUE, [visit('s', { skipped: true, skipReason: 'flooded' })], [], [], [])).toEqual({
      state: 'skipped',
      due: [],
      skipReason: 'flooded',
    });
  });

  it('when a visit holds only its conditions, then the collar is partial and stays next in line', () => {
    const p = collarProgress(DUE, [visit('v')], [], [], []);
    expect(p).toEqual({ state: 'partial', due: ['offset', 'closure', 'probes'], skipReason: null });
    expect(nextDueIndex(['complete', p.state, 'due'])).toBe(1);
  });
});

describe('Walk route summary words', () => {
  it('when the route list is summed up, then it counts each state with the word the Board and the digest use', () => {
    const text = routeSummary(['complete', 'due', 'skipped', 'partial', 'due', 'complete', 'complete']);
    const w = PROGRESS_STATE_WORDS;
    expect(text).toBe(`2 ${w.due}, 1 ${w.partial}, 3 ${w.complete}, 1 ${w.skipped}`);
  });

  it('when a route is empty, then every state counts zero', () => {
    expect(routeSummary([])).toBe(
      `0 ${PROGRESS_STATE_WORDS.due}, 0 ${PROGRESS_STATE_WORDS.partial}, 0 ${PROGRESS_STATE_WORDS.complete}, 0 ${PROGRESS_STATE_WORDS.skipped}`,
    );
  });
});
