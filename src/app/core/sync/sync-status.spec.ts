import { backoffMs, describeSync, type SyncFacts } from './sync-status';

const idle: SyncFacts = { pending: 0, phase: 'idle', pushed: 0, pushTotal: 0, pulled: 0, offline: false, needsSignIn: false, error: null };

describe('sync indicator wording', () => {
  it.each([
    [{}, 'Up to date'],
    [{ pending: 1 }, '1 not yet synced'],
    [{ pending: 3, offline: true }, 'Offline · 3 not yet synced'],
    [{ phase: 'pushing', pushed: 2, pushTotal: 5, pending: 5 }, 'Pushing 2 of 5'],
    [{ phase: 'pulling', pulled: 1200 }, 'Pulling · 1200 records'],
    [{ pending: 2, needsSignIn: true, offline: true }, 'Sign in to sync · 2 not yet synced'],
    [{ pending: 1, error: 'boom' }, 'Sync error · 1 not yet synced'],
  ] as [Partial<SyncFacts>, string][])('when the facts are %j, then it says "%s"', (facts, label) => {
    expect(describeSync({ ...idle, ...facts }).label).toBe(label);
  });

  it('when pushing, then the bar shows the share pushed; when pulling, the bar is indeterminate', () => {
    expect(describeSync({ ...idle, phase: 'pushing', pushed: 1, pushTotal: 4 }).progress).toBe(25);
    expect(describeSync({ ...idle, phase: 'pulling' }).progress).toBeNull();
    expect(describeSync(idle).progress).toBeUndefined();
  });
});

describe('back-off', () => {
  it('when failures repeat, then the wait doubles from 5 s and stops at 5 minutes', () => {
    const mid = () => 0.5; // no jitter
    expect([1, 2, 3, 4].map((n) => backoffMs(n, mid))).toEqual([5000, 10000, 20000, 40000]);
    expect(backoffMs(20, mid)).toBe(300000);
    expect(backoffMs(1, () => 0)).toBe(3750);
    expect(backoffMs(1, () => 1)).toBe(6250);
  });
});
