import { randomUUID } from 'node:crypto';
import { recomputeClosures, type RecomputeScope } from '../../server/closures/closure-recompute';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/** A plain rising closure: 121 s at 1 Hz, CO2 rising 0.3 ppm/s and slowly bending, measured p, T and H2O. */
function series() {
  const tS = Array.from({ length: 121 }, (_, i) => i);
  return {
    tS,
    co2Ppm: tS.map((t) => 420 + 0.3 * t - 0.0004 * t * t + 0.05 * Math.sin(t)),
    h2oMmolMol: tS.map(() => 12),
    pressureKpa: tS.map(() => 97.5),
    tempC: tS.map(() => 18),
  };
}

describe('Recompute when an offset set is superseded', () => {
  let t: TestApp;
  let lead: Session, lab: Session, admin: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  beforeAll(async () => {
    t = await startTestApp();
    [lead, lab, admin] = await Promise.all((['lead', 'lab', 'admin'] as const).map((r) => signIn(t.app, demoEmail(r))));
    if (lead.login.status !== 200) throw new Error(`lead sign-in: ${lead.login.status} ${JSON.stringify(lead.login.body)}`);
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    lead = await signIn(t.app, demoEmail('lead'));
  });
  afterAll(() => t.close());

  async function visitOn(campaignId: string, round: number, day: string) {
    return (
      await lead.post('/api/visits', { siteId: world.site.id, campaignId, round, collarId: world.collar.id, arrivedAt: `${day}T09:00:00Z` })
    ).body.record;
  }
  async function offsetSet(visit: any, day: string, readingsCm: number[], supersedesId: string | null = null) {
    const res = await lead.post('/api/offset-sets', {
      siteId: world.site.id,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: visit.campaignId,
      takenAt: `${day}T09:05:00Z`,
      readingsCm,
      supersedesId,
    });
    expect(res.status).toBe(201);
    return res.body.record;
  }
  async function closure(visit: any, day: string) {
    const res = await lead.post('/api/closures', {
      id: randomUUID(),
      siteId: world.site.id,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: visit.campaignId,
      startedAt: `${day}T09:10:00Z`,
      settleS: 20,
      series: series(),
    });
    expect(res.status).toBe(201);
    return res.body.record;
  }

  it('then exactly the closures whose volume came from the old set are recomputed; a reviewed one keeps its decision and shows old and new flux; a second run changes nothing', async () => {
    await admin.post('/api/chamber-profiles', {
      siteId: world.site.id,
      name: 'Chamber T',
      validFrom: '2026-01-01',
      chamberVolumeCm3: 4000,
      loopVolumeCm3: 150,
    });
    const camp = (
      await lead.post('/api/campaigns', {
        siteId: world.site.id,
        name: 'Recompute',
        startsOn: '2026-06-01',
        endsOn: '2026-06-05',
        rounds: 3,
      })
    ).body.record;
    const v1 = await visitOn(camp.id, 1, '2026-06-01');
    const v2 = await visitOn(camp.id, 2, '2026-06-02');
    const v3 = await visitOn(camp.id, 3, '2026-06-03');
    const s1 = await offsetSet(v1, '2026-06-01', [2, 2, 2, 2]);
    await offsetSet(v3, '2026-06-03', [3, 3, 3, 3]);
    const c1 = await closure(v1, '2026-06-01');
    const c2 = await closure(v2, '2026-06-02');
    const c3 = await closure(v3, '2026-06-03');
    expect([c1, c2].map((c) => c.results.offsetSetId)).toEqual([s1.id, s1.id]);
    const accepted = (await lab.patch(`/api/closures/${c1.id}`, { rev: c1.rev, reviewState: 'accepted' })).body.record;

    const s1b = await offsetSet(v1, '2026-06-01', [4, 4, 4, 4], s1.id);

    // The write asked for a job in its own transaction; run it as the worker would, with the data it stored.
    const [request] = await t.ds.query(`SELECT id, data FROM job_outbox WHERE data->>'collarId' = $1`, [world.collar.id]);
    const scope = request.data as RecomputeScope;
    // From the set's own day on, and any closure that borrowed a later set (none here).
    expect(scope).toEqual({
      siteId: world.site.id,
      collarId: world.collar.id,
      fromDay: '2026-06-01',
      orFlagged: 'offset-after',
      reason: 'offset set superseded',
    });
    const job = (await lab.get(`/api/jobs/${request.id}`)).body.job;
    expect(job).toMatchObject({ name: 'closure-recompute', state: 'queued', siteId: world.site.id });

    const first = await recomputeClosures(t.ds, scope, { jobId: request.id });
    expect(first.examined).toBe(3);
    expect(first.changedIds.sort()).toEqual([c1.id, c2.id].sort());

    const [n1, n2, n3] = await Promise.all([c1, c2, c3].map(async (c) => (await lab.get(`/api/closures/${c.id}`)).body.record));
    expect(n3.rev).toBe(c3.rev);
    expect(n3.fluxUmolM2S).toBe(c3.fluxUmolM2S);
    expect(n2.rev).toBe(c2.rev + 1);
    expect([n1.results.offsetSetId, n2.results.offsetSetId]).toEqual([s1b.id, s1b.id]);
    // V = chamber + loop + A × mean offset: 2 cm more offset adds 2 × π·10² cm³ (plain geometry).
    expect(n2.results.volumeCm3 - c2.results.volumeCm3).toBeCloseTo(2 * Math.PI * 100, 6);
    // flux = p·V·(1 − χw)/(R·T·A)·dχ/dt (ideal gas law, DESIGN.md): same series, so fluxes scale with the volume.
    expect(n2.fluxUmolM2S / c2.fluxUmolM2S).toBeCloseTo(n2.results.volumeCm3 / c2.results.volumeCm3, 12);
    expect(n1.reviewState).toBe('accepted');
    expect(n1.results.recomputedSinceReview).toMatchObject({
      oldFluxUmolM2S: accepted.fluxUmolM2S,
      newFluxUmolM2S: n1.fluxUmolM2S,
      reason: 'offset set superseded',
    });
    const history = (await lab.get(`/api/bench/closures/${c1.id}/history`)).body.items;
    expect(history.at(-1)).toMatchObject({
      kind: 'recompute',
      oldFluxUmolM2S: accepted.fluxUmolM2S,
      newFluxUmolM2S: n1.fluxUmolM2S,
      jobId: request.id,
    });
    const queue = (await lab.get(`/api/bench/queue?siteId=${world.site.id}&recomputedSinceReview=true`)).body.items;
    expect(queue.map((i: any) => i.id)).toEqual([c1.id]);

    const again = await recomputeClosures(t.ds, scope);
    expect(again).toMatchObject({ examined: 3, changed: 0, changedIds: [] });
    expect((await lab.get(`/api/closures/${c1.id}`)).body.record.rev).toBe(n1.rev);
  });

  it('when the lab reviews the recomputed closure again, then the "recomputed since review" mark is gone', async () => {
    const [c] = (await lab.get(`/api/bench/queue?siteId=${world.site.id}&recomputedSinceReview=true`)).body.items;
    const rec = (await lab.get(`/api/closures/${c.id}`)).body.record;
    const res = await lab.patch(`/api/closures/${c.id}`, { rev: rec.rev, reviewSettleS: 25 });
    expect(res.body.record.results.recomputedSinceReview).toBeUndefined();
  });

  it('when the lab asks to recompute a site, then a job to follow is queued for it; a site that does not exist gets 404 and no job', async () => {
    const asked = await lab.post('/api/bench/recompute', { siteId: world.site.id });
    expect(asked.status).toBe(202);
    const job = (await lab.get(`/api/jobs/${asked.body.jobId}`)).body.job;
    expect(job).toMatchObject({ name: 'closure-recompute', siteId: world.site.id });
    const missing = randomUUID();
    expect((await lab.post('/api/bench/recompute', { siteId: missing })).status).toBe(404);
    expect(await t.ds.query(`SELECT id FROM job_progress WHERE site_id = $1`, [missing])).toEqual([]);
  });

  it('when an offset set is added after every closure of its collar, then no recompute is asked for; when a closure had borrowed a later set, then one is', async () => {
    await t.ds.query(`DELETE FROM job_outbox WHERE data->>'collarId' = $1`, [world.collar.id]);
    const camp = (
      await lead.post('/api/campaigns', {
        siteId: world.site.id,
        name: 'Later sets',
        startsOn: '2026-08-01',
        endsOn: '2026-08-30',
        rounds: 3,
      })
    ).body.record;
    const asked = async () =>
      (await t.ds.query(`SELECT data FROM job_outbox WHERE data->>'collarId' = $1`, [world.collar.id])).map(
        (r: { data: RecomputeScope }) => r.data,
      );
    // Every closure so far is in June and took June's sets: an August set changes none of them.
    const v1 = await visitOn(camp.id, 1, '2026-08-10');
    await offsetSet(v1, '2026-08-10', [2.5, 2.5, 2.5, 2.5]);
    expect(await asked()).toEqual([]);
    // A closure with no set on or before its day takes the next one (offset-after); a set placed before it changes its volume.
    const other = (
      await admin.post('/api/collars', {
        siteId: world.site.id,
        plotId: world.collar.plotId,
        code: `LATE-${Date.now() % 100000}`,
        shape: 'round',
        diameterCm: 20,
        heightCm: 10,
        installedOn: '2026-01-01',
      })
    ).body.record;
    expect(other?.id).toBeDefined();
    const visit = (
      await lead.post('/api/visits', {
        siteId: world.site.id,
        campaignId: camp.id,
        round: 2,
        collarId: other.id,
        arrivedAt: '2026-08-20T09:00:00Z',
      })
    ).body.record;
    const late = await lead.post('/api/offset-sets', {
      siteId: world.site.id,
      visitId: visit.id,
      collarId: other.id,
      campaignId: camp.id,
      takenAt: '2026-08-25T09:05:00Z',
      readingsCm: [3, 3, 3, 3],
    });
    expect(late.status).toBe(201);
    const c = (
      await lead.post('/api/closures', {
        id: randomUUID(),
        siteId: world.site.id,
        visitId: visit.id,
        collarId: other.id,
        campaignId: camp.id,
        startedAt: '2026-08-20T09:10:00Z',
        settleS: 20,
        series: series(),
      })
    ).body.record;
    expect(c.flags).toContain('offset-after');
    const early = await lead.post('/api/offset-sets', {
      siteId: world.site.id,
      visitId: visit.id,
      collarId: other.id,
      campaignId: camp.id,
      takenAt: '2026-08-26T09:05:00Z',
      readingsCm: [1, 1, 1, 1],
    });
    expect(early.status).toBe(201);
    const [request] = await t.ds.query(`SELECT data FROM job_outbox WHERE data->>'collarId' = $1`, [other.id]);
    expect(request?.data).toMatchObject({ collarId: other.id, fromDay: '2026-08-26', orFlagged: 'offset-after' });
  });
});
