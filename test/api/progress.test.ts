import { randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

describe('campaign progress', () => {
  let t: TestApp;
  let lead: Session;
  let ids: { a: string; b: string; c: string; route: string; campaign: string; plot: string; treatment: string };
  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    const w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    const collar = async (code: string) =>
      (await lead.post('/api/collars', { siteId: w.site.id, code, plotId: w.plot.id, diameterCm: 20 })).body.record.id as string;
    const [b, c] = [await collar('C2'), await collar('C3')];
    const route = (await lead.post('/api/routes', { siteId: w.site.id, name: 'North', collarIds: [w.collar.id, b, c] })).body.record.id;
    const camp = (
      await lead.post('/api/campaigns', {
        siteId: w.site.id,
        name: 'Two rounds',
        startsOn: '2026-06-01',
        endsOn: '2026-06-02',
        rounds: 2,
        dueOffset: true,
        dueClosures: 1,
        dueProbes: true,
        routes: [{ routeId: route, crewIds: [] }],
      })
    ).body.record.id;
    ids = { a: w.collar.id, b, c, route, campaign: camp, plot: w.plot.id, treatment: w.treatment.id };
    const visit = async (collarId: string, round: number, extra: Record<string, unknown> = {}) =>
      (
        await lead.post('/api/visits', {
          siteId: w.site.id,
          campaignId: camp,
          round,
          collarId,
          arrivedAt: '2026-06-01T08:00:00Z',
          ...extra,
        })
      ).body.record.id as string;
    const on = (visitId: string, collarId: string) => ({
      siteId: w.site.id,
      visitId,
      collarId,
      campaignId: camp,
      takenAt: '2026-06-01T08:01:00Z',
    });
    // A, round 1: everything due is done. A, round 2: a rejected closure only (does not count).
    const a1 = await visit(ids.a, 1);
    await lead.post('/api/offset-sets', { ...on(a1, ids.a), readingsCm: [2, 2, 2, 2] });
    await lead.post('/api/probe-readings', { ...on(a1, ids.a), soilTemps: [{ depthCm: 5, tempC: 12 }] });
    await lead.post('/api/closures', { ...closure(on(a1, ids.a)) });
    const a2 = await visit(ids.a, 2);
    const rejectedRes = await lead.post('/api/closures', closure(on(a2, ids.a)));
    if (rejectedRes.status !== 201) throw new Error(JSON.stringify(rejectedRes.body));
    const rejected = rejectedRes.body.record;
    const lab = await signIn(t.app, demoEmail('lab'));
    await lab.patch(`/api/closures/${rejected.id}`, { rev: rejected.rev, reviewState: 'rejected', reviewReason: 'leak' });
    // A chamber tapped on but with no samples yet is not a done closure.
    await lead.post('/api/closures', { ...on(a2, ids.a), startedAt: '2026-06-01T09:00:00Z', settleS: 20, series: { tS: [], co2Ppm: [] } });
    // B, round 1: offset only. C, round 1: skipped.
    const b1 = await visit(ids.b, 1);
    await lead.post('/api/offset-sets', { ...on(b1, ids.b), readingsCm: [3, 3, 3] });
    await visit(ids.c, 1, { skipped: true, skipReason: 'standing water over the collar' });
  });
  afterAll(() => t.close());

  it('when round 1 is asked, then states and counts match the visits made', async () => {
    const r = (await lead.get(`/api/campaigns/${ids.campaign}/progress?round=1`)).body;
    const byId = Object.fromEntries(r.collars.map((c: { collarId: string }) => [c.collarId, c]));
    expect(byId[ids.a]).toMatchObject({
      state: 'complete',
      items: {
        offset: { state: 'complete', done: 1, needed: 1 },
        closures: { state: 'complete', done: 1, needed: 1 },
        probes: { state: 'complete', done: 1, needed: 1 },
      },
    });
    expect(byId[ids.b]).toMatchObject({
      state: 'partial',
      items: { offset: { state: 'complete', done: 1, needed: 1 }, closures: { state: 'due', done: 0 } },
    });
    expect(byId[ids.c]).toMatchObject({ state: 'skipped', skipReason: 'standing water over the collar' });
    expect(r.collars.map((c: { collarId: string }) => c.collarId)).toEqual([ids.a, ids.b, ids.c]); // walking order
    expect(r.totals.byRoute[ids.route]).toEqual({ due: 0, partial: 1, complete: 1, skipped: 1 });
    expect(r.totals.byPlot[ids.plot]).toEqual({ due: 0, partial: 1, complete: 1, skipped: 1 });
    expect(r.totals.byTreatment[ids.treatment]).toEqual({ due: 0, partial: 1, complete: 1, skipped: 1 });
  });

  it('when all rounds are asked, then needed is per-round need × rounds and a rejected closure is not done', async () => {
    const r = (await lead.get(`/api/campaigns/${ids.campaign}/progress`)).body;
    const a = r.collars.find((c: { collarId: string }) => c.collarId === ids.a);
    expect(a.items.closures).toEqual({ state: 'partial', done: 1, needed: 2 });
    expect(a.items.offset).toEqual({ state: 'partial', done: 1, needed: 2 });
    expect(a.state).toBe('partial');
    const c = r.collars.find((x: { collarId: string }) => x.collarId === ids.c);
    expect(c.state).toBe('due'); // skipped in round 1 only; round 2 still to do
    expect(r.totals.byRoute[ids.route]).toEqual({ due: 1, partial: 2, complete: 0, skipped: 0 });
  });

  it('when a collar is renamed and the route reordered after an ask, then the next ask shows both (the kept collar list is renewed)', async () => {
    const path = `/api/campaigns/${ids.campaign}/progress?round=1`;
    expect((await lead.get(path)).body.collars.map((c: { collarId: string }) => c.collarId)).toEqual([ids.a, ids.b, ids.c]);
    const collar = (await lead.get(`/api/collars/${ids.b}`)).body.record ?? (await lead.get(`/api/collars/${ids.b}`)).body;
    expect((await lead.patch(`/api/collars/${ids.b}`, { rev: collar.rev, code: 'C2-renamed' })).status).toBe(200);
    const after = (await lead.get(path)).body.collars;
    expect(after.find((c: { collarId: string }) => c.collarId === ids.b).code).toBe('C2-renamed');
    const route = (await lead.get(`/api/routes/${ids.route}`)).body.record ?? (await lead.get(`/api/routes/${ids.route}`)).body;
    expect((await lead.patch(`/api/routes/${ids.route}`, { rev: route.rev, collarIds: [ids.c, ids.b, ids.a] })).status).toBe(200);
    expect((await lead.get(path)).body.collars.map((c: { collarId: string }) => c.collarId)).toEqual([ids.c, ids.b, ids.a]);
    // Put the walking order back for the other tests.
    const again = (await lead.get(`/api/routes/${ids.route}`)).body.record ?? (await lead.get(`/api/routes/${ids.route}`)).body;
    expect((await lead.patch(`/api/routes/${ids.route}`, { rev: again.rev, collarIds: [ids.a, ids.b, ids.c] })).status).toBe(200);
  });

  it('when a round beyond the campaign is asked, then 404', async () => {
    expect((await lead.get(`/api/campaigns/${ids.campaign}/progress?round=3`)).status).toBe(404);
    expect((await lead.get(`/api/campaigns/${randomUUID()}/progress`)).status).toBe(404);
  });
});

function closure(base: Record<string, unknown>) {
  const tS = Array.from({ length: 90 }, (_, i) => i);
  return {
    ...base,
    startedAt: '2026-06-01T08:02:00Z',
    settleS: 20,
    series: {
      tS,
      co2Ppm: tS.map((s) => 420 + 0.8 * s),
      h2oMmolMol: tS.map(() => 12),
      pressureKpa: tS.map(() => 97),
      tempC: tS.map(() => 15),
    },
  };
}
