import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { SiteChoice } from '../../core/auth/site-choice';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { BoardStore } from './board-store';

const settle = () => new Promise((r) => setTimeout(r, 0));
/** Waits (a few macrotasks at most) until the store shows what the test expects next. */
async function until(ready: () => boolean): Promise<void> {
  for (let i = 0; i < 20 && !ready(); i++) {
    await settle();
    TestBed.tick();
  }
}

function campaign(id: string, siteId: string, locked = false) {
  return { id, siteId, name: `Campaign ${id}`, startsOn: '2026-05-01', endsOn: '2026-05-31', rounds: 1, locked, routes: [], rev: 1 };
}

function setup() {
  localStorage.clear();
  rememberOnDevice(testUser(['lead']));
  TestBed.configureTestingModule({ providers: [BoardStore, provideHttpClient(), provideHttpClientTesting()] });
  const store = TestBed.inject(BoardStore);
  const http = TestBed.inject(HttpTestingController);
  const lists = (siteId: string): TestRequest[] =>
    ['campaigns', 'routes', 'plots', 'treatments'].map((path) =>
      http.expectOne((r) => r.url === `/api/${path}` && r.params.get('siteId') === siteId),
    );
  const answer = (reqs: TestRequest[], campaigns: unknown[]) =>
    reqs.forEach((r, i) => r.flush(i === 0 ? { items: campaigns, total: campaigns.length } : { items: [], total: 0 }));
  return { store, http, lists, answer };
}

describe('BoardStore', () => {
  it('when no Board screen has opened, then nothing is read', async () => {
    const { http } = setup();
    TestBed.tick();
    await settle();
    http.verify();
  });

  it('when the Board opens, then the site’s campaigns are read and the latest open one is chosen', async () => {
    const { store, http, lists, answer } = setup();
    store.show();
    TestBed.tick();
    await settle();
    answer(lists('site-a'), [campaign('closed', 'site-a', true), campaign('open', 'site-a')]);
    await settle();
    http.expectOne('/api/sites/site-a/field-members').flush({ items: [] });
    await settle();
    http.match((r) => r.url === '/api/collars').forEach((r) => r.flush({ items: [], total: 0 }));
    await settle();
    TestBed.tick();
    expect(store.campaigns().map((c) => c.id)).toEqual(['closed', 'open']);
    expect(store.campaignId()).toBe('open');
    // The chosen campaign's progress is read once it is chosen, and read again for another round.
    http.expectOne((r) => r.url === '/api/campaigns/open/progress' && !r.params.has('round')).flush({ campaignId: 'open', collars: [] });
    await until(() => store.progress() !== null);
    expect(store.progress()).toEqual({ campaignId: 'open', collars: [] });
    store.round.set(1);
    TestBed.tick();
    await settle();
    const roundOne = http.expectOne((r) => r.url === '/api/campaigns/open/progress' && r.params.get('round') === '1');
    expect(store.progress()).toEqual({ campaignId: 'open', collars: [] });
    roundOne.flush({ campaignId: 'open', collars: [{ collarId: 'k1' }] });
    await until(() => store.progress()?.collars.length === 1);
    expect(store.progress()?.collars).toEqual([{ collarId: 'k1' }]);
  });

  it('when another site is chosen before the first site answers, then the first answer is dropped, not shown', async () => {
    const { store, http, lists, answer } = setup();
    store.show();
    TestBed.tick();
    await settle();
    const first = lists('site-a');
    TestBed.inject(SiteChoice).choose('site-b');
    TestBed.tick();
    await settle();
    const second = lists('site-b');
    answer(first, [campaign('a-1', 'site-a')]);
    await settle();
    http.match('/api/sites/site-a/field-members').forEach((r) => r.flush({ items: [] }));
    await settle();
    TestBed.tick();
    expect(store.campaigns()).toEqual([]);
    http.expectNone((r) => r.url.startsWith('/api/campaigns/a-1/'));
    answer(second, [campaign('b-1', 'site-b')]);
    await settle();
    http.match('/api/sites/site-b/field-members').forEach((r) => r.flush({ items: [] }));
    await settle();
    http.match((r) => r.url.startsWith('/api/campaigns/b-1/')).forEach((r) => r.flush({ campaignId: 'b-1', collars: [] }));
    await settle();
    http.match((r) => r.url === '/api/collars').forEach((r) => r.flush({ items: [], total: 0 }));
    await settle();
    TestBed.tick();
    expect(store.campaigns().map((c) => c.id)).toEqual(['b-1']);
    expect(store.campaignId()).toBe('b-1');
  });
});
