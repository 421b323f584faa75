import { randomUUID } from 'node:crypto';
import { DEMO_SITE_ID, makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

describe('field records through the REST API', () => {
  let t: TestApp;
  let crew: Session, lead: Session, lab: Session, admin: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  beforeAll(async () => {
    t = await startTestApp();
    [crew, lead, lab, admin] = await Promise.all((['crew', 'lead', 'lab', 'admin'] as const).map((r) => signIn(t.app, demoEmail(r))));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    lead = await signIn(t.app, demoEmail('lead')); // memberships are read at each request; a fresh session is tidier
  });
  afterAll(() => t.close());

  it('when a collar is created, then its area is derived (π d²/4, plain geometry) and it can be read and filtered', async () => {
    expect(world.collar.areaCm2).toBeCloseTo(314.159, 3);
    const one = await lead.get(`/api/collars/${world.collar.id}`);
    expect(one.body.record.code).toBe('C1');
    const list = await lead.get(`/api/collars?plotId=${world.plot.id}`);
    expect(list.body.items.map((c: { id: string }) => c.id)).toEqual([world.collar.id]);
    expect(list.body.total).toBe(1);
  });

  it('when a record is edited with its rev, then the rev goes up; a stale rev on the same field gets 409 with the server copy', async () => {
    const a = await lead.patch(`/api/collars/${world.collar.id}`, { rev: world.collar.rev, notes: 'first' });
    expect(a.status).toBe(200);
    expect(a.body.record.rev).toBe(world.collar.rev + 1);
    const stale = await lead.patch(`/api/collars/${world.collar.id}`, { rev: world.collar.rev, notes: 'second' });
    expect(stale.status).toBe(409);
    expect(stale.body.conflict.fields).toEqual(['notes']);
    expect(stale.body.conflict.server.notes).toBe('first');
    expect(stale.body.conflict.serverRev).toBe(a.body.record.rev);
  });

  it('when a field is out of range, then the error names that field and the range', async () => {
    const res = await lead.post('/api/collars', { siteId: world.site.id, code: 'BAD', plotId: world.plot.id, diameterCm: 150 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'diameterCm', message: 'Collar diameter must be at most 100 cm' }]);
  });

  it('when offsets include 0 or more than 10 cm, then they are stored and warnings come back beside them', async () => {
    const visit = await crew.post('/api/visits', {
      siteId: DEMO_SITE_ID,
      campaignId: await openDemoCampaign(crew),
      round: 1,
      collarId: await demoCollar(crew),
      arrivedAt: new Date().toISOString(),
    });
    expect(visit.status).toBe(201);
    const v = visit.body.record;
    const res = await crew.post('/api/offset-sets', {
      siteId: DEMO_SITE_ID,
      visitId: v.id,
      collarId: v.collarId,
      campaignId: v.campaignId,
      takenAt: new Date().toISOString(),
      readingsCm: [0, 2, 12, 3],
    });
    expect(res.status).toBe(201);
    expect(res.body.record.meanCm).toBeCloseTo(4.25, 10);
    expect(res.body.warnings.map((w: { path: string }) => w.path)).toEqual(['readingsCm.0', 'readingsCm.2']);
    const neg = await crew.post('/api/offset-sets', {
      siteId: DEMO_SITE_ID,
      visitId: v.id,
      collarId: v.collarId,
      campaignId: v.campaignId,
      takenAt: new Date().toISOString(),
      readingsCm: [-1, 2, 3],
    });
    expect(neg.body.error.fields[0]).toEqual({ path: 'readingsCm.0', message: 'Offset reading must be at least 0 cm' });
  });

  it('when an offset set is corrected, then the new set supersedes the old one and the old one is kept; an edit is refused', async () => {
    const v = await newDemoVisit(crew);
    const first = (
      await crew.post('/api/offset-sets', {
        siteId: DEMO_SITE_ID,
        visitId: v.id,
        collarId: v.collarId,
        campaignId: v.campaignId,
        takenAt: new Date().toISOString(),
        readingsCm: [2, 2, 2, 2],
      })
    ).body.record;
    const edit = await crew.patch(`/api/offset-sets/${first.id}`, { rev: first.rev, readingsCm: [3, 3, 3, 3] });
    expect(edit.status).toBe(403);
    expect(edit.body.error.message).toMatch(/supersedes/);
    const second = await crew.post('/api/offset-sets', {
      siteId: DEMO_SITE_ID,
      visitId: v.id,
      collarId: v.collarId,
      campaignId: v.campaignId,
      takenAt: new Date().toISOString(),
      readingsCm: [3, 3, 3, 3],
      supersedesId: first.id,
    });
    expect(second.status).toBe(201);
    const both = await crew.get(`/api/offset-sets?visitId=${v.id}`);
    expect(both.body.items.map((s: { id: string }) => s.id).sort()).toEqual([first.id, second.body.record.id].sort());
  });

  it('when a record is deleted, then it becomes a tombstone: hidden from lists, kept with deleted=true', async () => {
    const c = (await lead.post('/api/collars', { siteId: world.site.id, code: `DEL-${Date.now()}`, plotId: world.plot.id, diameterCm: 10 }))
      .body.record;
    const del = await lead.delete(`/api/collars/${c.id}?rev=${c.rev}`);
    expect(del.status).toBe(200);
    expect(del.body.record.deleted).toBe(true);
    const list = await lead.get(`/api/collars?plotId=${world.plot.id}`);
    expect(list.body.items.some((x: { id: string }) => x.id === c.id)).toBe(false);
    const row = await t.ds.query('SELECT deleted FROM collar WHERE id = $1', [c.id]);
    expect(row).toEqual([{ deleted: true }]);
  });

  it('when the lab changes raw readings, then 403; when the lab reviews, then it is stored', async () => {
    // A closure of a site the lab belongs to (other test files add sites of their own to this database).
    const labSites: string[] = (await lab.get('/api/auth/me')).body.user.siteIds;
    const [closure] = await t.ds.query(`SELECT id, rev FROM closure WHERE NOT deleted AND site_id = ANY($1::uuid[]) ORDER BY id LIMIT 1`, [
      labSites,
    ]);
    expect(closure).toBeDefined();
    const raw = await lab.patch(`/api/closures/${closure.id}`, { rev: Number(closure.rev), settleS: 40 });
    expect(raw.status).toBe(403);
    expect(raw.body.error.message).toMatch(/never changes raw readings/);
    const review = await lab.patch(`/api/closures/${closure.id}`, {
      rev: Number(closure.rev),
      reviewState: 'rejected',
      reviewReason: 'chamber lifted',
    });
    expect(review.status).toBe(200);
    expect(review.body.record.reviewState).toBe('rejected');
    expect((await lab.post('/api/offset-sets', {})).status).toBe(403);
  });

  it('when the crew creates a campaign, then 403; crew may add notes to a collar but not change its geometry', async () => {
    expect((await crew.post('/api/campaigns', { name: 'x' })).status).toBe(403);
    const id = await demoCollar(crew);
    const c = (await crew.get(`/api/collars/${id}`)).body.record;
    expect((await crew.patch(`/api/collars/${id}`, { rev: c.rev, diameterCm: 30 })).status).toBe(403);
    expect((await crew.patch(`/api/collars/${id}`, { rev: c.rev, notes: 'stone next to rim' })).status).toBe(200);
  });

  it('when a crew member of the demo site reads another site, then it is not found and not listed', async () => {
    expect((await crew.get(`/api/sites/${world.site.id}`)).status).toBe(404);
    expect((await crew.get(`/api/collars/${world.collar.id}`)).status).toBe(404);
    const list = await crew.get(`/api/collars?siteId=${world.site.id}`);
    expect(list.body.items).toEqual([]);
    const write = await crew.post('/api/collars', { siteId: world.site.id, code: 'X', plotId: world.plot.id, diameterCm: 20 });
    expect(write.status).toBe(403);
  });

  it('when a chamber profile changes, then a new version with a later validFrom sits beside the old one', async () => {
    const p1 = (
      await admin.post('/api/chamber-profiles', {
        siteId: world.site.id,
        name: 'Chamber A',
        validFrom: '2026-04-01',
        chamberVolumeCm3: 4000,
        loopVolumeCm3: 150,
      })
    ).body.record;
    const p2 = (
      await admin.post('/api/chamber-profiles', {
        siteId: world.site.id,
        name: 'Chamber A',
        validFrom: '2026-07-01',
        chamberVolumeCm3: 4000,
        loopVolumeCm3: 210,
      })
    ).body.record;
    const list = await admin.get(`/api/chamber-profiles?siteId=${world.site.id}`);
    expect(list.body.items.map((p: { id: string }) => p.id)).toEqual([p1.id, p2.id]);
    expect(p1.settleS).toBe(20);
  });

  it('when a note holds <script>, then it is stored and returned verbatim', async () => {
    const id = await demoCollar(crew);
    const c = (await crew.get(`/api/collars/${id}`)).body.record;
    const note = '<script>alert("x")</script> & <b>rim</b>';
    await crew.patch(`/api/collars/${id}`, { rev: c.rev, notes: note });
    expect((await crew.get(`/api/collars/${id}`)).body.record.notes).toBe(note);
  });

  it('when a campaign is locked, then new field records for it are refused with a readable message', async () => {
    const camp = (
      await lead.post('/api/campaigns', { siteId: world.site.id, name: 'Locked', startsOn: '2026-06-01', endsOn: '2026-06-01', rounds: 1 })
    ).body.record;
    await lead.post('/api/visits', {
      siteId: world.site.id,
      campaignId: camp.id,
      round: 1,
      collarId: world.collar.id,
      arrivedAt: new Date().toISOString(),
      skipped: true,
      skipReason: 'flooded',
    });
    expect((await lead.patch(`/api/campaigns/${camp.id}`, { rev: camp.rev, locked: true })).status).toBe(200);
    const v = await lead.post('/api/visits', {
      siteId: world.site.id,
      campaignId: camp.id,
      round: 1,
      collarId: world.collar.id,
      arrivedAt: new Date().toISOString(),
    });
    expect(v.status).toBe(423);
    expect(v.body.error.message).toMatch(/locked/);
  });
});

async function openDemoCampaign(s: Session): Promise<string> {
  const list = await s.get(`/api/campaigns?siteId=${DEMO_SITE_ID}`);
  return list.body.items.find((c: { locked: boolean }) => !c.locked).id;
}
async function demoCollar(s: Session): Promise<string> {
  return (await s.get(`/api/collars?siteId=${DEMO_SITE_ID}&limit=1`)).body.items[0].id;
}
async function newDemoVisit(s: Session) {
  const res = await s.post('/api/visits', {
    id: randomUUID(),
    siteId: DEMO_SITE_ID,
    campaignId: await openDemoCampaign(s),
    round: 1,
    collarId: await demoCollar(s),
    arrivedAt: new Date().toISOString(),
  });
  return res.body.record;
}
