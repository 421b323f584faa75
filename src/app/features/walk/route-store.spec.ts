import { Injector, runInInjectionContext } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import type { EntityFields } from '../../../../shared/model/entities';
import { campaignFields } from '../../../../shared/model/field-records';
import { TEST_SITE, signedInDevice } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { loadRoundRecords, loadRoutePlan, routeRows, type RouteParams, type RoutePlan } from './route-query';
import { RouteStore } from './route-store';

const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const ROUTE = '55555555-5555-4555-8555-555555555555';
const PLOT = '22222222-2222-4222-8222-222222222222';
const id = (prefix: string, n: number) => `${prefix}${String(n).padStart(4, '0')}-0000-4000-8000-000000000000`;

async function putRoute(db: FluxDb, codes: string[], campaign: Partial<EntityFields<'campaign'>> = {}): Promise<string[]> {
  const ids = codes.map((_, i) => id('c', i));
  await db.records('plot').put({ id: PLOT, rev: 1, siteId: TEST_SITE, code: 'P1' });
  await db.records('collar').bulkPut(
    codes.map((code, i) => ({
      id: ids[i],
      rev: 1,
      siteId: TEST_SITE,
      plotId: PLOT,
      code,
      status: 'active',
      latitude: 60 + i / 1e4,
      longitude: 10,
    })),
  );
  await db.records('route').put({ id: ROUTE, rev: 1, siteId: TEST_SITE, name: 'North', collarIds: ids });
  // A whole record, as the server or the device's own validated write stores it: the schema fills its defaults.
  const fields = campaignFields.parse({
    siteId: TEST_SITE,
    name: 'Dec',
    startsOn: '2026-12-01',
    endsOn: '2026-12-31',
    rounds: 2,
    routes: [{ routeId: ROUTE, direction: 'alternate' }],
    ...campaign,
  });
  await db.records('campaign').put({ id: CAMPAIGN, rev: 1, ...fields });
  return ids;
}

const params = (round: number): RouteParams => ({ campaignId: CAMPAIGN, routeId: ROUTE, round, flipped: false });

describe('The route of a walk', () => {
  afterEach(() => localStorage.clear());

  it('when the collars of a round are loaded, then each shows its own state and what is left, in the walking order of the round', async () => {
    const { db } = await signedInDevice();
    const [a, b, c, d, e] = await putRoute(db, ['A', 'B', 'C', 'D', 'E'], { dueClosures: 2 });
    const visit = (n: number, collarId: string, round: number, extra: Partial<LocalRecord> = {}) => ({
      id: id('v', n),
      rev: 1,
      siteId: TEST_SITE,
      campaignId: CAMPAIGN,
      collarId,
      round,
      arrivedAt: '2026-12-03T08:00:00Z',
      ...extra,
    });
    await db
      .records('visit')
      .bulkPut([
        visit(1, a, 2),
        visit(2, b, 2),
        visit(3, c, 2, { skipped: true, skipReason: 'Fallen tree' }),
        visit(4, d, 2, { deleted: true }),
        visit(5, e, 2),
        visit(6, d, 1),
      ]);
    const rec = (n: number, visitId: string, collarId: string, extra: Partial<LocalRecord> = {}) => ({
      id: id('r', n),
      rev: 1,
      siteId: TEST_SITE,
      campaignId: CAMPAIGN,
      visitId,
      collarId,
      ...extra,
    });
    await db.records('offsetSet').bulkPut([rec(1, id('v', 1), a), rec(2, id('v', 2), b), rec(3, id('v', 6), d)]);
    await db.records('probeReading').bulkPut([rec(4, id('v', 1), a), rec(5, id('v', 5), e, { deleted: true })]);
    const series = { tS: [0, 10, 20], co2Ppm: [420, 425, 430] };
    await db.records('closure').bulkPut([
      rec(6, id('v', 1), a, { series }),
      rec(7, id('v', 1), a, { series }),
      // E: a closure and its redo count as one, so one of the two is still due.
      rec(8, id('v', 5), e, { series }),
      rec(9, id('v', 5), e, { series, redoOfId: id('r', 8) }),
    ]);

    const plan = await loadRoutePlan(db, params(2));
    const rows = routeRows(plan!, await loadRoundRecords(db, params(2)));
    // Round 2 of an "alternate" route is walked backwards.
    expect(rows.map((r) => [r.code, r.state, r.due.join(', '), r.skipReason, r.plotCode])).toEqual([
      ['E', 'partial', 'offset, closure, probes', null, 'P1'],
      ['D', 'due', 'offset, 2 closures, probes', null, 'P1'],
      ['C', 'skipped', '', 'Fallen tree', 'P1'],
      ['B', 'partial', '2 closures, probes', null, 'P1'],
      ['A', 'complete', '', null, 'P1'],
    ]);
    expect(rows[4]).toMatchObject({ id: a, latitude: 60, longitude: 10, status: 'active' });
    const round1 = routeRows((await loadRoutePlan(db, params(1)))!, await loadRoundRecords(db, params(1)));
    expect(round1.map((r) => [r.code, r.state])).toEqual([
      ['A', 'due'],
      ['B', 'due'],
      ['C', 'due'],
      ['D', 'partial'],
      ['E', 'due'],
    ]);
  });

  it('when a round holds records of many collars, then each record is matched to its collar once, however long the route', () => {
    const n = 2000;
    const plan: RoutePlan = {
      collars: Array.from({ length: n }, (_, i) => ({
        id: `c${i}`,
        code: `L-${i}`,
        plotCode: '',
        latitude: null,
        longitude: null,
        status: 'active',
      })),
      due: { dueOffset: true, dueClosures: 1, dueProbes: true },
      direction: 'forward',
      rounds: 1,
    };
    let reads = 0;
    // Records whose collar is counted each time it is looked at.
    const counted = (r: Omit<LocalRecord, 'collarId'>, collarId: string): LocalRecord =>
      Object.defineProperty({ ...r }, 'collarId', {
        enumerable: true,
        get: () => {
          reads++;
          return collarId;
        },
      }) as LocalRecord;
    const visits = plan.collars.map((c, i) => counted({ id: `v${i}`, rev: 1, round: 1 }, c.id));
    const sets = plan.collars.map((c, i) => counted({ id: `s${i}`, rev: 1, visitId: `v${i}` }, c.id));
    const rows = routeRows(plan, { visits, offsetSets: sets, probes: [], closures: [] });
    expect(rows.every((r) => r.state === 'partial' && r.due.join(', ') === 'closure, probes')).toBe(true);
    expect(reads).toBe(visits.length + sets.length);
  });

  it('when one collar of a long route gets a visit, then the other collars keep their rows as they were', () => {
    const plan: RoutePlan = {
      collars: Array.from({ length: 3 }, (_, i) => ({
        id: `c${i}`,
        code: `L-${i}`,
        plotCode: '',
        latitude: null,
        longitude: null,
        status: 'active',
      })),
      due: { dueOffset: true, dueClosures: 1, dueProbes: false },
      direction: 'forward',
      rounds: 1,
    };
    const before = routeRows(plan, { visits: [], offsetSets: [], probes: [], closures: [] });
    const after = routeRows(plan, { visits: [{ id: 'v1', rev: 1, collarId: 'c1', round: 1 }], offsetSets: [], probes: [], closures: [] });
    expect(after.map((r) => r.state)).toEqual(['due', 'partial', 'due']);
    expect(after[0]).toBe(before[0]);
    expect(after[2]).toBe(before[2]);
    expect(before[1]).toMatchObject({ state: 'due', due: ['offset', 'closure'] });
  });

  it('when a second screen asks for the route the first one shows, then it has the route at once and both follow a save', async () => {
    const { db } = await signedInDevice();
    const [a] = await putRoute(db, ['A', 'B']);
    const store = TestBed.inject(RouteStore);
    const onScreen = (injector: Injector) => runInInjectionContext(injector, () => store.view(() => params(1)));
    const first = onScreen(Injector.create({ providers: [], parent: TestBed.inject(Injector) }));
    await until(() => first()?.rows.length === 2, 'the route');
    const second = onScreen(Injector.create({ providers: [], parent: TestBed.inject(Injector) }));
    TestBed.tick();
    // No read of the device in between: the answer the first screen holds is handed over.
    expect(second()?.rows.map((r) => r.code)).toEqual(['A', 'B']);

    await db
      .records('visit')
      .put({ id: id('v', 1), rev: 1, siteId: TEST_SITE, campaignId: CAMPAIGN, collarId: a, round: 1, arrivedAt: '2026-12-03T08:00:00Z' });
    await until(() => first()?.rows[0].state === 'partial' && second()?.rows[0].state === 'partial', 'the visit on both screens');
  });
});
