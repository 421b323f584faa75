import { randomUUID } from 'node:crypto';
import { findAnomalies } from '../../server/board/anomalies';
import { DEMO_SITE_ID, makeSiteWithCollar } from '../support/fixtures';
import { makeUser } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const NOW = new Date('2026-07-20T12:00:00Z');

/** A calibration as the crew records it at the car: zero on scrubbed air, span on a 1000 µmol/mol cylinder. */
const calibration = (siteId: string, analyzerId: string, at: string, spanBeforePpm: number, extra: Record<string, unknown> = {}) => ({
  siteId,
  analyzerId,
  kind: 'calibration',
  at,
  passed: true,
  zeroGasPpm: 0,
  zeroCylinder: null,
  zeroBeforePpm: 1.5,
  zeroAfterPpm: 0.2,
  spanGasPpm: 1000,
  spanCylinder: 'CYL-4471',
  spanBeforePpm,
  spanAfterPpm: 1000.6,
  note: 'Zero on the soda-lime column',
  ...extra,
});

describe('Analyzer calibrations: recorded by the crew, judged on the Board', () => {
  let t: TestApp;
  let admin: Session;
  let lead: Session;
  let crew: Session;
  let siteId: string;
  const analyzer: Record<string, string> = {};
  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    const w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    siteId = w.site.id;
    // A crew member of its own: the demo crew's memberships stay as seeded for other test files.
    crew = await signIn(t.app, (await makeUser(admin, ['crew'], [siteId])).email);
    for (const name of ['Calibrated', 'Overdue', 'Never', 'Drifted']) {
      analyzer[name] = (await admin.post('/api/analyzers', { siteId, name: `Unit ${name}`, calibrationIntervalDays: 180 })).body.record.id;
    }
    await lead.post('/api/analyzer-checks', calibration(siteId, analyzer['Overdue']!, '2026-01-01T08:00:00Z', 1004));
  });
  afterAll(() => t.close());

  const push = (s: Session, ops: unknown[]) => s.post('/api/sync/push', { deviceId: randomUUID(), outboxSize: ops.length, ops });
  const anomalies = async () => (await findAnomalies(t.ds, siteId, { now: NOW })).items.filter((a) => a.kind.startsWith('calibration'));

  it('when the crew pushes a calibration from the phone, then it is stored with who recorded it and the drift from its readings', async () => {
    const id = randomUUID();
    const res = await push(crew, [
      {
        opId: randomUUID(),
        entity: 'analyzerCheck',
        id,
        baseRev: null,
        op: 'upsert',
        fields: calibration(siteId, analyzer['Calibrated']!, '2026-07-10T06:40:00Z', 1008.4),
      },
    ]);
    expect(res.body.results[0]).toMatchObject({ status: 'applied', rev: 1 });
    const stored = (await lead.get(`/api/analyzer-checks/${id}`)).body.record;
    expect(stored).toMatchObject({
      kind: 'calibration',
      spanCylinder: 'CYL-4471',
      zeroCylinder: null,
      zeroBeforePpm: 1.5,
      spanAfterPpm: 1000.6,
      zeroDriftPpm: 1.5,
      driftPpm: 8.4,
      note: 'Zero on the soda-lime column',
    });
    const crewId = (await crew.get('/api/auth/me')).body.user.id;
    expect(stored.updatedBy).toBe(crewId);
  });

  it('when the crew posts a calibration over REST with a span gas of 0, then it is refused field by field and nothing is stored', async () => {
    const before = (await lead.get(`/api/analyzer-checks?siteId=${siteId}&analyzerId=${analyzer['Never']}`)).body.total;
    const res = await crew.post(
      '/api/analyzer-checks',
      calibration(siteId, analyzer['Never']!, '2026-07-11T06:40:00Z', 3, { spanGasPpm: 0 }),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual(
      expect.arrayContaining([{ path: 'spanGasPpm', message: 'The span gas concentration must be above 0 µmol/mol' }]),
    );
    expect((await lead.get(`/api/analyzer-checks?siteId=${siteId}&analyzerId=${analyzer['Never']}`)).body.total).toBe(before);
  });

  it('when calibrations are on record, then the Board reports only the overdue and the never-calibrated analyzers', async () => {
    const overdue = (await anomalies()).filter((a) => a.kind === 'calibration-overdue');
    expect(overdue.map((a) => [a.recordId, a.value, a.threshold]).sort()).toEqual(
      [
        [analyzer['Never'], null, 180],
        [analyzer['Overdue'], 200, 180],
        [analyzer['Drifted'], null, 180],
      ].sort(),
    );
    expect(overdue.find((a) => a.recordId === analyzer['Overdue'])!.message).toBe(
      'Unit Overdue: last calibrated 200 days ago (interval 180 days)',
    );
  });

  it("when the admin lengthens an analyzer's interval in Setup, then its calibration is no longer overdue", async () => {
    const a = (await admin.get(`/api/analyzers/${analyzer['Overdue']}`)).body.record;
    expect((await admin.patch(`/api/analyzers/${a.id}`, { rev: a.rev, calibrationIntervalDays: 365 })).status).toBe(200);
    expect((await anomalies()).some((x) => x.recordId === analyzer['Overdue'])).toBe(false);
  });

  it('when a calibration finds the span 35 µmol/mol off a 1000 µmol/mol gas, then the Board raises a drift problem against the site limit', async () => {
    const res = await crew.post('/api/analyzer-checks', calibration(siteId, analyzer['Drifted']!, '2026-07-18T06:30:00Z', 1035));
    expect(res.status).toBe(201);
    const found = await anomalies();
    expect(found.some((a) => a.kind === 'calibration-overdue' && a.recordId === analyzer['Drifted'])).toBe(false);
    const drift = found.filter((a) => a.kind === 'calibration-drift');
    expect(drift).toEqual([expect.objectContaining({ recordId: res.body.record.id, severity: 'problem', value: 3.5, threshold: 2 })]);
    expect(drift[0]!.message).toBe(
      'Unit Drifted: drift found at calibration on 2026-07-18 was zero +1.5 µmol/mol, span +35 µmol/mol ' +
        '(3.5 % of the 1000 µmol/mol span gas, limit 2 %): check the closures since the calibration before it',
    );
  });

  it("when the site limit is raised above the drift, then the drift problem goes; a lead's correction of the reading recomputes the drift", async () => {
    const site = (await admin.get(`/api/sites/${siteId}`)).body.record;
    expect((await admin.patch(`/api/sites/${siteId}`, { rev: site.rev, calibrationDriftLimitPct: 4 })).status).toBe(200);
    expect((await anomalies()).filter((a) => a.kind === 'calibration-drift')).toEqual([]);
    const [check] = (await lead.get(`/api/analyzer-checks?siteId=${siteId}&analyzerId=${analyzer['Drifted']}`)).body.items;
    const fixed = await lead.patch(`/api/analyzer-checks/${check.id}`, { rev: check.rev, spanBeforePpm: 1052 });
    expect(fixed.status).toBe(200);
    expect(fixed.body.record.driftPpm).toBe(52);
    expect((await anomalies()).filter((a) => a.kind === 'calibration-drift').map((a) => a.value)).toEqual([5.2]);
  });

  it('when the Board is asked over HTTP, then a calibrated analyzer is absent from the calibration anomalies', async () => {
    const res = await lead.get(`/api/sites/${siteId}/anomalies`);
    expect(res.status).toBe(200);
    const ids = res.body.items
      .filter((a: { kind: string }) => a.kind === 'calibration-overdue')
      .map((a: { recordId: string }) => a.recordId);
    expect(ids).toContain(analyzer['Never']);
    expect(ids).not.toContain(analyzer['Calibrated']);
  });
});

describe('Bench: the calibration behind each closure', () => {
  let t: TestApp;
  let lab: Session;
  beforeAll(async () => {
    t = await startTestApp();
    lab = await signIn(t.app, demoEmail('lab'));
  });
  afterAll(() => t.close());

  it('when the lab reads the queue, then each closure carries the age, interval and drift against the site limit of the calibration before it', async () => {
    const res = await lab.get(`/api/bench/queue?siteId=${DEMO_SITE_ID}&limit=200`);
    expect(res.status).toBe(200);
    expect(res.body.items.length).toBeGreaterThan(0);
    // The demo analyzer (interval 180 days) was calibrated on 30 March (largest drift 3.1 µmol/mol of 1000) and 6 July (4.6 of 1000).
    for (const q of res.body.items) {
      const after = q.startedAt >= '2026-07-06T08:00:00.000Z';
      const from = after ? '2026-07-06' : '2026-03-30';
      // Site days (the queue's `day`), as the crew counts them.
      const age = Math.round((Date.parse(q.day) - Date.parse(from)) / 86_400_000);
      expect([q.calibrationAgeDays, q.calibrationIntervalDays, q.calibrationDriftPct, q.calibrationDriftLimitPct]).toEqual([
        age,
        180,
        after ? 0.46 : 0.31,
        2,
      ]);
    }
  });
});
