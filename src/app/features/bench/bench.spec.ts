import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { FLAG_ADVICE } from '../../../../shared/flux/flag-advice';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { Bench } from './bench';
import type { QueueItem } from '../../../../shared/bench/review-wire';
import { BenchApi } from './bench-api';

function item(over: Partial<QueueItem>): QueueItem {
  return {
    id: 'c-1',
    rev: 3,
    siteId: 'site-a',
    campaignId: 'camp',
    visitId: 'v',
    collarId: 'k',
    startedAt: '2026-04-14T07:33:00.000Z',
    day: '2026-04-14',
    settleS: 20,
    flags: [],
    fluxUmolM2S: 1.1,
    reviewState: 'accepted',
    reviewReason: null,
    reviewSettleS: null,
    reviewWindowEndS: null,
    reviewModel: null,
    recomputedSinceReview: null,
    collarCode: 'B1-P01-C1',
    plotCode: 'P01',
    blockCode: 'B1',
    treatmentCode: null,
    campaignName: 'April',
    round: 1,
    rain24h: false,
    daysSinceInstall: null,
    ...over,
  } as QueueItem;
}

const settle = () => new Promise((r) => setTimeout(r, 0));

async function render(items: QueueItem[]) {
  localStorage.clear();
  rememberOnDevice(testUser(['lab']));
  const api: Partial<BenchApi> = {
    list: async () => [],
    queue: async () => ({ items, total: items.length, limit: 500, offset: 0 }),
    // The closure itself is not what these tests look at: it never arrives.
    detail: () => new Promise(() => undefined),
    jobs: async () => ({ items: [] }),
  };
  TestBed.configureTestingModule({
    imports: [Bench],
    providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: BenchApi, useValue: api }],
  });
  const fixture = TestBed.createComponent(Bench);
  fixture.detectChanges();
  for (let i = 0; i < 3; i++) {
    await settle();
    await fixture.whenStable();
  }
  const el = fixture.nativeElement as HTMLElement;
  const rows = () => Array.from(el.querySelectorAll('.queue-list .item')).map((r) => r.textContent!.replace(/\s+/g, ' ').trim());
  return { fixture, el, rows };
}

describe('Bench queue', () => {
  it('when closures are listed, then each row reads as words apart: collar · day, then decision · flux with its unit and flags', async () => {
    const { rows } = await render([
      item({}),
      item({ id: 'c-2', collarCode: 'B1-P01-C2', reviewState: 'unreviewed', fluxUmolM2S: null, flags: ['low-r2', 'ambient-mismatch'] }),
    ]);
    expect(rows()).toEqual([
      'B1-P01-C1 · 2026-04-14 accepted · 1.10 µmol m⁻² s⁻¹',
      `B1-P01-C2 · 2026-04-14 unreviewed · — µmol m⁻² s⁻¹ ${FLAG_ADVICE['low-r2'].words} low-r2 ambient-mismatch`,
    ]);
  });

  it('when a closure is flagged, then the queue shows each flag in the words of the shared flag table first, its code only as a detail', async () => {
    const { el } = await render([item({ flags: ['negative-flux', 'spike'] })]);
    const flags = [...el.querySelectorAll('.queue-list .flag')];
    expect(flags.map((f) => f.querySelector('.flag-words')!.textContent!.trim())).toEqual([
      FLAG_ADVICE['negative-flux'].words,
      FLAG_ADVICE.spike.words,
    ]);
    expect(flags.map((f) => f.querySelector('.flag-code')!.textContent!.trim())).toEqual(['negative-flux', 'spike']);
    expect(flags[0].textContent!.trim().startsWith(FLAG_ADVICE['negative-flux'].words)).toBe(true);
  });

  it('when a reviewed closure was recomputed since, then its row says so on a line of its own with old → new flux', async () => {
    const { el } = await render([
      item({ recomputedSinceReview: { oldFluxUmolM2S: 1.1, newFluxUmolM2S: 1.21 } as QueueItem['recomputedSinceReview'] }),
    ]);
    expect(el.querySelector('[data-testid="queue-recomputed"]')!.textContent!.replace(/\s+/g, ' ').trim()).toBe(
      'recomputed since review: 1.10 → 1.21',
    );
  });

  it('when no closure matches, then the queue says so instead of an empty list', async () => {
    const { el, rows } = await render([]);
    expect(rows()).toEqual([]);
    expect(el.querySelector('.queue')!.textContent).toContain('No closures match this filter.');
  });
});
