import { makeLayout, makeUser } from '../fixtures/setup/setup-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const SQUARE = {
  type: 'Polygon',
  coordinates: [
    [
      [11.6, 50.97],
      [11.6004, 50.97],
      [11.6004, 50.9703],
      [11.6, 50.9703],
      [11.6, 50.97],
    ],
  ],
};

/** What Setup's outline editor, analyzer checks and collar treatments send and read through the record routes. */
describe('setup layout writes: plot outlines, analyzer checks, collar treatments', () => {
  let t: TestApp;
  let admin: Session;
  let layout: Awaited<ReturnType<typeof makeLayout>>;
  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    layout = await makeLayout(admin);
  });
  afterAll(() => t.close());

  it('when an admin saves an outline with the rev, then the Polygon is stored and the rev goes up; null removes it', async () => {
    const p1 = layout.plots[0];
    const res = await admin.patch(`/api/plots/${p1.id}`, { rev: p1.rev, outline: SQUARE });
    expect([res.status, res.body.record.outline, res.body.record.rev]).toEqual([200, SQUARE, p1.rev + 1]);
    const cleared = await admin.patch(`/api/plots/${p1.id}`, { rev: res.body.record.rev, outline: null });
    expect([cleared.status, cleared.body.record.outline]).toEqual([200, null]);
  });

  it('when the outline is a LineString, then 400 names the outline field and nothing changes', async () => {
    const p2 = layout.plots[1];
    const res = await admin.patch(`/api/plots/${p2.id}`, {
      rev: p2.rev,
      outline: {
        type: 'LineString',
        coordinates: [
          [11.6, 50.97],
          [11.7, 50.98],
        ],
      },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('outline.type');
    expect((await admin.get(`/api/plots/${p2.id}`)).body.record.outline).toBeNull();
  });

  it("when a lead of the site saves an outline, then the role is refused (plots are the admin's)", async () => {
    const lead = await makeUser(t.app, admin, 'lead', [layout.site.id]);
    const p3 = layout.plots[2];
    expect((await lead.patch(`/api/plots/${p3.id}`, { rev: p3.rev, outline: SQUARE })).status).toBe(403);
  });

  it("when checks are listed by analyzer, then only that analyzer's checks come back, newest first, with who recorded them", async () => {
    const siteId = layout.site.id;
    const [a1, a2] = await Promise.all(
      ['Unit A', 'Unit B'].map(async (name) => (await admin.post('/api/analyzers', { siteId, name })).body.record),
    );
    const add = (analyzerId: string, at: string, extra: Record<string, unknown>) =>
      admin.post('/api/analyzer-checks', { siteId, analyzerId, at, ...extra });
    expect((await add(a1.id, '2026-05-04T05:10:00Z', { kind: 'leak', passed: true })).status).toBe(201);
    expect(
      (await add(a1.id, '2026-05-06T04:55:00Z', { kind: 'calibration', skipped: true, skipReason: 'Span gas bottle empty' })).status,
    ).toBe(201);
    expect((await add(a2.id, '2026-05-05T05:00:00Z', { kind: 'ambient', passed: false })).status).toBe(201);
    const noReason = await add(a1.id, '2026-05-07T05:00:00Z', { kind: 'leak', skipped: true });
    expect([noReason.status, noReason.body.error.fields]).toEqual([
      400,
      [{ path: 'skipReason', message: 'A skipped check needs a reason' }],
    ]);

    const list = (await admin.get(`/api/analyzer-checks?siteId=${siteId}&analyzerId=${a1.id}`)).body;
    const me = (await admin.get('/api/auth/me')).body;
    expect(list.items.map((c: Record<string, unknown>) => [c['kind'], c['skipped'], c['skipReason'], c['passed']])).toEqual([
      ['calibration', true, 'Span gas bottle empty', null],
      ['leak', false, null, true],
    ]);
    expect(new Set(list.items.map((c: { updatedBy: string }) => c.updatedBy))).toEqual(new Set([me.user.id]));
  });

  it("when a collar gets a collar-level treatment, then the collar keeps it; another site's treatment is refused", async () => {
    const siteId = layout.site.id;
    const trenched = (await admin.post('/api/treatments', { siteId, code: 'TR', level: 'collar' })).body.record;
    const collar = (await admin.post('/api/collars', { siteId, code: 'C1', plotId: layout.plots[0].id, diameterCm: 20 })).body.record;
    const res = await admin.patch(`/api/collars/${collar.id}`, { rev: collar.rev, treatmentId: trenched.id });
    expect([res.status, res.body.record.treatmentId]).toEqual([200, trenched.id]);
    const plotLevel = await admin.patch(`/api/collars/${collar.id}`, { rev: res.body.record.rev, treatmentId: layout.treatment.id });
    expect([plotLevel.status, plotLevel.body.error.fields]).toEqual([
      400,
      [
        {
          path: 'treatmentId',
          message: 'Treatment CTRL is applied to whole plots; a collar takes only a treatment applied to single collars',
        },
      ],
    ]);
    const other = await makeLayout(admin);
    const foreign = await admin.patch(`/api/collars/${collar.id}`, { rev: res.body.record.rev, treatmentId: other.treatment.id });
    expect(foreign.status).toBe(400);
    // The same rule on create (REST and sync share the write path).
    const created = await admin.post('/api/collars', {
      siteId,
      code: 'C2',
      plotId: layout.plots[0].id,
      diameterCm: 20,
      treatmentId: layout.treatment.id,
    });
    expect([created.status, created.body.error?.fields?.[0]?.path]).toEqual([400, 'treatmentId']);
  });
});
