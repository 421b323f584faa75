import { randomUUID } from 'node:crypto';
import { TABLES } from '../../server/results/export-schema';
import { probeRows, visitMeanRows } from '../../server/results/export-rows';
import { siteResults } from '../../server/results/results-service';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * Fluxes along the design and the exports take a visit's soil temperature and moisture as the mean
 * of its probe replicates, with SD and n beside it; a temperature more than the shared tolerance
 * (±1 cm) from the site's probe depth (5 cm here) is counted and flagged, never averaged in.
 */
describe("results use the mean of a visit's probe replicates", () => {
  let t: TestApp;
  let lead: Session, crew: Session;
  let w: World;

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lab = await signIn(t.app, demoEmail('lab'));
    const hl = await makeUser(admin, ['lead'], []);
    lead = await signIn(t.app, hl.email);
    w = await buildWorld({ admin, lead, lab }, hl.id, `rr${randomUUID().slice(0, 6)}`);
    crew = await signIn(t.app, (await makeUser(admin, ['crew'], [w.site.id])).email);
    expect((await lead.delete(`/api/probe-readings/${w.probeReading.id}`)).status).toBe(200);
    const at = { siteId: w.site.id, visitId: w.visit.id, collarId: w.collar.id, campaignId: w.campaign.id, moistureKind: 'vwc' };
    const replicates = [
      { takenAt: '2026-06-01T08:05:00Z', moistureRaw: 20, soilTemps: [{ depthCm: 5, tempC: 10 }] },
      { takenAt: '2026-06-01T08:05:30Z', moistureRaw: 22, soilTemps: [{ depthCm: 5.5, tempC: 12 }] },
      { takenAt: '2026-06-01T08:06:00Z', moistureRaw: 24, soilTemps: [{ depthCm: 10, tempC: 4 }] },
    ];
    const pushed = await crew.post('/api/sync/push', {
      deviceId: randomUUID(),
      outboxSize: 3,
      ops: replicates.map((r) => ({
        opId: randomUUID(),
        entity: 'probeReading',
        id: randomUUID(),
        baseRev: null,
        op: 'upsert',
        fields: { ...at, ...r },
      })),
    });
    expect(pushed.body.results.map((r: { status: string }) => r.status)).toEqual(['applied', 'applied', 'applied']);
  });
  afterAll(() => t.close());

  it('when a visit has three replicates, one temperature at 10 cm, then its mean VWC is over three and its temperature over the two at 5 ± 1 cm', async () => {
    const r = await siteResults(t.ds, w.site.id, 'not-rejected');
    const v = r.aggregate.visitMeans.find((m) => m.visitId === w.visit.id)!;
    expect(v.vwcPct).toBe(22);
    expect(v.soilTempC).toBe(11);
    // Sample SD (n − 1): VWC √((4 + 0 + 4) / 2) = 2; temperature √((1 + 1) / 1) = √2.
    expect(v.probe).toEqual({ vwcSdPct: 2, vwcN: 3, soilTempSdC: Math.sqrt(2), soilTempN: 2, offDepthN: 1 });
  });

  it('when visit means are exported, then mean, SD and n of the replicates stand in named columns', async () => {
    const r = await siteResults(t.ds, w.site.id, 'not-rejected');
    const names = TABLES.find((x) => x.name === 'visit_means')!.fields.map((f) => f.name);
    const rows: Record<string, unknown>[] = [];
    for await (const row of visitMeanRows(r)) rows.push(Object.fromEntries(names.map((n, i) => [n, row[i]])));
    expect(rows.find((x) => x['visit_id'] === w.visit.id)).toMatchObject({
      soil_temp_c: 11,
      soil_temp_sd_c: Math.sqrt(2),
      soil_temp_n: 2,
      soil_temp_off_depth_n: 1,
      vwc_pct: 22,
      vwc_sd_pct: 2,
      vwc_n: 3,
    });
  });

  it('when probe readings are exported, then each replicate is a row and the one off the probe depth carries soil-temp-off-depth', async () => {
    // Source rows hold UTC times only; the writer adds the *_local twins.
    const names = TABLES.find((x) => x.name === 'probe_readings')!
      .fields.filter((f) => !f.localOf)
      .map((f) => f.name);
    const rows: Record<string, unknown>[] = [];
    for await (const row of probeRows(t.ds, w.site.id, { depthCm: 5, toleranceCm: 1 }))
      rows.push(Object.fromEntries(names.map((n, i) => [n, row[i]])));
    const mine = rows.filter((r) => r['visit_id'] === w.visit.id);
    // 5.5 cm is within ±1 cm of 5 cm, so its temperature is the row's soil_temp_c; 10 cm is not.
    expect(mine.map((r) => [r['vwc_pct'], r['soil_temp_c'], r['flags']])).toEqual([
      [20, 10, ''],
      [22, 12, ''],
      [24, null, 'soil-temp-off-depth'],
    ]);
  });
});
