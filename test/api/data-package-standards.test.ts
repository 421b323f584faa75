import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Ajv from 'ajv';
import addFormats from 'ajv-formats';
import Papa from 'papaparse';
import { runResultsExport, type ExportRequest } from '../../server/results/results-export';
import { readZip } from '../support/read-zip';
import { DEMO_SITE_ID } from '../support/fixtures';
import { checkTable, type Row, type TableResource } from '../support/table-schema-check';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

// The official EML 2.2.0 XML Schema and Frictionless v1.0 / v2.0 profiles, vendored (test/fixtures/standards/README.md).
const STANDARDS = join(__dirname, '../fixtures/standards');
const profile = (v: string, name: string) => JSON.parse(readFileSync(join(STANDARDS, 'datapackage', v, `${name}.json`), 'utf8'));

/** xmllint's verdict on a file against a schema (Debian libxml2-utils): '' when valid, else its messages. */
function xmllint(schema: string, file: string): string {
  try {
    execFileSync('xmllint', ['--noout', '--nonet', '--schema', schema, file], { stdio: 'pipe' });
    return '';
  } catch (e) {
    return String((e as { stderr: Buffer }).stderr);
  }
}

function parseCsv(text: string): { header: string[]; rows: Row[] } {
  const parsed = Papa.parse<Row>(text, { header: true, skipEmptyLines: true });
  return { header: parsed.meta.fields ?? [], rows: parsed.data };
}

function checkPackage(pkg: { resources: (TableResource & { path: string; format: string })[] }, files: Map<string, Buffer>): string[] {
  const csvs = pkg.resources.filter((r) => r.format === 'csv');
  const parsed = new Map(csvs.map((r) => [r.name, parseCsv(files.get(r.path)!.toString('utf8'))]));
  const tables = new Map([...parsed].map(([k, v]) => [k, v.rows]));
  return csvs.flatMap((r) => checkTable(r, parsed.get(r.name)!.header, parsed.get(r.name)!.rows, tables));
}

describe('data package against the official standards: EML 2.2.0 XSD, Frictionless v1/v2 profiles, table schemas', () => {
  let t: TestApp;
  let lab: Session;
  let files: Map<string, Buffer>;
  let dir: string;
  let pkg: any;
  let probe: { id: string; soil_temps: unknown; moisture_raw: number | null; moisture_kind: string | null };

  beforeAll(async () => {
    t = await startTestApp();
    lab = await signIn(t.app, demoEmail('lab'));
    const asked = await lab.post('/api/results/exports', { siteId: DEMO_SITE_ID, closures: 'not-rejected', license: 'CC-BY-4.0' });
    expect(asked.status).toBe(202);
    const [outbox] = await t.ds.query(`SELECT data FROM job_outbox WHERE id = $1`, [asked.body.jobId]);
    // One probe reading made implausible (65 °C at 5 cm, VWC 99 %) for the export only, then put back.
    [probe] = await t.ds.query(
      `SELECT id, soil_temps, moisture_raw, moisture_kind FROM probe_reading WHERE site_id = $1 AND NOT deleted ORDER BY id LIMIT 1`,
      [DEMO_SITE_ID],
    );
    await t.ds.query(`UPDATE probe_reading SET soil_temps = $2, moisture_raw = 99, moisture_kind = 'vwc' WHERE id = $1`, [
      probe.id,
      JSON.stringify([{ depthCm: 5, tempC: 65 }]),
    ]);
    try {
      await runResultsExport(t.ds, outbox.data as ExportRequest, { jobId: asked.body.jobId });
    } finally {
      await t.ds.query(`UPDATE probe_reading SET soil_temps = $2, moisture_raw = $3, moisture_kind = $4 WHERE id = $1`, [
        probe.id,
        JSON.stringify(probe.soil_temps),
        probe.moisture_raw,
        probe.moisture_kind,
      ]);
    }
    const [f] = await t.ds.query(`SELECT bytes FROM result_export WHERE id = $1`, [asked.body.jobId]);
    files = await readZip(f.bytes as Buffer);
    pkg = JSON.parse(files.get('datapackage.json')!.toString('utf8'));
    dir = mkdtempSync(join(tmpdir(), 'fluxwalk-package-'));
    writeFileSync(join(dir, 'metadata.eml.xml'), files.get('metadata.eml.xml')!);
  });
  afterAll(() => t.close());

  it('when no licence or an unknown one is asked for, then the export is refused with a 400 that lists the licences', async () => {
    for (const body of [{ siteId: DEMO_SITE_ID }, { siteId: DEMO_SITE_ID, license: 'WTFPL' }]) {
      const res = await lab.post('/api/results/exports', body);
      expect(res.status).toBe(400);
      expect(res.body.error.message).toMatch(/^Choose a licence for the data package by its SPDX id: one of CC0-1.0, CC-BY-4.0/);
    }
  });

  it('when the EML is checked with xmllint against eml.xsd, then it validates; its custom units validate against stmml.xsd', () => {
    const eml = join(dir, 'metadata.eml.xml');
    expect(xmllint(join(STANDARDS, 'eml-2.2.0/eml.xsd'), eml)).toBe('');
    const text = files.get('metadata.eml.xml')!.toString('utf8');
    const unitList = text
      .match(/<stmml:unitList>[\s\S]*<\/stmml:unitList>/)![0]
      .replace('<stmml:unitList>', '<stmml:unitList xmlns:stmml="http://www.xml-cml.org/schema/stmml-1.2">');
    writeFileSync(join(dir, 'units.xml'), `<?xml version="1.0" encoding="UTF-8"?>\n${unitList}\n`);
    expect(xmllint(join(STANDARDS, 'eml-2.2.0/stmml.xsd'), join(dir, 'units.xml'))).toBe('');
    expect(text).toContain('<licensed><licenseName>Creative Commons Attribution 4.0 International</licenseName>');
    expect(text).toContain('<identifier>CC-BY-4.0</identifier>');
  });

  it('when the units are read, then dictionary names are used where they exist and every custom unit is defined completely', () => {
    const text = files.get('metadata.eml.xml')!.toString('utf8');
    const dictionary = readFileSync(join(STANDARDS, 'eml-2.2.0/eml-unitDictionary.xml'), 'utf8');
    const standardIds = new Set([...dictionary.matchAll(/<unit id="([^"]+)"/g)].map((m) => m[1]));
    const custom = [...text.matchAll(/<stmml:unit ([^>]*)>/g)].map((m) => m[1]);
    expect(custom.length).toBeGreaterThan(0);
    for (const attrs of custom) {
      const id = attrs.match(/id="([^"]+)"/)![1];
      expect([id, standardIds.has(id)]).toEqual([id, false]);
      for (const a of ['unitType', 'parentSI', 'multiplierToSI']) expect([id, new RegExp(`${a}="[^"]+"`).test(attrs)]).toEqual([id, true]);
      expect(standardIds.has(attrs.match(/parentSI="([^"]+)"/)![1])).toBe(true);
    }
    for (const m of text.matchAll(/<standardUnit>([^<]+)<\/standardUnit>/g)) expect(standardIds.has(m[1])).toBe(true);
    expect(text).toMatch(/<attributeName>total_g_c_m2<\/attributeName>.*?<customUnit>gramCarbonPerMeterSquared<\/customUnit>/);
    expect(text).toMatch(/<attributeName>moisture_vwc_reading_pct<\/attributeName>.*?<standardUnit>percent<\/standardUnit>/);
    expect(text).toMatch(/<attributeName>moisture_permittivity<\/attributeName>.*?<standardUnit>dimensionless<\/standardUnit>/);
    // The table schema's enums and ranges are in the EML too: enumerated domains and numeric bounds.
    expect(text).toMatch(/<attributeName>review_state<\/attributeName>.*?<enumeratedDomain><codeDefinition><code>unreviewed<\/code>/);
    expect(text).toMatch(
      /<attributeName>moisture_vwc_reading_pct<\/attributeName>.*?<bounds><minimum exclusive="false">0<\/minimum><maximum exclusive="false">100<\/maximum><\/bounds>/,
    );
  });

  it('when datapackage.json, every resource, table schema and dialect is checked with ajv, then all validate against Frictionless v1.0 and v2.0', () => {
    for (const v of ['1.0', '2.0']) {
      const ajv = new Ajv({ strict: false, allErrors: true });
      addFormats(ajv);
      // "textarea" is an editor hint of the Frictionless profiles, not a JSON Schema format: any string.
      ajv.addFormat('textarea', true);
      const check = (name: string, data: unknown) => {
        const validate = ajv.compile(profile(v, name));
        return validate(data) ? [] : [`${v} ${name}: ${ajv.errorsText(validate.errors)}`];
      };
      const problems = [
        ...check('datapackage', pkg),
        ...pkg.resources.flatMap((r: any) => [
          ...check('dataresource', r),
          ...(r.schema ? check('tableschema', r.schema) : []),
          ...(r.dialect ? check('tabledialect', r.dialect) : []),
        ]),
      ];
      expect(problems).toEqual([]);
    }
    expect(pkg.licenses).toEqual([
      { name: 'CC-BY-4.0', path: 'https://creativecommons.org/licenses/by/4.0/', title: 'Creative Commons Attribution 4.0 International' },
    ]);
  });

  it('when every CSV is checked against its table schema, then types, required, enums, ranges and keys hold; a corrupted copy fails', () => {
    expect(checkPackage(pkg, files)).toEqual([]);
    const broken = new Map(files);
    const closures = files.get('data/closures.csv')!.toString('utf8').split('\n');
    const cells = closures[1].split(',');
    const state = pkg.resources.find((r: any) => r.name === 'closures').schema.fields.findIndex((f: any) => f.name === 'review_state');
    cells[state] = 'maybe';
    closures[1] = cells.join(',');
    closures.push(closures[2]);
    broken.set('data/closures.csv', Buffer.from(closures.join('\n')));
    const problems = checkPackage(pkg, broken);
    expect(problems).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^closures row 1: review_state = "maybe" is not one of/),
        'closures: primary key closure_id is not unique',
      ]),
    );
    const eml = files
      .get('metadata.eml.xml')!
      .toString('utf8')
      .replace(/<title>[^<]*<\/title>/, '');
    writeFileSync(join(dir, 'broken.eml.xml'), eml);
    expect(xmllint(join(STANDARDS, 'eml-2.2.0/eml.xsd'), join(dir, 'broken.eml.xml'))).toMatch(/fails to validate/);
  });

  it('when numbers, coverage and probe flags are read, then numbers carry no float noise, coverage is the data span, implausible readings are flagged', async () => {
    const noise = [...files]
      .filter(([k]) => k.endsWith('.csv'))
      .flatMap(([, b]) => b.toString('utf8').match(/\d\.\d*(0{6,}|9{6,})\d/g) ?? []);
    expect(noise).toEqual([]);
    // Site days: the span is the days the crews were out, at the site.
    const [span] = await t.ds.query(
      `SELECT to_char(min(started_at) AT TIME ZONE z.tz, 'YYYY-MM-DD') AS f, to_char(max(started_at) AT TIME ZONE z.tz, 'YYYY-MM-DD') AS l
      FROM closure, (SELECT timezone AS tz FROM site WHERE id = $1) z WHERE site_id = $1 AND NOT deleted GROUP BY z.tz`,
      [DEMO_SITE_ID],
    );
    const text = files.get('metadata.eml.xml')!.toString('utf8');
    const [, begin, end] = text.match(/<beginDate><calendarDate>([^<]+)<\/calendarDate><\/beginDate><endDate><calendarDate>([^<]+)</)!;
    expect(begin <= span.f && end >= span.l).toBe(true);
    // The totals carry their own window, inside the data's span.
    const totals = parseCsv(files.get('data/seasonal_totals.csv')!.toString('utf8')).rows;
    expect(text).toMatch(
      new RegExp(
        `<dataTable id="seasonal_totals">.*<coverage><temporalCoverage><rangeOfDates><beginDate><calendarDate>${totals[0].from_day}<` +
          `.*<calendarDate>${totals[0].to_day}</calendarDate></endDate></rangeOfDates></temporalCoverage></coverage>.*</dataTable>`,
      ),
    );
    const probes = parseCsv(files.get('data/probe_readings.csv')!.toString('utf8')).rows;
    expect(probes.find((r) => r.probe_reading_id === probe.id)).toMatchObject({
      moisture_kind: 'vwc',
      moisture_vwc_reading_pct: '99',
      flags: 'soil-temp-implausible;vwc-implausible',
    });
    expect(probes.filter((r) => r.flags.includes('implausible')).map((r) => r.probe_reading_id)).toEqual([probe.id]);
    // The demo's replicates read now and then at 10 cm, off the 5 cm probe depth: flagged as that and nothing else.
    const others = probes.filter((r) => r.flags !== '' && r.probe_reading_id !== probe.id);
    expect(others.length).toBeGreaterThan(0);
    expect(new Set(others.map((r) => r.flags))).toEqual(new Set(['soil-temp-off-depth']));
    for (const words of [
      '1 − χw',
      'first sample used',
      'AICc',
      'flux_basis',
      'minimum detectable slope',
      'flat:',
      'interpolation',
      'Student t interval',
      'Webb, Pearman &amp; Leuning 1980',
    ]) {
      expect([words, text.includes(words)]).toEqual([words, true]);
    }
  });

  it('when a stranger recomputes fluxes from the tables and the methods alone, then they match; totals rows add no days across plots', () => {
    const csv = (name: string) => parseCsv(files.get(`data/${name}.csv`)!.toString('utf8')).rows;
    const series = new Map<string, Row[]>();
    for (const s of csv('closure_series')) series.set(s.closure_id, [...(series.get(s.closure_id) ?? []), s]);
    // flux = slope × 10·p·V·(1 − χw)/(R·T·A), p, T, χw of the first sample of the fit (EML methods); R = NA·kB (SI 2019).
    const R = 6.02214076e23 * 1.380649e-23;
    let checked = 0;
    for (const k of csv('closures').filter(
      (c) => c.review_fit_model === '' && c.raw_flux_umol_m2_s !== '' && c.pressure_is_default === 'false',
    )) {
      const first = series.get(k.closure_id)!.find((s) => Number(s.t_s) === Number(k.fit_first_t_s))!;
      const chiW = Number(first.h2o_mmol_mol) / 1000;
      const tempC = k.air_temp_source === 'series' ? Number(first.chamber_temp_c) : Number(k.air_temp_c);
      const factor = (10 * Number(first.pressure_kpa) * Number(k.volume_cm3) * (1 - chiW)) / (R * (tempC + 273.15) * Number(k.area_cm2));
      expect(Number(k.flux_per_slope)).toBeCloseTo(factor, 9);
      expect(Number(k.raw_flux_umol_m2_s)).toBeCloseTo(Number(k.raw_slope_ppm_s) * factor, 9);
      const window = Number(k.fit_last_t_s) - Number(k.fit_first_t_s);
      expect(Number(k.min_detectable_flux_umol_m2_s)).toBeCloseTo((Number(k.precision_ppm) / window) * factor, 9);
      checked++;
    }
    expect(checked).toBeGreaterThan(20);
    // Instruments behind the fluxes: every closure names its analyzer and profile version, which the package describes.
    expect([csv('analyzers').length, csv('chamber_profiles').length, csv('analyzer_checks').length].every((n) => n > 0)).toBe(true);
    expect(csv('closures').every((k) => k.profile_id !== '' && k.analyzer_id !== '')).toBe(true);
    const totals = csv('seasonal_totals');
    for (const r of totals.filter((x) => x.plot_id === '')) {
      expect([r.days_logged, r.days_interpolated, r.days_missing, r.days_outside_range]).toEqual(['', '', '', '']);
      const plots = totals.filter((x) => x.cell === r.cell && x.plot_id !== '');
      expect(Number(r.n_plots)).toBe(plots.length);
      for (const p of plots)
        expect(Number(p.days_logged) + Number(p.days_interpolated) + Number(p.days_missing)).toBe(Number(p.period_days));
      if (r.status === 'complete')
        expect(Number(r.total_g_c_m2)).toBeCloseTo(plots.reduce((a, p) => a + Number(p.total_g_c_m2), 0) / plots.length, 2);
    }
  });
});
