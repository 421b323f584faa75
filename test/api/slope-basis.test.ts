import { randomUUID } from 'node:crypto';
import { recomputeClosures, type RecomputeScope } from '../../server/closures/closure-recompute';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/**
 * A saturating closure C(t) = 420 + 60·(1 − e^(−0.01 t)) (t from closure, 1 Hz, 150 s, dry air):
 * its slope is 0.6 ppm/s at closure and 0.6·e^(−0.2) at the end of a 20 s settle time
 * (Kutzbach et al. 2007, Biogeosciences 4: the flux is the initial slope at closure).
 */
function series() {
  const tS = Array.from({ length: 151 }, (_, i) => i);
  return {
    tS,
    co2Ppm: tS.map((t) => 420 + 60 * (1 - Math.exp(-0.01 * t))),
    h2oMmolMol: tS.map(() => 0),
    pressureKpa: tS.map(() => 100),
    tempC: tS.map(() => 20),
  };
}

describe('Slope basis of a site and the soil area of a closure', () => {
  let t: TestApp;
  let lead: Session, lab: Session, admin: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  beforeAll(async () => {
    t = await startTestApp();
    [lead, lab, admin] = await Promise.all((['lead', 'lab', 'admin'] as const).map((r) => signIn(t.app, demoEmail(r))));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    lead = await signIn(t.app, demoEmail('lead'));
  });
  afterAll(() => t.close());

  it('when a site switches to the settle-end basis, then its closures are recomputed with that basis; the collar’s area is A and a differing footprint is flagged', async () => {
    expect(world.site.slopeBasis).toBe('closure');
    // A 317.8 cm² footprint on a 20 cm collar (314.16 cm², π d²/4): 1.2 % apart.
    await admin.post('/api/chamber-profiles', {
      siteId: world.site.id,
      name: 'Chamber S',
      validFrom: '2026-01-01',
      chamberVolumeCm3: 4000,
      loopVolumeCm3: 0,
      footprintAreaCm2: 317.8,
    });
    const visit = (
      await lead.post('/api/visits', {
        siteId: world.site.id,
        campaignId: world.campaign.id,
        round: 1,
        collarId: world.collar.id,
        arrivedAt: '2026-06-01T09:00:00Z',
      })
    ).body.record;
    await lead.post('/api/offset-sets', {
      siteId: world.site.id,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: world.campaign.id,
      takenAt: '2026-06-01T09:05:00Z',
      readingsCm: [0, 0, 0, 0],
    });
    const res = await lead.post('/api/closures', {
      id: randomUUID(),
      siteId: world.site.id,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: world.campaign.id,
      startedAt: '2026-06-01T09:10:00Z',
      settleS: 20,
      series: series(),
    });
    expect(res.status).toBe(201);
    const c = res.body.record;
    const collarArea = Math.PI * 100;
    expect(c.results.areaCm2).toBeCloseTo(collarArea, 9);
    expect(c.flags).toContain('footprint-area-differs');
    expect(c.results.slopeBasis).toBe('closure');
    expect(c.results.raw.selected.basis).toBe('closure');
    // flux = p·V/(R·T·A)·slope with p = 100 kPa, V = 4000 cm³, T = 293.15 K, A = 100π cm² (×10 for the units).
    const factor = (10 * 100 * 4000) / (8.314462618 * 293.15 * collarArea);
    expect(c.fluxUmolM2S).toBeCloseTo(0.6 * factor, 4);

    const site = (await admin.get(`/api/sites/${world.site.id}`)).body.record;
    const bad = await admin.patch(`/api/sites/${world.site.id}`, { rev: site.rev, slopeBasis: 'middle' });
    expect(bad.status).toBe(400);
    const patched = await admin.patch(`/api/sites/${world.site.id}`, { rev: site.rev, slopeBasis: 'settle_end' });
    expect(patched.status).toBe(200);
    const [request] = await t.ds.query(
      `SELECT id, data FROM job_outbox WHERE data->>'siteId' = $1 AND data->>'reason' = 'site defaults changed'`,
      [world.site.id],
    );
    const out = await recomputeClosures(t.ds, request.data as RecomputeScope, { jobId: request.id });
    expect(out.changedIds).toEqual([c.id]);
    const after = (await lab.get(`/api/closures/${c.id}`)).body.record;
    expect(after.results.slopeBasis).toBe('settle_end');
    expect(after.results.raw.selected.basis).toBe('settle_end');
    expect(after.fluxUmolM2S).toBeCloseTo(0.6 * Math.exp(-0.2) * factor, 4);
    // Both values stay available for review: the exponential keeps its slope at closure.
    expect(after.results.raw.exponential.fluxAtClosureUmolM2S).toBeCloseTo(c.fluxUmolM2S, 8);
  });

  it("when a collar's diameter is corrected, then its closures are asked to be recomputed (A is the collar's area)", async () => {
    const collar = (await lead.get(`/api/collars/${world.collar.id}`)).body.record;
    const res = await lead.patch(`/api/collars/${collar.id}`, { rev: collar.rev, diameterCm: 19.8 });
    expect(res.status).toBe(200);
    expect(res.body.record.areaCm2).toBeCloseTo((Math.PI * 19.8 * 19.8) / 4, 9);
    const jobs = await t.ds.query(`SELECT data FROM job_outbox WHERE data->>'collarId' = $1 AND data->>'reason' = 'collar area changed'`, [
      collar.id,
    ]);
    expect(jobs).toHaveLength(1);
  });
});
