import { randomUUID } from 'node:crypto';
import { makeLayout, makeUser } from '../fixtures/setup/setup-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/** A closure with a steady 0.8 µmol/mol/s rise, on 1 June 2026 (site time Europe/Berlin). */
function closureSeries() {
  const tS = Array.from({ length: 90 }, (_, i) => i);
  return { tS, co2Ppm: tS.map((s) => 420 + 0.8 * s), h2oMmolMol: tS.map(() => 12), pressureKpa: tS.map(() => 97), tempC: tS.map(() => 15) };
}

describe('chamber profile versions', () => {
  let t: TestApp;
  let admin: Session, lead: Session;
  let siteId: string, v1: { id: string; rev: number }, closureId: string, campaign: { id: string; rev: number };
  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    const { site, plots } = await makeLayout(admin);
    siteId = site.id;
    lead = await makeUser(t.app, admin, 'lead', [siteId]);
    v1 = (
      await admin.post('/api/chamber-profiles', {
        siteId,
        name: 'Opaque 20 cm',
        validFrom: '2026-01-01',
        chamberVolumeCm3: 4000,
        loopVolumeCm3: 50,
      })
    ).body.record;
    const collar = (await lead.post('/api/collars', { siteId, code: 'V1', plotId: plots[0].id, diameterCm: 20 })).body.record;
    campaign = (await lead.post('/api/campaigns', { siteId, name: 'June', startsOn: '2026-06-01', endsOn: '2026-06-02', rounds: 1 })).body
      .record;
    const visit = (
      await lead.post('/api/visits', { siteId, campaignId: campaign.id, round: 1, collarId: collar.id, arrivedAt: '2026-06-01T08:00:00Z' })
    ).body.record;
    const ids = { siteId, visitId: visit.id, collarId: collar.id, campaignId: campaign.id };
    expect((await lead.post('/api/offset-sets', { ...ids, takenAt: '2026-06-01T08:01:00Z', readingsCm: [2, 2, 2, 2] })).status).toBe(201);
    const closure = await lead.post('/api/closures', { ...ids, startedAt: '2026-06-01T08:02:00Z', settleS: 20, series: closureSeries() });
    expect(closure.status).toBe(201);
    closureId = closure.body.record.id;
    expect(closure.body.record.results.profileId).toBe(v1.id);
  });
  afterAll(() => t.close());

  it('when closures use a version, then its usage counts them and its geometry cannot be edited or the version deleted', async () => {
    expect((await admin.get(`/api/chamber-profiles/${v1.id}/usage`)).body).toEqual({ profileId: v1.id, closures: 1 });
    const edit = await admin.patch(`/api/chamber-profiles/${v1.id}`, { rev: v1.rev, chamberVolumeCm3: 4500 });
    expect(edit.status).toBe(409);
    expect(edit.body.error).toEqual({
      message: '1 closure uses this chamber profile; add a new version valid from a date instead of editing it',
      fields: [{ path: 'chamberVolumeCm3', message: 'Fixed once closures use this version' }],
    });
    const del = await admin.delete(`/api/chamber-profiles/${v1.id}?rev=${v1.rev}`);
    expect([del.status, del.body.error.message]).toEqual([
      409,
      '1 closure uses this chamber profile; add a new version valid from a date instead of deleting it',
    ]);
    const rename = await admin.patch(`/api/chamber-profiles/${v1.id}`, { rev: v1.rev, name: 'Opaque 20 cm <b>A</b>' });
    expect([rename.status, rename.body.record.name]).toEqual([200, 'Opaque 20 cm <b>A</b>']);
    v1 = rename.body.record;
  });

  it('when a version is previewed, then it counts the closures from its day until the next version', async () => {
    const may = await admin.post(`/api/sites/${siteId}/chamber-profiles/recompute-preview`, { validFrom: '2026-05-01' });
    expect(may.body).toEqual({ validFrom: '2026-05-01', until: null, closures: 1, lockedKept: 0 });
    const july = await admin.post(`/api/sites/${siteId}/chamber-profiles/recompute-preview`, { validFrom: '2026-07-01' });
    expect(july.body.closures).toBe(0);
    const bad = await admin.post(`/api/sites/${siteId}/chamber-profiles/recompute-preview`, { validFrom: '1 May' });
    expect(bad.body.error.fields).toEqual([{ path: 'validFrom', message: 'validFrom must be a date YYYY-MM-DD' }]);
  });

  it('when a new version is added, then the closures under it are recomputed with its volume and the old version is kept', async () => {
    const before = (await lead.get(`/api/closures/${closureId}`)).body.record;
    const res = await admin.post(`/api/chamber-profiles/${v1.id}/versions`, { validFrom: '2026-05-01', chamberVolumeCm3: 8000 });
    expect(res.status).toBe(201);
    expect(res.body.recomputed).toBe(1);
    expect(res.body.record).toMatchObject({
      name: 'Opaque 20 cm <b>A</b>',
      validFrom: '2026-05-01',
      chamberVolumeCm3: 8000,
      loopVolumeCm3: 50,
      siteId,
    });
    const after = (await lead.get(`/api/closures/${closureId}`)).body.record;
    expect(after.results.profileId).toBe(res.body.record.id);
    expect(after.rev).toBe(before.rev + 1);
    // V = chamber + loop + A × mean offset (plain geometry); flux ∝ V (ideal gas law), all else equal.
    const area = Math.PI * 100;
    expect(before.results.volumeCm3).toBeCloseTo(4000 + 50 + area * 2, 6);
    expect(after.results.volumeCm3).toBeCloseTo(8000 + 50 + area * 2, 6);
    expect(after.fluxUmolM2S / before.fluxUmolM2S).toBeCloseTo(after.results.volumeCm3 / before.results.volumeCm3, 9);
    const all = (await admin.get(`/api/chamber-profiles?siteId=${siteId}`)).body.items.map((p: { validFrom: string }) => p.validFrom);
    expect(all).toEqual(['2026-01-01', '2026-05-01']);
    const until = await admin.post(`/api/sites/${siteId}/chamber-profiles/recompute-preview`, { validFrom: '2026-03-01' });
    expect(until.body).toEqual({ validFrom: '2026-03-01', until: '2026-05-01', closures: 0, lockedKept: 0 });
  });

  it('when a version would start on the day of another, then it is refused with the field named', async () => {
    const res = await admin.post(`/api/chamber-profiles/${v1.id}/versions`, { validFrom: '2026-05-01', chamberVolumeCm3: 9000 });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toEqual([{ path: 'validFrom', message: 'Another version starts on this day' }]);
    const bad = await admin.post(`/api/chamber-profiles/${v1.id}/versions`, { validFrom: '2026-08-01', chamberVolumeCm3: 2 });
    expect(bad.body.error.fields).toEqual([{ path: 'chamberVolumeCm3', message: 'Chamber volume must be at least 10 cm³' }]);
    const none = await admin.post(`/api/chamber-profiles/${randomUUID()}/versions`, { validFrom: '2026-08-01' });
    expect([none.status, none.body.error.message]).toEqual([404, 'There is no such chamber profile']);
  });

  it('when the campaign is locked, then the preview counts its closures as kept, not recomputed', async () => {
    // Locking needs every collar complete: the visit's probe reading is the item still due.
    const c = (await lead.get(`/api/closures/${closureId}`)).body.record;
    expect(
      (
        await lead.post('/api/probe-readings', {
          siteId,
          visitId: c.visitId,
          collarId: c.collarId,
          campaignId: campaign.id,
          takenAt: '2026-06-01T08:05:00Z',
        })
      ).status,
    ).toBe(201);
    const locked = await lead.patch(`/api/campaigns/${campaign.id}`, { rev: campaign.rev, locked: true });
    expect(locked.status).toBe(200);
    const res = await admin.post(`/api/sites/${siteId}/chamber-profiles/recompute-preview`, { validFrom: '2026-05-15' });
    expect(res.body).toEqual({ validFrom: '2026-05-15', until: null, closures: 0, lockedKept: 1 });
  });

  it('when a profile no closure uses is edited, then the edit applies; leads and crew may not add versions', async () => {
    const spare = (
      await admin.post('/api/chamber-profiles', {
        siteId,
        name: 'Spare',
        validFrom: '2027-01-01',
        chamberVolumeCm3: 3000,
        loopVolumeCm3: 40,
      })
    ).body.record;
    const edit = await admin.patch(`/api/chamber-profiles/${spare.id}`, { rev: spare.rev, chamberVolumeCm3: 3100 });
    expect([edit.status, edit.body.record.chamberVolumeCm3]).toEqual([200, 3100]);
    const byLead = await lead.post(`/api/chamber-profiles/${spare.id}/versions`, { validFrom: '2027-02-01' });
    expect([byLead.status, byLead.body.error.message]).toEqual([403, 'Your role does not allow this']);
    const outsider = await makeUser(t.app, admin, 'lead', []);
    const usage = await outsider.get(`/api/chamber-profiles/${spare.id}/usage`);
    expect([usage.status, usage.body.error.message]).toEqual([403, 'You are not a member of this site']);
  });
});
