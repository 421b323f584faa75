import { randomUUID } from 'node:crypto';
import Papa from 'papaparse';
import { reportProgress } from '../../server/jobs/job-store';
import { tablesForSite } from '../../server/results/export-schema';
import { runResultsExport, type ExportRequest } from '../../server/results/results-export';
import { siteResults } from '../../server/results/results-service';
import { readZip } from '../support/read-zip';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * The soil-temperature depth tolerance is a site setting: a temperature within it of the site's
 * probe depth (5 cm here) counts in the visit mean, one further off is flagged and left out. Results
 * read the site's value when they are built; fluxes do not depend on it, so nothing is recomputed.
 */
describe('a site sets how far a soil temperature may sit from its probe depth', () => {
  let t: TestApp;
  let admin: Session, lead: Session, crew: Session, lab: Session;
  let w: World;

  const visitMean = async () =>
    (await siteResults(t.ds, w.site.id, 'not-rejected')).aggregate.visitMeans.find((m) => m.visitId === w.visit.id)!;
  const site = async () => (await admin.get(`/api/sites/${w.site.id}`)).body.record;

  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const hl = await makeUser(admin, ['lead'], []);
    lead = await signIn(t.app, hl.email);
    w = await buildWorld({ admin, lead, lab }, hl.id, `tt${randomUUID().slice(0, 6)}`);
    crew = await signIn(t.app, (await makeUser(admin, ['crew'], [w.site.id])).email);
    expect((await lead.delete(`/api/probe-readings/${w.probeReading.id}`)).status).toBe(200);
    const at = {
      siteId: w.site.id,
      visitId: w.visit.id,
      collarId: w.collar.id,
      campaignId: w.campaign.id,
      moistureKind: 'vwc',
      moistureRaw: 20,
    };
    const replicates = [
      { takenAt: '2026-06-01T08:05:00Z', soilTemps: [{ depthCm: 5, tempC: 10 }] },
      { takenAt: '2026-06-01T08:05:30Z', soilTemps: [{ depthCm: 6.5, tempC: 14 }] },
    ];
    const pushed = await crew.post('/api/sync/push', {
      deviceId: randomUUID(),
      outboxSize: 2,
      ops: replicates.map((r) => ({
        opId: randomUUID(),
        entity: 'probeReading',
        id: randomUUID(),
        baseRev: null,
        op: 'upsert',
        fields: { ...at, ...r },
      })),
    });
    expect(pushed.body.results.map((r: { status: string }) => r.status)).toEqual(['applied', 'applied']);
  });
  afterAll(() => t.close());

  it('when a site says nothing, then its tolerance is 1 cm and a temperature 1.5 cm off the probe depth is left out of the mean', async () => {
    expect((await site()).tempDepthToleranceCm).toBe(1);
    const v = await visitMean();
    expect(v.soilTempC).toBe(10);
    expect(v.probe).toMatchObject({ soilTempN: 1, offDepthN: 1 });
  });

  it('when the site sets 2 cm, then the temperature 1.5 cm off counts in the visit mean, and no closure is recomputed', async () => {
    const s = await site();
    const res = await admin.patch(`/api/sites/${w.site.id}`, { rev: s.rev, tempDepthToleranceCm: 2 });
    expect(res.status).toBe(200);
    expect(res.body.record.tempDepthToleranceCm).toBe(2);
    const v = await visitMean();
    expect(v.soilTempC).toBe(12);
    expect(v.probe).toMatchObject({ soilTempN: 2, offDepthN: 0 });
    const jobs = await t.ds.query(`SELECT id FROM job_outbox WHERE data->>'siteId' = $1 AND data->>'reason' = 'site defaults changed'`, [
      w.site.id,
    ]);
    expect(jobs).toEqual([]);
  });

  it("when the export describes its columns, then it states the site's tolerance", () => {
    const visitMeans = tablesForSite({ timezone: 'UTC', tempDepthToleranceCm: 2 }).find((x) => x.name === 'visit_means')!;
    const desc = visitMeans.fields
      .filter((f) => f.name.startsWith('soil_temp'))
      .map((f) => f.description)
      .join(' ');
    expect(desc).toContain('±2 cm');
    expect(desc).not.toContain('±1 cm');
  });

  it("when the site's results are exported after the change, then the package counts the temperature and states ±2 cm in its columns, methods and provenance", async () => {
    const asked = await lab.post('/api/results/exports', { siteId: w.site.id, closures: 'not-rejected', license: 'CC0-1.0' });
    expect(asked.status).toBe(202);
    const jobId = asked.body.jobId;
    const [outbox] = await t.ds.query(`SELECT data FROM job_outbox WHERE id = $1`, [jobId]);
    await runResultsExport(t.ds, outbox.data as ExportRequest, { jobId, progress: (d, n) => reportProgress(t.ds, jobId, d, n) });
    const file = await lab
      .get(`/api/results/exports/${jobId}/file`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    const files = await readZip(file.body as Buffer);
    const probes = Papa.parse<Record<string, string>>(files.get('data/probe_readings.csv')!.toString('utf8'), {
      header: true,
      skipEmptyLines: true,
    }).data;
    expect(probes.filter((r) => r['visit_id'] === w.visit.id).map((r) => [r['soil_temp_c'], r['flags']])).toEqual([
      ['10', ''],
      ['14', ''],
    ]);
    const eml = files.get('metadata.eml.xml')!.toString('utf8');
    expect(eml).toContain(
      "temperatures more than ±2 cm (the site's depth tolerance) from the response depth are flagged soil-temp-off-depth",
    );
    const pkg = JSON.parse(files.get('datapackage.json')!.toString('utf8'));
    const visitMeans = pkg.resources.find((r: { name: string }) => r.name === 'visit_means');
    expect(visitMeans.schema.fields.find((f: { name: string }) => f.name === 'soil_temp_off_depth_n').description).toContain('±2 cm');
    expect(JSON.parse(files.get('provenance.json')!.toString('utf8')).site.tempDepthToleranceCm).toBe(2);
  });

  it('when a lead (not an admin) sets the tolerance, then it is refused and the value stays', async () => {
    const s = await site();
    expect((await lead.patch(`/api/sites/${w.site.id}`, { rev: s.rev, tempDepthToleranceCm: 3 })).status).toBe(403);
    expect((await site()).tempDepthToleranceCm).toBe(2);
  });

  it.each([
    [11, 'Temperature depth tolerance must be at most 10 cm'],
    [-1, 'Temperature depth tolerance must be at least 0 cm'],
  ])('when the tolerance is %p cm, then it is refused with a clear message and nothing stored changes', async (value, message) => {
    const s = await site();
    const bad = await admin.patch(`/api/sites/${w.site.id}`, { rev: s.rev, tempDepthToleranceCm: value });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual(expect.arrayContaining([{ path: 'tempDepthToleranceCm', message }]));
    const after = await site();
    expect(after.rev).toBe(s.rev);
    expect(after.tempDepthToleranceCm).toBe(2);
    expect((await visitMean()).soilTempC).toBe(12);
  });
});
