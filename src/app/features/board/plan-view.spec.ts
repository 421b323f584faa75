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
  routes: [{ routeId: 'route-b', crewIds: ['crew-1'], direction: 'reverse' }],
  locked: false,
  // 20:00–23:00 UTC on 1 June is 08:00–11:00 on 2 June in Auckland (NZST, UTC+12).
  roundWindows: [{ round: 1, from: '2026-06-01T20:00:00.000Z', to: '2026-06-01T23:00:00.000Z' }],
} as unknown as Campaign;

async function render(shown: Campaign = campaign) {
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
  store.campaigns.set([shown]);
  store.campaignId.set('camp');
  store.routes.set([
    { id: 'route-a', siteId: 'site-a', name: 'Upper terrace', collarIds: [] },
    { id: 'route-b', siteId: 'site-a', name: 'Creek bank', collarIds: [] },
  ] as unknown as ReturnType<BoardStore['routes']>);
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

describe('Board plan: routes of the campaign', () => {
  const selects = (el: HTMLElement) =>
    [...el.querySelectorAll<HTMLElement>('.routes mat-select')].map((s) => [
      s.getAttribute('aria-disabled') ?? 'false',
      s.textContent?.trim(),
    ]);

  it('when a route is not walked, then its crew and direction are shut until it is ticked', async () => {
    const { fixture, el } = await render();
    expect(selects(el)).toEqual([
      ['true', ''],
      ['true', 'Alternate each round'],
      ['false', ''],
      ['false', 'Always reverse'],
    ]);
    el.querySelector<HTMLInputElement>('[data-route="Upper terrace"] input[type="checkbox"]')!.click();
    fixture.detectChanges();
    await fixture.whenStable();
    expect(selects(el).map(([disabled]) => disabled)).toEqual(['false', 'false', 'false', 'false']);
  });

  it('when the campaign is closed, then every route, crew, direction and window of its plan is shut', async () => {
    const { el } = await render({ ...campaign, locked: true });
    expect(selects(el).map(([disabled]) => disabled)).toEqual(['true', 'true', 'true', 'true']);
    const boxes = [...el.querySelectorAll<HTMLInputElement>('.routes input[type="checkbox"], input[type="datetime-local"]')];
    expect(boxes.length).toBe(4);
    expect(boxes.every((b) => b.disabled)).toBe(true);
  });

  it('when a route is ticked and the plan saved, then both routes go out, each with its crew and direction', async () => {
    const { fixture, el, sent } = await render();
    el.querySelector<HTMLInputElement>('[data-route="Upper terrace"] input[type="checkbox"]')!.click();
    fixture.detectChanges();
    await (fixture.componentInstance as unknown as { saveAssignment(): Promise<void> }).saveAssignment();
    expect(sent[0]['routes']).toEqual([
      { routeId: 'route-a', crewIds: [], direction: 'alternate' },
      { routeId: 'route-b', crewIds: ['crew-1'], direction: 'reverse' },
    ]);
  });
});
