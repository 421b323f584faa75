import { randomUUID } from 'node:crypto';
import { recomputeClosures, type RecomputeScope } from '../../server/closures/closure-recompute';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const R = 8.314462618; // CODATA 2018, exact

/** A straight closure, 0.5 ppm/s, dry air, 100 kPa; `tempC` null = the analyzer file has no chamber temperature. */
function series(tempC: number | null, start = 420) {
  const tS = Array.from({ length: 121 }, (_, i) => i);
  return {
    tS,
    co2Ppm: tS.map((t) => start + 0.5 * t),
    h2oMmolMol: tS.map(() => 0),
    pressureKpa: tS.map(() => 100),
    tempC: tempC === null ? null : tS.map(() => tempC),
  };
}
/** Ideal-gas flux (DESIGN.md): p·V/(R·T·A)·dχ/dt, ×10 for kPa·cm³/cm² → µmol m⁻² s⁻¹ with the slope in ppm/s. */
const flux = (volumeCm3: number, tempC: number, slope = 0.5) => (10 * 100 * volumeCm3 * slope) / (R * (tempC + 273.15) * Math.PI * 100);

describe('Several chamber systems at one site, and the chamber air temperature when the file has none', () => {
  let t: TestApp;
  let lead: Session, lab: Session, admin: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  let tall: { id: string }, short: { id: string }, analyzerA: { id: string }, analyzerB: { id: string };
  let visit: { id: string; rev: number };
  const offsetCm = 2;
  beforeAll(async () => {
    t = await startTestApp();
    [lead, lab, admin] = await Promise.all((['lead', 'lab', 'admin'] as const).map((r) => signIn(t.app, demoEmail(r))));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    lead = await signIn(t.app, demoEmail('lead'));
    const siteId = world.site.id;
    // Two systems on the same day: the short chamber's version is the newest of the site.
    tall = (
      await admin.post('/api/chamber-profiles', {
        siteId,
        name: 'Tall',
        validFrom: '2026-03-01',
        chamberVolumeCm3: 6000,
        loopVolumeCm3: 150,
      })
    ).body.record;
    short = (
      await admin.post('/api/chamber-profiles', {
        siteId,
        name: 'Short',
        validFrom: '2026-05-01',
        chamberVolumeCm3: 2500,
        loopVolumeCm3: 90,
      })
    ).body.record;
    // A second version of the short chamber on the same day as a tall one is allowed (different chambers).
    const sameDay = await admin.post('/api/chamber-profiles', {
      siteId,
      name: 'Short',
      validFrom: '2026-03-01',
      chamberVolumeCm3: 2400,
      loopVolumeCm3: 90,
    });
    expect(sameDay.status).toBe(201);
    analyzerA = (await admin.post('/api/analyzers', { siteId, name: 'A' })).body.record;
    analyzerB = (await admin.post('/api/analyzers', { siteId, name: 'B' })).body.record;
    const check = (analyzerId: string, at: string, co2Ppm: number) =>
      lead.post('/api/analyzer-checks', { siteId, analyzerId, kind: 'ambient', at, co2Ppm });
    expect((await check(analyzerA.id, '2026-06-01T06:00:00Z', 418)).status).toBe(201);
    expect((await check(analyzerB.id, '2026-06-01T06:30:00Z', 431)).status).toBe(201);
    expect((await check(analyzerA.id, '2026-06-01T21:30:00Z', 470)).status).toBe(201); // the night round's own reading
    visit = (
      await lead.post('/api/visits', {
        siteId,
        campaignId: world.campaign.id,
        round: 1,
        collarId: world.collar.id,
        arrivedAt: '2026-06-01T09:00:00Z',
      })
    ).body.record;
    await lead.post('/api/offset-sets', {
      siteId,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: world.campaign.id,
      takenAt: '2026-06-01T09:05:00Z',
      readingsCm: [offsetCm, offsetCm, offsetCm],
    });
  });
  afterAll(() => t.close());

  const closure = (over: Record<string, unknown>) =>
    lead.post('/api/closures', {
      id: randomUUID(),
      siteId: world.site.id,
      visitId: visit.id,
      collarId: world.collar.id,
      campaignId: world.campaign.id,
      settleS: 20,
      ...over,
    });

  it('when two systems measure on one day, then each closure gets its own chamber’s volume and its own analyzer’s nearest ambient', async () => {
    const area = Math.PI * 100;
    const a = (await closure({ profileId: tall.id, analyzerId: analyzerA.id, startedAt: '2026-06-01T09:10:00Z', series: series(20) })).body
      .record;
    const b = (await closure({ profileId: short.id, analyzerId: analyzerB.id, startedAt: '2026-06-01T09:20:00Z', series: series(20) })).body
      .record;
    const night = (
      await closure({ profileId: tall.id, analyzerId: analyzerA.id, startedAt: '2026-06-01T23:00:00Z', series: series(20, 530) })
    ).body.record;

    expect(a.results).toMatchObject({ profileId: tall.id, profileName: 'Tall', profileSource: 'closure', ambientPpm: 418 });
    expect(a.results.volumeCm3).toBeCloseTo(6000 + 150 + area * offsetCm, 6);
    expect(a.fluxUmolM2S).toBeCloseTo(flux(6150 + area * offsetCm, 20), 4);
    expect(b.results).toMatchObject({ profileId: short.id, profileName: 'Short', ambientPpm: 431 });
    expect(b.results.volumeCm3).toBeCloseTo(2500 + 90 + area * offsetCm, 6);
    // The night closure starts at 530 ppm: far above the morning's 418 (+100 margin) but not above the night's 470.
    expect(night.results.ambientPpm).toBe(470);
    expect(night.flags).not.toContain('start-above-ambient');
  });

  it('when a closure names no chamber and the site has two without a default, then it gets no flux and says why', async () => {
    const c = (await closure({ analyzerId: analyzerA.id, startedAt: '2026-06-01T10:00:00Z', series: series(20) })).body.record;
    expect(c.fluxUmolM2S).toBeNull();
    expect(c.results.raw.error).toMatch(/names no chamber profile/);
  });

  it('when the lab corrects a closure’s profile, then the flux follows and the history keeps the change; the crew’s raw data stay closed to the lab', async () => {
    const c = (await closure({ profileId: short.id, analyzerId: analyzerA.id, startedAt: '2026-06-01T11:00:00Z', series: series(20) })).body
      .record;
    const fixed = await lab.patch(`/api/closures/${c.id}`, { rev: c.rev, profileId: tall.id });
    expect(fixed.status).toBe(200);
    expect(fixed.body.record.results.profileName).toBe('Tall');
    expect(fixed.body.record.fluxUmolM2S / c.fluxUmolM2S).toBeCloseTo(
      (6150 + Math.PI * 100 * offsetCm) / (2590 + Math.PI * 100 * offsetCm),
      6,
    );
    const history = (await lab.get(`/api/bench/closures/${c.id}/history`)).body.items;
    expect(history).toEqual(
      expect.arrayContaining([expect.objectContaining({ field: 'profileId', oldValue: short.id, newValue: tall.id })]),
    );
    const raw = await lab.patch(`/api/closures/${c.id}`, { rev: fixed.body.record.rev, settleS: 30 });
    expect(raw.status).toBe(403);
  });

  it('when the analyzer file has no chamber temperature, then the visit’s air temperature is used, else the site default, each flagged', async () => {
    const siteDefault = (
      await closure({ profileId: tall.id, analyzerId: analyzerA.id, startedAt: '2026-06-01T12:00:00Z', series: series(null) })
    ).body.record;
    expect(siteDefault.results.airTempSource).toBe('site-default');
    expect(siteDefault.results.airTempC).toBe(15);
    expect(siteDefault.flags).toContain('temp-site-default');
    const v = siteDefault.results.volumeCm3 as number;
    expect(siteDefault.fluxUmolM2S).toBeCloseTo(flux(v, 15), 4);

    const current = (await lead.get(`/api/visits/${visit.id}`)).body.record;
    const bad = await lead.patch(`/api/visits/${visit.id}`, { rev: current.rev, conditions: { ...current.conditions, airTempC: 'warm' } });
    expect(bad.status).toBe(400);
    const patched = await lead.patch(`/api/visits/${visit.id}`, { rev: current.rev, conditions: { ...current.conditions, airTempC: 4 } });
    expect(patched.status).toBe(200);
    const [job] = await t.ds.query(
      `SELECT id, data FROM job_outbox WHERE data->>'reason' = 'visit air temperature changed' AND data->>'siteId' = $1`,
      [world.site.id],
    );
    const out = await recomputeClosures(t.ds, job.data as RecomputeScope, { jobId: job.id });
    expect(out.changedIds).toContain(siteDefault.id);
    const after = (await lab.get(`/api/closures/${siteDefault.id}`)).body.record;
    expect(after.results).toMatchObject({ airTempSource: 'visit', airTempC: 4 });
    expect(after.flags).toContain('temp-from-visit');
    expect(after.flags).not.toContain('temp-site-default');
    expect(after.fluxUmolM2S).toBeCloseTo(flux(v, 4), 4);

    const fromFile = (
      await closure({ profileId: tall.id, analyzerId: analyzerA.id, startedAt: '2026-06-01T12:10:00Z', series: series(25) })
    ).body.record;
    expect(fromFile.results.airTempSource).toBe('series');
    expect(fromFile.flags.filter((f: string) => f.startsWith('temp-'))).toEqual([]);
  });
});
