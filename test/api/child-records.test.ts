import { randomBytes, randomUUID } from 'node:crypto';
import { buildWorld, createBody, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * Records under a visit carry that visit's collar and campaign (a disagreeing one is refused with a
 * field message), the locked-campaign rule reads the visit's campaign, and every reference a record
 * holds (lists, attachment owners, source files, redos, crews) names something at its own site.
 */
describe('child records agree with their parent and stay on their site', () => {
  let t: TestApp;
  let admin: Session, lab: Session, lead: Session, crew: Session;
  let home: World, other: World;
  let leadId: string;
  let locked: { campaign: Record<string, unknown> & { id: string }; visit: Record<string, unknown> & { id: string } };
  let secondCollar: Record<string, unknown> & { id: string };

  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const hl = await makeUser(admin, ['lead'], []);
    const ol = await makeUser(admin, ['lead'], []);
    leadId = hl.id;
    lead = await signIn(t.app, hl.email);
    home = await buildWorld({ admin, lead, lab }, hl.id, `ch${randomUUID().slice(0, 6)}`);
    other = await buildWorld({ admin, lead: await signIn(t.app, ol.email), lab }, ol.id, `ot${randomUUID().slice(0, 6)}`);
    crew = await signIn(t.app, (await makeUser(admin, ['crew'], [home.site.id])).email);
    secondCollar = (await lead.post('/api/collars', { siteId: home.site.id, code: 'C2', plotId: home.plot.id, diameterCm: 20 })).body
      .record;
    // A closed campaign at the same site: every collar skipped with a reason, then locked.
    const campaign = (
      await lead.post('/api/campaigns', { siteId: home.site.id, name: 'Closed', startsOn: '2026-05-01', endsOn: '2026-05-01', rounds: 1 })
    ).body.record;
    let visit;
    for (const collar of [home.collar, secondCollar]) {
      const v = (
        await lead.post('/api/visits', {
          siteId: home.site.id,
          campaignId: campaign.id,
          round: 1,
          collarId: collar.id,
          arrivedAt: '2026-05-01T08:00:00Z',
          skipped: true,
          skipReason: 'flooded',
        })
      ).body.record;
      if (collar === home.collar) visit = v;
    }
    const lockedRes = await lead.post(`/api/campaigns/${campaign.id}/lock`);
    expect(lockedRes.status).toBe(200);
    locked = { campaign: lockedRes.body.record, visit };
  });
  afterAll(() => t.close());

  const reading = (over: Record<string, unknown>) => ({ ...createBody(home.probeReading), takenAt: '2026-06-01T09:00:00Z', ...over });
  const closure = (over: Record<string, unknown>) => ({ ...createBody(home.closure), startedAt: '2026-06-01T09:10:00Z', ...over });
  const count = async (table: string, visitId: string) =>
    (await t.ds.query(`SELECT count(*)::int AS n FROM ${table} WHERE visit_id = $1`, [visitId]))[0].n as number;

  it("when a reading or closure names a locked campaign's visit but the open campaign, then refused and the locked campaign is unchanged", async () => {
    const before = [await count('probe_reading', locked.visit.id), await count('closure', locked.visit.id)];
    const r = await crew.post('/api/probe-readings', reading({ visitId: locked.visit.id }));
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toEqual([{ path: 'campaignId', message: expect.stringContaining(locked.campaign.id) }]);
    const c = await crew.post('/api/closures', closure({ visitId: locked.visit.id }));
    expect(c.status).toBe(400);
    const synced = await crew.post('/api/sync/push', {
      deviceId: randomUUID(),
      outboxSize: 1,
      ops: [
        {
          opId: randomUUID(),
          entity: 'probeReading',
          id: randomUUID(),
          baseRev: null,
          op: 'upsert',
          fields: reading({ visitId: locked.visit.id }),
        },
      ],
    });
    expect(synced.body.results[0]).toMatchObject({ status: 'rejected', error: { fields: [{ path: 'campaignId' }] } });
    expect([await count('probe_reading', locked.visit.id), await count('closure', locked.visit.id)]).toEqual(before);
    // Naming the locked campaign itself is the lock's refusal.
    const agreeing = await crew.post('/api/probe-readings', reading({ visitId: locked.visit.id, campaignId: locked.campaign.id }));
    expect(agreeing.status).toBe(423);
  });

  it("when a reading, offset set or closure names another collar than its visit's, then refused with a collarId message", async () => {
    const r = await crew.post('/api/probe-readings', reading({ collarId: secondCollar.id }));
    expect([r.status, r.body.error.fields?.[0]?.path]).toEqual([400, 'collarId']);
    const o = await crew.post('/api/offset-sets', { ...createBody(home.offsetSet), collarId: secondCollar.id });
    expect([o.status, o.body.error.fields?.[0]?.path]).toEqual([400, 'collarId']);
    const c = await crew.post('/api/closures', closure({ collarId: secondCollar.id }));
    expect([c.status, c.body.error.fields?.[0]?.path]).toEqual([400, 'collarId']);
    expect((await crew.post('/api/probe-readings', reading({}))).status).toBe(201);
  });

  it("when a redo names a closure of another visit or a correction another collar's offsets, then refused", async () => {
    const visit2 = (
      await crew.post('/api/visits', {
        siteId: home.site.id,
        campaignId: home.campaign.id,
        round: 1,
        collarId: secondCollar.id,
        arrivedAt: '2026-06-01T10:00:00Z',
      })
    ).body.record;
    const at2 = { visitId: visit2.id, collarId: secondCollar.id };
    const redo = await crew.post('/api/closures', closure({ ...at2, redoOfId: home.closure.id }));
    expect([redo.status, redo.body.error.fields?.[0]?.path]).toEqual([400, 'visitId']);
    const fix = await crew.post('/api/offset-sets', { ...createBody(home.offsetSet), ...at2, supersedesId: home.offsetSet.id });
    expect([fix.status, fix.body.error.fields?.[0]?.path]).toEqual([400, 'collarId']);
    expect((await crew.post('/api/closures', closure({ redoOfId: home.closure.id }))).status).toBe(201);
  });

  it("when a record names another site's attachment owner, source file, redo, route, collar or profile, then refused per field", async () => {
    const cases: [string, Session, string, Record<string, unknown>, string][] = [
      [
        'attachment owner',
        crew,
        '/api/attachments',
        {
          siteId: home.site.id,
          ownerEntity: 'visit',
          ownerId: other.visit.id,
          mediaType: 'image/jpeg',
          sizeBytes: 10,
          sha256: randomBytes(32).toString('hex'),
        },
        'ownerId',
      ],
      ['source file', crew, '/api/closures', closure({ sourceAttachmentId: other.attachment.id }), 'sourceAttachmentId'],
      ['redo', crew, '/api/closures', closure({ redoOfId: other.closure.id }), 'redoOfId'],
      [
        'route collars',
        lead,
        '/api/routes',
        { siteId: home.site.id, name: 'Mixed', collarIds: [home.collar.id, other.collar.id] },
        'collarIds',
      ],
      [
        'campaign route',
        lead,
        '/api/campaigns',
        {
          siteId: home.site.id,
          name: 'X',
          startsOn: '2026-07-01',
          endsOn: '2026-07-01',
          rounds: 1,
          routes: [{ routeId: other.route.id, crewIds: [] }],
        },
        'routes',
      ],
    ];
    for (const [what, s, path, body, field] of cases) {
      const res = await s.post(path, body);
      expect([what, res.status, res.body.error?.fields?.map((f: { path: string }) => f.path)]).toEqual([what, 400, [field]]);
      expect(res.body.error.fields[0].message).toMatch(/another site|No such/);
    }
    const site = await admin.patch(`/api/sites/${home.site.id}`, {
      rev: (await admin.get(`/api/sites/${home.site.id}`)).body.record.rev,
      defaultProfileId: other.chamberProfile.id,
    });
    expect([site.status, site.body.error?.fields?.[0]?.path]).toEqual([400, 'defaultProfileId']);
  });

  it("when a visit's crew or a route's crew is not a member of the site, then refused; a member is accepted", async () => {
    const outsider = await makeUser(admin, ['crew'], [other.site.id]);
    const v = await crew.post('/api/visits', {
      siteId: home.site.id,
      campaignId: home.campaign.id,
      round: 1,
      collarId: home.collar.id,
      arrivedAt: '2026-06-01T11:00:00Z',
      crewId: outsider.id,
    });
    expect([v.status, v.body.error?.fields]).toEqual([400, [{ path: 'crewId', message: `${outsider.id} is not a member of this site` }]]);
    const camp = (await lead.get(`/api/campaigns/${home.campaign.id}`)).body.record;
    const plan = (crewIds: string[]) =>
      lead.patch(`/api/campaigns/${camp.id}`, { rev: camp.rev, routes: [{ routeId: home.route.id, crewIds }] });
    const bad = await plan([leadId, outsider.id]);
    expect([bad.status, bad.body.error?.fields]).toEqual([
      400,
      [{ path: 'routes', message: `${outsider.id} is not a member of this site` }],
    ]);
    expect((await plan([leadId])).status).toBe(200);
  });
});
