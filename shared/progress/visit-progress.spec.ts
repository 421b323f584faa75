import {
  collarProgress,
  countVisits,
  dueItems,
  tallyRound,
  type ClosureFacts,
  type DueSettings,
  type ReadingFacts,
  type VisitFacts,
} from './visit-progress';

const ALL: DueSettings = { dueOffset: true, dueClosures: 2, dueProbes: true };
const visit = (id: string, extra: Partial<VisitFacts> = {}): VisitFacts => ({
  id,
  skipped: false,
  skipReason: null,
  arrivedAt: '2026-06-01T08:00:00.000Z',
  ...extra,
});
const reading = (visitId: string, deleted = false): ReadingFacts => ({ visitId, deleted });
const closure = (id: string, visitId: string, extra: Partial<ClosureFacts> = {}): ClosureFacts => ({
  id,
  visitId,
  redoOfId: null,
  reviewState: 'unreviewed',
  series: { tS: [0, 1, 2] },
  ...extra,
});

/** One round's tally from its records. */
function round(visits: VisitFacts[], sets: ReadingFacts[] = [], probes: ReadingFacts[] = [], closures: ClosureFacts[] = []) {
  return tallyRound(countVisits(visits, sets, probes, closures));
}

describe('visit progress: one round', () => {
  it('when no visit exists, then the collar is due with every item left', () => {
    const t = round([]);
    expect(collarProgress(ALL, [t]).state).toBe('due');
    expect(dueItems(ALL, t)).toEqual(['offset', '2 closures', 'probes']);
  });

  it('when a visit holds nothing yet (conditions only), then the collar is partial: the crew has started', () => {
    const p = collarProgress(ALL, [round([visit('v')])]);
    expect(p.state).toBe('partial');
    expect(p.items.offset).toEqual({ state: 'due', done: 0, needed: 1 });
  });

  it('when a round has a skipped and a worked visit, then the worked visit wins and its readings count', () => {
    const t = round(
      [visit('s', { skipped: true, skipReason: 'flooded' }), visit('w')],
      [reading('w')],
      [reading('w')],
      [closure('c1', 'w'), closure('c2', 'w')],
    );
    expect(collarProgress(ALL, [t])).toEqual({
      state: 'complete',
      skipReason: null,
      items: {
        offset: { state: 'complete', done: 1, needed: 1 },
        closures: { state: 'complete', done: 2, needed: 2 },
        probes: { state: 'complete', done: 1, needed: 1 },
      },
    });
  });

  it('when every visit of the round is skipped, then it is skipped with the latest reason and their readings do not count', () => {
    const t = round(
      [
        visit('a', { skipped: true, skipReason: 'first', arrivedAt: '2026-06-01T08:00:00Z' }),
        visit('b', { skipped: true, skipReason: 'later', arrivedAt: '2026-06-01T09:00:00Z' }),
      ],
      [reading('a')],
    );
    const p = collarProgress(ALL, [t]);
    expect(p).toMatchObject({ state: 'skipped', skipReason: 'later' });
    expect(p.items.offset).toEqual({ state: 'skipped', done: 0, needed: 1 });
    expect(dueItems(ALL, t)).toEqual([]);
  });

  it('when a visit is deleted, then neither it nor its records count', () => {
    const p = collarProgress(ALL, [round([visit('v', { deleted: true, skipped: true, skipReason: 'x' })], [reading('v')])]);
    expect(p.state).toBe('due');
    expect(p.items.offset!.done).toBe(0);
  });

  it('when closures are deleted, rejected by the lab, without samples or redone, then only the live replacements count', () => {
    const closures = [
      closure('deleted', 'v', { deleted: true }),
      closure('rejected', 'v', { reviewState: 'rejected' }),
      closure('tap-only', 'v', { series: { tS: [] } }),
      closure('first', 'v'),
      closure('redo', 'v', { redoOfId: 'first' }),
      // A deleted redo replaces nothing: its original counts again.
      closure('kept', 'v'),
      closure('dropped-redo', 'v', { redoOfId: 'kept', deleted: true }),
    ];
    const t = round([visit('v')], [], [], closures);
    expect(t.closures).toBe(2);
    expect(dueItems({ dueOffset: false, dueClosures: 3, dueProbes: false }, t)).toEqual(['closure']);
  });

  it('when a redo is rejected, then neither it nor the closure it replaced counts (the lab asks for another)', () => {
    const t = round([visit('v')], [], [], [closure('first', 'v'), closure('redo', 'v', { redoOfId: 'first', reviewState: 'rejected' })]);
    expect(t.closures).toBe(0);
  });

  it('when deleted readings are all a visit has, then it still counts as started, not done', () => {
    const p = collarProgress(ALL, [round([visit('v')], [reading('v', true)], [reading('v', true)])]);
    expect(p).toMatchObject({ state: 'partial', items: { offset: { done: 0 }, probes: { done: 0 } } });
  });

  it('when nothing is due, then the collar is complete without a visit', () => {
    expect(collarProgress({ dueOffset: false, dueClosures: 0, dueProbes: false }, [round([])])).toEqual({
      state: 'complete',
      skipReason: null,
      items: {},
    });
  });
});

describe('visit progress: all rounds', () => {
  const done = () => round([visit('d')], [reading('d')], [reading('d')], [closure('a', 'd'), closure('b', 'd'), closure('c', 'd')]);
  const skipped = (why: string) => round([visit('s', { skipped: true, skipReason: why })]);

  it('when one round is done and another only started, then partial, and extra closures of one round do not fill another', () => {
    const p = collarProgress(ALL, [done(), round([visit('x')])]);
    expect(p.state).toBe('partial');
    expect(p.items.closures).toEqual({ state: 'partial', done: 2, needed: 4 });
  });

  it('when rounds are skipped and the rest untouched, then due; skipped and complete, then complete; all skipped, then skipped', () => {
    expect(collarProgress(ALL, [skipped('a'), round([])]).state).toBe('due');
    expect(collarProgress(ALL, [skipped('a'), done()])).toMatchObject({ state: 'complete', skipReason: 'a' });
    expect(collarProgress(ALL, [skipped('a'), skipped('b')])).toMatchObject({ state: 'skipped', skipReason: 'b' });
  });

  it('when each round alone is asked, then all rounds agree with them (every round complete ⇔ complete, every due ⇔ due)', () => {
    const rounds = [done(), round([visit('x')]), round([]), skipped('r')];
    const each = rounds.map((t) => collarProgress(ALL, [t]).state);
    expect(each).toEqual(['complete', 'partial', 'due', 'skipped']);
    expect(collarProgress(ALL, rounds).state).toBe('partial');
    expect(collarProgress(ALL, [rounds[2], rounds[3]]).state).toBe('due');
    expect(collarProgress(ALL, [rounds[0], rounds[3]]).state).toBe('complete');
  });
});
