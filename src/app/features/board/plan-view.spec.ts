import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { BoardApi, type Campaign } from './board-api';
import { BoardStore } from './board-store';
import { PlanView } from './plan-view';

const campaign = {
  id: 'camp',
  rev: 2,
  siteId: 'site-a',
  name: 'June',
  startsOn: '2026-06-01',
  endsOn: '2026-06-03',
  rounds: 1,
  dueOffset: true,
  dueClosures: 1,
  dueProbes: true,
  routes: [],
  locked: false,
  // 20:00–23:00 UTC on 1 June is 08:00–11:00 on 2 June in Auckland (NZST, UTC+12).
  roundWindows: [{ round: 1, from: '2026-06-01T20:00:00.000Z', to: '2026-06-01T23:00:00.000Z' }],
} as unknown as Campaign;

async function render() {
  localStorage.clear();
  rememberOnDevice(testUser(['lead']), [{ id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Pacific/Auckland' }]);
  const sent: Record<string, unknown>[] = [];
  const api: Partial<BoardApi> = {
    update: (async (_e: string, _id: string, _rev: number, body: Record<string, unknown>) => {
      sent.push(body);
      return { ...campaign, rev: 3 };
    }) as BoardApi['update'],
  };
  TestBed.configureTestingModule({
    imports: [PlanView],
    providers: [BoardStore, provideHttpClient(), provideHttpClientTesting(), { provide: BoardApi, useValue: api }],
  });
  const store = TestBed.inject(BoardStore);
  store.loadProgress = async () => undefined;
  store.campaigns.set([campaign]);
  store.campaignId.set('camp');
  const fixture = TestBed.createComponent(PlanView);
  await fixture.whenStable();
  fixture.detectChanges();
  return { fixture, el: fixture.nativeElement as HTMLElement, sent };
}

describe('Board plan: round windows in the site’s zone', () => {
  it('when a round window is shown, then it reads as the site’s wall time (the device runs in UTC)', async () => {
    const { el } = await render();
    const inputs = [...el.querySelectorAll<HTMLInputElement>('input[type="datetime-local"]')].map((i) => i.value);
    expect(inputs).toEqual(['2026-06-02T08:00', '2026-06-02T11:00']);
  });

  it('when the plan is saved, then the window typed as the site’s wall time goes out as the same instants', async () => {
    const { fixture, sent } = await render();
    await (fixture.componentInstance as unknown as { saveAssignment(): Promise<void> }).saveAssignment();
    expect(sent[0]['roundWindows']).toEqual([{ round: 1, from: '2026-06-01T20:00:00.000Z', to: '2026-06-01T23:00:00.000Z' }]);
  });
});
