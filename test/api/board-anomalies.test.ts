import { randomUUID } from 'node:crypto';
import { FLAG_ADVICE } from '../../shared/flux/flag-advice';
import { collarSettling, newestDisturbance, siteSettlingLimits } from '../../shared/model/collar-settling';
import { localDay } from '../../shared/time/site-time';
import { findAnomalies } from '../../server/board/anomalies';
import { listDevices } from '../../server/board/devices';
import { DEMO_SITE_ID, makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const NOW = new Date('2026-07-20T12:00:00Z');

describe('Board: anomalies and devices', () => {
  let t: TestApp;
  let lead: Session;
  let crew: Session;
  let admin: Session;
  let w: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  const ids: Record<string, string> = {};
  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    crew = await signIn(t.app, demoEmail('crew'));
    w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    const site = w.site.id;
    await admin.post('/api/chamber-profiles', {
      siteId: site,
      name: 'Dark 20 cm',
      validFrom: '2026-01-01',
      chamberVolumeCm3: 4000,
      loopVolumeCm3: 150,
    });
    const collar = async (code: string) =>
      (await lead.post('/api/collars', { siteId: site, code, plotId: w.plot.id, diameterCm: 20 })).body.record.id as string;
    ids['c1'] = w.collar.id;
    ids['c2'] = await collar('C2');
    ids['c3'] = await collar('C3');
    const camp = async (name: string, day: string) =>
      (await lead.post('/api/campaigns', { siteId: site, name, startsOn: day, endsOn: day, rounds: 1 })).body.record.id as string;
    ids['june'] = await camp('June', '2026-06-15');
    ids['july'] = await camp('July', '2026-07-15');
    const visit = async (campaignId: string, collarId: string, day: string) =>
      (
        await lead.post('/api/visits', {
          siteId: site,
          campaignId,
          round: 1,
          collarId,
          arrivedAt: `${day}T09:00:00Z`,
        })
      ).body.record.id as string;
    const offsets = async (campaignId: string, collarId: string, day: string, readingsCm: number[]) => {
      const visitId = await visit(campaignId, collarId, day);
      const res = await lead.post('/api/offset-sets', {
        siteId: site,
        visitId,
        collarId,
        campaignId,
        takenAt: `${day}T09:02:00Z`,
        readingsCm,
      });
      if (res.status !== 201) throw new Error(JSON.stringify(res.body));
      return { visitId, id: res.body.record.id as string };
    };
    await offsets(ids['june'], ids['c1'], '2026-06-15', [2.0, 2.0, 2.0]);
    // C1 rose 1.5 cm since June (site limit 1 cm); its rim is level (range 0.2 cm ≈ 1.2 % of the headspace).
    const c1 = await offsets(ids['july'], ids['c1'], '2026-07-15', [3.6, 3.4, 3.5, 3.5]);
    ids['c1Offset'] = c1.id;
    // C2: readings 1–3 cm span 2 cm × 314 cm² = 628 cm³ of a 4 778 cm³ headspace ≈ 13 % (limit 3 %).
    const c2 = await offsets(ids['july'], ids['c2'], '2026-07-15', [1.0, 3.0, 2.0]);
    ids['c2Offset'] = c2.id;
    // A closure whose CO2 falls: the engine flags it negative-flux.
    const tS = Array.from({ length: 120 }, (_, i) => i);
    const closure = await lead.post('/api/closures', {
      siteId: site,
      visitId: c1.visitId,
      collarId: ids['c1'],
      campaignId: ids['july'],
      startedAt: '2026-07-15T09:05:00Z',
      settleS: 20,
      series: {
        tS,
        co2Ppm: tS.map((s) => 480 - 0.5 * s),
        h2oMmolMol: tS.map(() => 12),
        pressureKpa: tS.map(() => 97),
        tempC: tS.map(() => 18),
      },
    });
    if (closure.status !== 201) throw new Error(JSON.stringify(closure.body));
    ids['closure'] = closure.body.record.id;
    await lead.post('/api/collar-events', { siteId: site, collarId: ids['c2'], kind: 'reseated', date: '2026-07-18', note: 'Frost heave' });
    const analyzer = (await admin.post('/api/analyzers', { siteId: site, name: 'Unit B', calibrationIntervalDays: 180 })).body.record.id;
    ids['analyzer'] = analyzer;
    await lead.post('/api/analyzer-checks', {
      siteId: site,
      analyzerId: analyzer,
      kind: 'calibration',
      at: '2026-01-01T08:00:00Z',
      passed: true,
    });
    const leak = await lead.post('/api/analyzer-checks', {
      siteId: site,
      analyzerId: analyzer,
      kind: 'leak',
      at: '2026-07-15T07:30:00Z',
      skipped: true,
      skipReason: 'Sealed plate left at the station',
    });
    ids['leak'] = leak.body.record.id;
  });
  afterAll(() => t.close());

  it('when anomalies are asked for the July campaign, then each planted problem is reported once with the site threshold', async () => {
    const { campaignId, items } = await findAnomalies(t.ds, w.site.id, { campaignId: ids['july'], now: NOW, notVisitedDays: 30 });
    expect(campaignId).toBe(ids['july']);
    const pick = (kind: string) => items.filter((a) => a.kind === kind);
    expect(pick('offset-moved')).toEqual([
      expect.objectContaining({ collarId: ids['c1'], recordId: ids['c1Offset'], value: 1.5, threshold: 1, severity: 'problem' }),
    ]);
    expect(pick('offset-spread')).toEqual([expect.objectContaining({ collarId: ids['c2'], recordId: ids['c2Offset'], threshold: 3 })]);
    expect(pick('offset-spread')[0].value).toBeCloseTo(13.1, 1); // 2 × 100π / (4150 + 100π × 2) × 100
    expect(pick('closure-flag')).toEqual([expect.objectContaining({ recordId: ids['closure'], collarCode: 'C1' })]);
    // The lead reads the flag in words (shared/flux/flag-advice.ts); the code rides along for lab staff.
    expect(pick('closure-flag')[0].message).toBe(`Closure flagged: ${FLAG_ADVICE['negative-flux'].words}`);
    expect(pick('closure-flag')[0].flags).toEqual(['negative-flux']);
    // Reseated on 18 July, asked at noon on 20 July: two whole site days (shared/model/collar-settling.ts).
    expect(pick('settling')).toEqual([expect.objectContaining({ collarId: ids['c2'], severity: 'warn', value: 2, threshold: 7 })]);
    expect(pick('not-visited')).toEqual([expect.objectContaining({ collarId: ids['c3'], message: 'Never visited' })]);
    expect(pick('check-problem')).toEqual([expect.objectContaining({ recordId: ids['leak'], severity: 'warn' })]);
    expect(pick('check-problem')[0].message).toBe('leak check skipped on Unit B: Sealed plate left at the station');
    expect(pick('calibration-overdue')).toEqual([expect.objectContaining({ recordId: ids['analyzer'], value: 200, threshold: 180 })]);
  });

  it('when the site is west of UTC, then a settling collar counts site days from its install day, and that day reads as the site’s', async () => {
    await t.ds.query(`UPDATE site SET timezone = 'America/Anchorage' WHERE id = $1`, [w.site.id]);
    try {
      const { items } = await findAnomalies(t.ds, w.site.id, { campaignId: ids['july'], now: NOW, notVisitedDays: 30 });
      const settling = items.find((a) => a.kind === 'settling')!;
      // Midnight of 18 July in Anchorage is 08:00 UTC (AKDT, UTC−8, tz database); 20 July 12:00 UTC is 04:00 on
      // 20 July there: two whole site days.
      expect(settling.at).toBe('2026-07-18T08:00:00.000Z');
      expect(localDay(settling.at!, 'America/Anchorage')).toBe('2026-07-18');
      expect(settling.value).toBe(2);
    } finally {
      await t.ds.query(`UPDATE site SET timezone = 'UTC' WHERE id = $1`, [w.site.id]);
    }
  });

  it('when a collar was installed late the evening before, then next morning the Board counts the same whole site days as Walk', async () => {
    // Berlin is UTC+2 in July: installed at 23:00 on 19 July (21:00 UTC), checked at 08:00 on 20 July (06:00 UTC).
    await t.ds.query(`UPDATE site SET timezone = 'Europe/Berlin' WHERE id = $1`, [w.site.id]);
    const c4 = (await lead.post('/api/collars', { siteId: w.site.id, code: 'C4', plotId: w.plot.id, diameterCm: 20 })).body.record;
    const installed = { kind: 'installed', date: '2026-07-19' };
    await lead.post('/api/collar-events', { siteId: w.site.id, collarId: c4.id, ...installed, note: 'Late delivery' });
    try {
      const morning = new Date('2026-07-20T06:00:00Z');
      const { items } = await findAnomalies(t.ds, w.site.id, { campaignId: ids['july'], now: morning, notVisitedDays: 30 });
      const board = items.find((a) => a.kind === 'settling' && a.collarId === c4.id)!;
      // Walk's visit screen says what this shared rule says (walk/visit-store.ts settlingNote).
      const walk = collarSettling(newestDisturbance([installed], c4.installedOn), siteSettlingLimits.parse({}), 'Europe/Berlin', morning)!;
      expect(walk.days).toBe(1);
      expect(board.value).toBe(walk.days);
      expect(board.severity).toBe('warn');
      expect(board.message).toBe('Settling: installed 1 day ago (hard limit 1, warning 7 days)');
    } finally {
      expect((await lead.delete(`/api/collars/${c4.id}?rev=${c4.rev}`)).status).toBeLessThan(300);
      await t.ds.query(`UPDATE site SET timezone = 'UTC' WHERE id = $1`, [w.site.id]);
    }
  });

  it('when the same anomalies are asked a year later, then every collar counts as not visited and settling is over', async () => {
    const { items } = await findAnomalies(t.ds, w.site.id, {
      campaignId: ids['july'],
      now: new Date('2027-07-20T12:00:00Z'),
      notVisitedDays: 30,
    });
    expect(
      items
        .filter((a) => a.kind === 'not-visited')
        .map((a) => a.collarCode)
        .sort(),
    ).toEqual(['C1', 'C2', 'C3']);
    expect(items.filter((a) => a.kind === 'settling')).toEqual([]);
  });

  it('when the lead asks over HTTP, then the latest campaign is used; the crew gets 403 and another site stays closed', async () => {
    const res = await lead.get(`/api/sites/${w.site.id}/anomalies?days=30`);
    expect(res.status).toBe(200);
    expect(res.body.campaignId).toBe(ids['july']);
    expect(res.body.items.some((a: { kind: string }) => a.kind === 'offset-moved')).toBe(true);
    expect((await crew.get(`/api/sites/${w.site.id}/anomalies`)).status).toBe(403);
    const other = (await admin.post('/api/sites', { name: `Elsewhere ${randomUUID().slice(0, 6)}`, timezone: 'UTC', elevationM: 100 })).body
      .record.id;
    expect((await lead.get(`/api/sites/${other}/anomalies`)).status).toBe(403);
  });

  it('when devices push and pull, then the lead sees each with its outbox size and the silent one marked', async () => {
    const busy = randomUUID();
    const quiet = randomUUID();
    await crew.post('/api/sync/push', { deviceId: busy, outboxSize: 7, ops: [] });
    await crew.post('/api/sync/push', { deviceId: quiet, outboxSize: 3, ops: [] });
    await t.ds.query(`UPDATE device SET last_push_at = now() - interval '30 hours' WHERE id = $1`, [quiet]);
    const res = await lead.get(`/api/sites/${DEMO_SITE_ID}/devices`);
    expect(res.status).toBe(200);
    const mine = res.body.items.filter((d: { id: string }) => d.id === busy || d.id === quiet);
    // Least recently heard from first.
    expect(mine.map((d: { id: string }) => d.id)).toEqual([quiet, busy]);
    expect(mine[0]).toMatchObject({ email: 'crew@fluxwalk.example', outboxSize: 3, silent: true, lastPullAt: null });
    expect(mine[1]).toMatchObject({ displayName: 'Rowan Ashby', outboxSize: 7, silent: false });
    expect((await crew.get(`/api/sites/${DEMO_SITE_ID}/devices`)).status).toBe(403);
    const direct = await listDevices(t.ds, [w.site.id]);
    expect(direct.some((d) => d.id === busy)).toBe(false); // the crew user is not a member of the fresh site
  });
});
