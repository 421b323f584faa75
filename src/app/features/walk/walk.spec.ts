import { TestBed } from '@angular/core/testing';
import { campaignFields } from '../../../../shared/model/field-records';
import { TEST_SITE, signedInDevice } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { Walk } from './walk';
import { WalkContext } from '../field-day/walk-context';

const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const ROUTE = '55555555-5555-4555-8555-555555555555';
const PLOT = '22222222-2222-4222-8222-222222222222';
const COLLARS = 5000;

describe('Walk route list', () => {
  afterEach(() => localStorage.clear());

  it('when the route holds 5 000 collars, then only the rows near the screen are drawn, in walking order, each telling its place in the whole list', async () => {
    const { db } = await signedInDevice();
    const ids = Array.from({ length: COLLARS }, (_, i) => `${String(i).padStart(8, '0')}-0000-4000-8000-000000000000`);
    await db.records('site').put({ id: TEST_SITE, rev: 1, name: 'Test site', timezone: 'UTC' });
    await db.records('plot').put({ id: PLOT, rev: 1, siteId: TEST_SITE, code: 'P1' });
    await db.records('collar').bulkPut(
      ids.map((id, i) => ({
        id,
        rev: 1,
        siteId: TEST_SITE,
        plotId: PLOT,
        code: `L-${String(i + 1).padStart(5, '0')}`,
        status: 'active',
      })),
    );
    await db.records('route').put({ id: ROUTE, rev: 1, siteId: TEST_SITE, name: 'Long', collarIds: ids });
    // A whole campaign record, as the server stores it: the schema fills what is not named.
    const campaign = campaignFields.parse({
      siteId: TEST_SITE,
      name: 'Dec',
      rounds: 1,
      startsOn: '2026-12-01',
      endsOn: '2026-12-31',
      routes: [{ routeId: ROUTE, direction: 'forward' }],
    });
    await db.records('campaign').put({ id: CAMPAIGN, rev: 1, ...campaign });
    await db.records('visit').put({
      id: 'vvvvvvvv-0000-4000-8000-000000000000',
      rev: 1,
      siteId: TEST_SITE,
      campaignId: CAMPAIGN,
      collarId: ids[1],
      round: 1,
      arrivedAt: '2026-12-03T08:00:00Z',
      skipped: true,
      skipReason: 'Standing water',
    });
    TestBed.inject(WalkContext).update({ campaignId: CAMPAIGN, routeId: ROUTE, round: 1 });

    const fixture = TestBed.createComponent(Walk);
    const el = fixture.nativeElement as HTMLElement;
    const rows = () => Array.from(el.querySelectorAll<HTMLLIElement>('[data-testid="route-list"] li'));
    await until(
      () => rows().length > 0 && el.textContent?.includes('Collars in walking order (4999 due, 0 partial, 0 complete, 1 skipped)'),
      'the route',
    );

    // A screen's worth of rows and a few more (jsdom's window has no height: the buffer only); the rest of the 5 000 are not in the page.
    expect(rows().length).toBeGreaterThanOrEqual(4);
    expect(rows().length).toBeLessThanOrEqual(40);
    const [first, second] = rows();
    expect(first.querySelector('.code')?.textContent?.trim()).toBe('L-00001');
    expect(first.getAttribute('aria-posinset')).toBe('1');
    expect(first.getAttribute('aria-setsize')).toBe('5000');
    expect(first.getAttribute('data-state')).toBe('due');
    expect(first.querySelector('.due')?.textContent?.trim()).toBe('offset, closure, probes');
    const link = first.querySelector('a')!;
    expect(link.getAttribute('data-testid')).toBe('route-collar-L-00001');
    expect(link.getAttribute('href')).toBe(`/walk/visit/${ids[0]}`);
    expect(second.getAttribute('data-state')).toBe('skipped');
    expect(second.querySelector('.due')?.textContent?.trim()).toBe('Standing water');
    expect(rows().map((r) => r.getAttribute('aria-posinset'))).toEqual(rows().map((_, i) => String(i + 1)));
    // The walk's other screens (map, import, install) sit above the list: below 5 000 rows they would be a long scroll away.
    const actions = el.querySelector('nav[aria-label="More for this walk"]')!;
    expect(Array.from(actions.querySelectorAll('a')).map((a) => a.textContent?.trim())).toContain('Map');
    expect(
      actions.compareDocumentPosition(el.querySelector('[data-testid="route-list"]')!) & Node.DOCUMENT_POSITION_FOLLOWING,
    ).toBeTruthy();
    fixture.destroy();
  });
});
