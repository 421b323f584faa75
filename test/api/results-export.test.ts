import Papa from 'papaparse';
import { reportProgress } from '../../server/jobs/job-store';
import { runResultsExport, type ExportRequest } from '../../server/results/results-export';
import { readZip } from '../support/read-zip';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';
import { handTreatmentMeans, type HandRow } from './results-hand-calculation';

// fast-xml-parser 3 ships with the local S3 fake used by the tests; only its parser and well-formedness check are used.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const xml = require('fast-xml-parser') as { validate(x: string): true | { err: { msg: string } }; parse(x: string, o: object): any };

type Row = Record<string, string>;
const TYPES = ['string', 'number', 'integer', 'boolean', 'date', 'datetime'];

/** Table Schema rules (frictionlessdata.io/specs/table-schema, v1) checked by hand: the validator package is not installed here. */
function checkTable(resource: any, rows: Row[], header: string[], tables: Map<string, Row[]>): string[] {
  const problems: string[] = [];
  const fields = resource.schema.fields as { name: string; type: string; constraints?: { required?: boolean } }[];
  if (JSON.stringify(header) !== JSON.stringify(fields.map((f) => f.name))) problems.push(`${resource.name}: header ≠ schema fields`);
  for (const f of fields) {
    if (!TYPES.includes(f.type)) problems.push(`${resource.name}.${f.name}: type ${f.type}`);
    if (!/^[a-z][a-z0-9_]*$/.test(f.name)) problems.push(`${resource.name}.${f.name}: name`);
  }
  const cast: Record<string, (v: string) => boolean> = {
    string: () => true,
    number: (v) => Number.isFinite(Number(v)),
    integer: (v) => /^-?\d+$/.test(v),
    boolean: (v) => v === 'true' || v === 'false',
    date: (v) => /^\d{4}-\d{2}-\d{2}$/.test(v) && !Number.isNaN(Date.parse(v)),
    datetime: (v) => /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?(Z|[+-]\d{2}:\d{2})$/.test(v),
  };
  rows.forEach((r, i) => {
    for (const f of fields) {
      const v = r[f.name];
      if (v === '' || v === undefined) {
        if (f.constraints?.required) problems.push(`${resource.name} row ${i}: ${f.name} required`);
        continue;
      }
      if (!cast[f.type](v)) problems.push(`${resource.name} row ${i}: ${f.name} = "${v}" is not a ${f.type}`);
    }
  });
  const pk = resource.schema.primaryKey as string[] | undefined;
  if (pk) {
    const keys = rows.map((r) => pk.map((k) => r[k]).join('|'));
    if (new Set(keys).size !== keys.length) problems.push(`${resource.name}: primary key not unique`);
  }
  for (const fk of (resource.schema.foreignKeys ?? []) as { fields: string[]; reference: { resource: string; fields: string[] } }[]) {
    const target = new Set(tables.get(fk.reference.resource)!.map((r) => r[fk.reference.fields[0]]));
    const bad = rows.filter((r) => r[fk.fields[0]] !== '' && !target.has(r[fk.fields[0]]));
    if (bad.length) problems.push(`${resource.name}.${fk.fields[0]}: ${bad.length} values not in ${fk.reference.resource}`);
  }
  return problems;
}

const asArray = <T>(x: T | T[] | undefined): T[] => (x === undefined ? [] : Array.isArray(x) ? x : [x]);

describe('Bench results export: data package, EML, provenance, re-import', () => {
  let t: TestApp;
  let lab: Session, crew: Session;
  let files: Map<string, Buffer>;
  let pkg: any;
  const tables = new Map<string, Row[]>();
  const headers = new Map<string, string[]>();

  beforeAll(async () => {
    t = await startTestApp();
    [lab, crew] = await Promise.all((['lab', 'crew'] as const).map((r) => signIn(t.app, demoEmail(r))));
    const asked = await lab.post('/api/results/exports', { siteId: DEMO_SITE_ID, closures: 'not-rejected', license: 'CC0-1.0' });
    expect(asked.status).toBe(202);
    const jobId = asked.body.jobId;
    // The request is a job in the outbox; run it as a worker would, with the data it stored and its progress reports.
    const [outbox] = await t.ds.query(`SELECT data FROM job_outbox WHERE id = $1`, [jobId]);
    await runResultsExport(t.ds, outbox.data as ExportRequest, { jobId, progress: (d, n) => reportProgress(t.ds, jobId, d, n) });
    const job = (await lab.get(`/api/results/exports/${jobId}`)).body.job;
    expect(job.total).toBeGreaterThan(0);
    expect(job.done).toBe(job.total);
    const file = await lab
      .get(`/api/results/exports/${jobId}/file`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(file.status).toBe(200);
    expect(file.headers['content-type']).toBe('application/zip');
    files = await readZip(file.body as Buffer);
    pkg = JSON.parse(files.get('datapackage.json')!.toString('utf8'));
    for (const r of pkg.resources.filter((x: any) => x.format === 'csv')) {
      const parsed = Papa.parse<Row>(files.get(r.path)!.toString('utf8'), { header: true, skipEmptyLines: true });
      tables.set(r.name, parsed.data);
      headers.set(r.name, parsed.meta.fields ?? []);
    }
  });
  afterAll(() => t.close());

  it('when the package is read, then every CSV passes the table-schema rules: header, types, required, keys', () => {
    expect(pkg.profile).toBe('data-package');
    expect(pkg.resources.map((r: any) => r.path)).toEqual(
      expect.arrayContaining(['data/closures.csv', 'data/closure_series.csv', 'provenance.json', 'metadata.eml.xml']),
    );
    const problems = pkg.resources
      .filter((r: any) => r.format === 'csv')
      .flatMap((r: any) => checkTable(r, tables.get(r.name)!, headers.get(r.name)!, tables));
    expect(problems).toEqual([]);
    for (const r of pkg.resources.filter((x: any) => x.format === 'csv')) {
      expect(r['fluxwalk:rows']).toBe(tables.get(r.name)!.length);
      for (const f of r.schema.fields) if (f.type === 'number') expect([r.name, f.name, typeof f.unit]).toEqual([r.name, f.name, 'string']);
    }
    const flux = pkg.resources.find((r: any) => r.name === 'closures').schema.fields.find((f: any) => f.name === 'flux_umol_m2_s');
    expect(flux.unit).toBe('umol m-2 s-1');
  });

  it('when closures, visits and collars are re-imported, then the hand calculation gives the exported and the served treatment means', async () => {
    const visits = new Map(tables.get('visits')!.map((v) => [v.visit_id, v]));
    const collars = new Map(tables.get('collars')!.map((c) => [c.collar_id, c]));
    const rows: HandRow[] = tables
      .get('closures')!
      .filter((k) => k.review_state !== 'rejected' && k.flux_umol_m2_s !== '' && visits.get(k.visit_id)!.skipped === 'false')
      .map((k) => {
        const v = visits.get(k.visit_id)!;
        const c = collars.get(v.collar_id)!;
        return {
          closureId: k.closure_id,
          flux: Number(k.flux_umol_m2_s),
          visitId: k.visit_id,
          collarId: v.collar_id,
          campaignId: v.campaign_id,
          plotId: c.plot_id,
          blockCode: c.block_code || null,
          plotTreatment: c.plot_treatment || null,
          collarTreatment: c.collar_treatment || null,
        };
      });
    const hand = handTreatmentMeans(rows);
    const exported = tables.get('treatment_means')!;
    expect(exported).toHaveLength(hand.size);
    for (const m of exported) {
      const h = hand.get(`${m.campaign_id}|${m.cell}`)!;
      expect(Number(m.n_plots)).toBe(h.nPlots);
      expect(Number(m.mean_flux_umol_m2_s)).toBeCloseTo(h.mean, 10);
    }
    const served = (await lab.get(`/api/results/summary?siteId=${DEMO_SITE_ID}&closures=not-rejected`)).body.cellMeans;
    for (const s of served) {
      const e = exported.find((m) => m.campaign_id === s.campaignId && m.cell === s.cellKey)!;
      expect(Number(e.mean_flux_umol_m2_s)).toBeCloseTo(s.meanUmolM2S, 10);
      if (s.seUmolM2S === null) expect(e.se_flux_umol_m2_s).toBe('');
      else expect(Number(e.se_flux_umol_m2_s)).toBeCloseTo(s.seUmolM2S, 10);
    }
  });

  it("when raw series are read back, then a closure's samples are exactly those stored with it", async () => {
    const k = tables.get('closures')![5];
    const record = (await lab.get(`/api/closures/${k.closure_id}`)).body.record;
    const samples = tables.get('closure_series')!.filter((s) => s.closure_id === k.closure_id);
    expect(samples.map((s) => Number(s.t_s))).toEqual(record.series.tS);
    expect(samples.map((s) => Number(s.co2_ppm))).toEqual(record.series.co2Ppm);
    const [{ n }] = await t.ds.query(
      `SELECT sum(jsonb_array_length(series->'tS'))::int AS n FROM closure WHERE site_id = $1 AND NOT deleted`,
      [DEMO_SITE_ID],
    );
    expect(tables.get('closure_series')!.length).toBe(n);
  });

  it("when closures are exported, then each names the slope basis of its flux, and the metadata names the site's basis", () => {
    const closures = tables.get('closures')!;
    expect(headers.get('closures')).toContain('flux_basis');
    const bases = new Set(closures.filter((k) => k.flux_umol_m2_s !== '').map((k) => k.flux_basis));
    expect([...bases]).toEqual(['closure']);
    const p = JSON.parse(files.get('provenance.json')!.toString('utf8'));
    expect(p.parameters.fluxSlopeBasis).toBe('closure');
    const eml = files.get('metadata.eml.xml')!.toString('utf8');
    expect(eml).toMatch(/slope at chamber closure \(t = 0\)/);
    expect(eml).toContain('flux_basis');
  });

  it('when calibrations.csv is read, then it holds each calibration of the season with gases, cylinder, readings and drift against the site limit', () => {
    const rows = tables.get('calibrations')!;
    const cols = [
      'calibrated_at',
      'zero_gas_ppm',
      'zero_cylinder',
      'zero_before_ppm',
      'zero_drift_ppm',
      'span_gas_ppm',
      'span_cylinder',
      'span_before_ppm',
      'span_after_ppm',
      'span_drift_ppm',
      'drift_pct',
      'drift_limit_pct',
      'over_limit',
      'passed',
      'skipped',
    ];
    // The demo's zero/span calibrations (server/seed): drift = reading before − gas; % of the 1000 µmol/mol span gas.
    expect(rows.map((r) => cols.map((c) => r[c]))).toEqual([
      [
        '2026-03-30T08:00:00.000Z',
        '0',
        '',
        '0.8',
        '0.8',
        '1000',
        'SG-1000-0417',
        '1003.1',
        '1000.2',
        '3.1',
        '0.31',
        '2',
        'false',
        'true',
        'false',
      ],
      [
        '2026-07-06T08:00:00.000Z',
        '0',
        '',
        '-1.2',
        '-1.2',
        '1000',
        'SG-1000-0417',
        '995.4',
        '1000.2',
        '-4.6',
        '0.46',
        '2',
        'false',
        'true',
        'false',
      ],
    ]);
    expect(rows.every((r) => r['analyzer_name'] === 'Analyzer A1' && r['recorded_by'] !== '')).toBe(true);
    const resource = pkg.resources.find((r: any) => r.name === 'calibrations');
    expect([resource.path, resource.schema.primaryKey]).toEqual(['data/calibrations.csv', ['calibration_id']]);
    expect(files.get('metadata.eml.xml')!.toString('utf8')).toContain('drift = reading before − gas concentration');
  });

  it('when closures are exported, then each names its chamber, analyzer, ambient reading and where its chamber air temperature came from', () => {
    const closures = tables.get('closures')!;
    for (const col of ['profile_id', 'profile_name', 'analyzer_id', 'ambient_ppm', 'air_temp_source', 'air_temp_c'])
      expect(headers.get('closures')).toContain(col);
    const fluxed = closures.filter((k) => k.flux_umol_m2_s !== '');
    expect(fluxed.length).toBeGreaterThan(0);
    expect(new Set(fluxed.map((k) => k.air_temp_source))).toEqual(new Set(['series']));
    expect(fluxed.every((k) => k.profile_id !== '' && k.profile_name !== '' && k.analyzer_id !== '')).toBe(true);
  });

  it('when the provenance is read, then it names the engine version, the parameters, who and when', () => {
    const p = JSON.parse(files.get('provenance.json')!.toString('utf8'));
    expect(p).toMatchObject({
      engineVersion: '1.1.0',
      generatedBy: { email: demoEmail('lab') },
      parameters: { closureSelection: 'not-rejected', lloydTaylorT0K: 227.13 },
    });
    // The interval over plot totals says what it includes and leaves out, in the provenance, the EML methods and the totals table's description.
    expect(p.parameters.totalInterval).toContain('Student t interval over the plots');
    expect(files.get('metadata.eml.xml')!.toString('utf8')).toContain(
      'leaves out the uncertainty of the response parameters and of the gap filling',
    );
    const totals = pkg.resources.find((r: { name: string }) => r.name === 'seasonal_totals');
    expect(totals.description).toContain('leaves out the uncertainty of the response parameters and of the gap filling');
    expect(Date.now() - Date.parse(p.generatedAt)).toBeLessThan(10 * 60_000);
    expect(pkg['fluxwalk:provenance']).toEqual(p);
  });

  it('when the EML is read, then it is well formed and has the elements EML 2.2 requires, with one attribute per CSV column', () => {
    // Required by the EML 2.2.0 schema (eml.xsd, eml-dataset.xsd, eml-dataTable.xsd, eml-attribute.xsd; KNB/NCEAS):
    // packageId and system on the root; dataset title, creator, contact; per dataTable entityName, attributeList;
    // per attribute attributeName, attributeDefinition, measurementScale. Checked by hand: no XSD validator is installed.
    const text = files.get('metadata.eml.xml')!.toString('utf8');
    expect(xml.validate(text)).toBe(true);
    const doc = xml.parse(text, { ignoreAttributes: false, attributeNamePrefix: '@_', parseNodeValue: false });
    const root = doc['eml:eml'];
    expect(root['@_xmlns:eml']).toBe('https://eml.ecoinformatics.org/eml-2.2.0');
    expect(root['@_packageId']).toMatch(/^fluxwalk-/);
    expect(root['@_system']).toBe('fluxwalk');
    const ds = root.dataset;
    expect(typeof ds.title).toBe('string');
    expect(ds.creator.individualName.surName).toBeTruthy();
    expect(ds.contact.electronicMailAddress).toBe(demoEmail('lab'));
    const units = new Set(asArray(root.additionalMetadata.metadata['stmml:unitList']['stmml:unit']).map((u: any) => u['@_id']));
    const dataTables = asArray(ds.dataTable);
    expect(dataTables.map((d: any) => d.entityName).sort()).toEqual([...headers.keys()].map((n) => `data/${n}.csv`).sort());
    for (const d of dataTables) {
      const name = d.entityName.replace(/^data\/|\.csv$/g, '');
      const attrs = asArray(d.attributeList.attribute);
      expect([name, attrs.map((a: any) => a.attributeName)]).toEqual([name, headers.get(name)]);
      expect(Number(d.numberOfRecords)).toBe(tables.get(name)!.length);
      for (const a of attrs) {
        expect(a.attributeDefinition).toBeTruthy();
        const scale = a.measurementScale;
        expect(Object.keys(scale)).toHaveLength(1);
        const kind = Object.keys(scale)[0];
        expect(['nominal', 'ratio', 'interval', 'dateTime']).toContain(kind);
        if ((kind === 'ratio' || kind === 'interval') && scale[kind].unit.customUnit)
          expect(units.has(scale[kind].unit.customUnit)).toBe(true);
      }
    }
  });

  it('when a crew member asks for an export, then it is refused', async () => {
    expect((await crew.post('/api/results/exports', { siteId: DEMO_SITE_ID, license: 'CC0-1.0' })).status).toBe(403);
  });

  it('when a logger file with local times is imported, then the log holds UTC instants and serves the seasonal totals', async () => {
    const plot = (await lab.get(`/api/plots?siteId=${DEMO_SITE_ID}&limit=1`)).body.items[0];
    const text = 'Date Time;Temp 10cm\n2026-07-01 00:00;14,2\n2026-07-01 01:00;14,0\n2026-10-26 02:30;9,5\n';
    const res = await lab.post('/api/results/temperature-logs/import', {
      siteId: DEMO_SITE_ID,
      plotId: plot.id,
      depthCm: 10,
      source: 'test file',
      text,
      timeColumn: 'Date Time',
      tempColumn: 'Temp 10cm',
      timeZone: 'Europe/Berlin',
    });
    expect(res.status).toBe(201);
    // Berlin is UTC+2 in July (CEST) and UTC+1 after the last Sunday of October (CET, from 25 October 2026):
    // EU summer-time rule, Directive 2000/84/EC (from memory).
    expect(res.body).toMatchObject({ samples: 3, from: '2026-06-30T22:00:00.000Z', to: '2026-10-26T01:30:00.000Z' });
    const log = (await lab.get(`/api/temperature-logs/${res.body.id}`)).body.record;
    expect(log.series.tempC).toEqual([14.2, 14, 9.5]);
    const bad = await lab.post('/api/results/temperature-logs/import', {
      siteId: DEMO_SITE_ID,
      plotId: plot.id,
      depthCm: 10,
      text,
      timeColumn: 'When',
      tempColumn: 'Temp 10cm',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toBe('The file has no column "When"');
  });
});
