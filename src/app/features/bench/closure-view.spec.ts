import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { ClosureDetail, FitResult, QueueItem } from '../../../../shared/bench/review-wire';
import { ClosureChart } from './closure-chart';
import { ClosureTraces } from './closure-traces';
import { ClosureView } from './closure-view';

/** jsdom has no canvas: the chart is replaced by an empty element with the same inputs. */
@Component({ selector: 'fw-closure-chart', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
class NoChart {
  readonly data = input<unknown>();
  readonly label = input('');
}

const fit: FitResult = {
  linear: null,
  exponential: null,
  quadratic: null,
  selected: null,
  exponentialRejectedReason: null,
  flags: [],
  error: null,
  window: null,
  minDetectableFluxUmolM2S: null,
};

function detail(context: Partial<QueueItem>, history: ClosureDetail['history'] = []): ClosureDetail {
  const ctx = {
    id: 'c1',
    rev: 3,
    siteId: 's',
    campaignId: 'p',
    visitId: 'v',
    collarId: 'k',
    startedAt: '2026-06-01T08:00:00.000Z',
    day: '2026-06-01',
    settleS: 30,
    flags: [],
    fluxUmolM2S: 1.2,
    reviewState: 'unreviewed',
    reviewReason: null,
    reviewSettleS: null,
    reviewWindowEndS: null,
    reviewModel: null,
    recomputedSinceReview: null,
    changedSinceReview: null,
    collarCode: 'K7',
    plotCode: 'P1',
    blockCode: null,
    treatmentCode: null,
    campaignName: 'June',
    round: 1,
    rain24h: false,
    daysSinceInstall: null,
    daysSinceClipping: null,
    calibrationAgeDays: null,
    calibrationDriftPpm: null,
    leakFailed: false,
    timezone: 'UTC',
    ...context,
  } as QueueItem;
  return {
    closure: {
      id: 'c1',
      rev: 3,
      startedAt: ctx.startedAt,
      settleS: 30,
      reviewState: 'unreviewed',
      series: { tS: [0, 1, 2], co2Ppm: [420, 421, 422] },
      results: { raw: fit, review: null, volumeCm3: 4000, areaCm2: 314, meanOffsetCm: 2, ambientPpm: null, pressureIsDefault: false },
    } as ClosureDetail['closure'],
    context: ctx,
    offsetSet: null,
    profile: null,
    collarHistory: [],
    replicates: [],
    replicateSpread: { n: 1, mean: 1.2, sd: null, cvPct: null },
    history,
    moveTargets: [],
    systems: { profiles: [], analyzers: [] },
  };
}

@Component({ selector: 'fw-closure-traces', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
class NoTraces {
  readonly series = input<unknown>();
}

function render(d: ClosureDetail): HTMLElement {
  TestBed.configureTestingModule({ imports: [ClosureView] });
  TestBed.overrideComponent(ClosureView, { remove: { imports: [ClosureChart, ClosureTraces] }, add: { imports: [NoChart, NoTraces] } });
  const fixture = TestBed.createComponent(ClosureView);
  fixture.componentRef.setInput('detail', d);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('ClosureView: raw changes since review', () => {
  it('when raw data changed after the lab accepted it, then the view says who changed which field and asks for a new review', () => {
    const el = render(
      detail(
        { changedSinceReview: { at: '2026-06-02T10:15:00.000Z', userName: 'Ana Crew', fields: ['settleS'], previousState: 'accepted' } },
        [
          {
            id: 1,
            at: '2026-06-02T10:15:00.000Z',
            kind: 'raw-change',
            field: 'settleS',
            oldValue: 20,
            newValue: 30,
            oldFluxUmolM2S: 1,
            newFluxUmolM2S: 1.2,
            userName: 'Ana Crew',
          },
        ],
      ),
    );
    const notice = el.querySelector('[data-testid="changed-since-review"]')!.textContent!.replace(/\s+/g, ' ').trim();
    expect(notice).toBe('Changed since review: Ana Crew changed settleS on 2026-06-02 10:15 UTC after it was accepted. Review it again.');
    expect(el.querySelector('[data-testid="history"]')!.textContent).toContain('raw data changed · settleS: 20 → 30');
  });

  it('when points were left out and put back, then the history says which points and why', () => {
    const el = render(
      detail({}, [
        {
          id: 1,
          at: '2026-06-02T10:15:00.000Z',
          kind: 'decision',
          field: 'reviewExclusions',
          oldValue: [],
          newValue: [
            { index: 1, reason: 'Spike' },
            { index: 2, reason: 'Spike' },
          ],
          oldFluxUmolM2S: 1,
          newFluxUmolM2S: 0.9,
          userName: 'Lab',
        },
        {
          id: 2,
          at: '2026-06-02T10:16:00.000Z',
          kind: 'decision',
          field: 'reviewExclusions',
          oldValue: [
            { index: 1, reason: 'Spike' },
            { index: 2, reason: 'Spike' },
          ],
          newValue: [],
          oldFluxUmolM2S: 0.9,
          newFluxUmolM2S: 1,
          userName: 'Lab',
        },
      ]),
    );
    const text = el.querySelector('[data-testid="history"]')!.textContent!.replace(/\s+/g, ' ');
    expect(text).toContain('points left out: none → 1–2 (Spike)');
    expect(text).toContain('points left out: 1–2 (Spike) → none');
  });

  it('when nothing changed since the last decision, then there is no such notice', () => {
    expect(render(detail({})).querySelector('[data-testid="changed-since-review"]')).toBeNull();
  });
});

describe('ClosureView: times in the site’s zone', () => {
  // The test runs with the device in UTC; the site is in Auckland (NZST, UTC+12 in June), so a
  // time shown in the device's zone or in UTC reads differently from the site's.
  it('when a closure is shown, then its start, the change notice, the offset set day, replicates and history read in the site’s zone', () => {
    const d = detail(
      {
        timezone: 'Pacific/Auckland',
        startedAt: '2026-06-01T20:30:00.000Z',
        changedSinceReview: { at: '2026-06-02T13:15:00.000Z', userName: 'Ana Crew', fields: ['settleS'], previousState: 'accepted' },
      },
      [
        {
          id: 1,
          at: '2026-06-02T13:15:00.000Z',
          kind: 'raw-change',
          field: 'settleS',
          oldValue: 20,
          newValue: 30,
          oldFluxUmolM2S: 1,
          newFluxUmolM2S: 1.2,
          userName: 'Ana Crew',
        },
      ],
    );
    d.closure.startedAt = '2026-06-01T20:30:00.000Z';
    d.offsetSet = { id: 'o', takenAt: '2026-05-31T19:00:00.000Z', meanCm: 2, supersedesId: null } as ClosureDetail['offsetSet'];
    d.replicates = [
      {
        id: 'c1',
        startedAt: '2026-06-01T20:30:05.000Z',
        fluxUmolM2S: 1.2,
        reviewState: 'unreviewed',
        flags: [],
        settleS: 30,
      } as ClosureDetail['replicates'][number],
    ];
    d.collarHistory = [{ id: 'c1', startedAt: '2026-06-01T20:30:00.000Z', fluxUmolM2S: 1.2, reviewState: 'unreviewed', flags: [] }];
    const el = render(d);
    const text = (sel: string) => el.querySelector(sel)!.textContent!.replace(/\s+/g, ' ').trim();
    expect(text('#closure-title')).toBe('Collar K7 · 2026-06-02 08:30 NZST');
    expect(text('[data-testid="changed-since-review"]')).toContain('on 2026-06-03 01:15 NZST after it was accepted');
    expect(el.textContent).toContain('offset set of 2026-06-01,');
    expect(text('.replicates li')).toMatch(/^08:30:05 NZST/);
    expect(el.querySelector('.history-bars li')!.getAttribute('title')).toBe('2026-06-02: 1.200');
    expect(text('[data-testid="history"]')).toContain('2026-06-03 01:15 NZST · Ana Crew');
  });
});
