import Papa from 'papaparse';
import { runResultsExport } from '../../server/results/results-export';
import { tablePath, TABLES } from '../../server/results/export-schema';
import { readZip } from '../support/read-zip';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

type Row = Record<string, string>;

/**
 * Exports keep UTC and add the site's wall time beside it. Checked against an independent
 * formatter: Intl's sv-SE style ("YYYY-MM-DD HH:mm:ss") in the site's IANA zone (the runtime's tz database).
 */
describe('results export: local-time columns', () => {
  let t: TestApp;
  let files: Map<string, Buffer>;
  let zone: string;
  const table = (name: string) =>
    Papa.parse<Row>(files.get(tablePath(name))!.toString('utf8'), { header: true, skipEmptyLines: true }).data;
  const wall = (iso: string) => new Date(iso).toLocaleString('sv-SE', { timeZone: zone }).replace(' ', 'T');

  beforeAll(async () => {
    t = await startTestApp();
    [{ timezone: zone }] = await t.ds.query(`SELECT timezone FROM site WHERE id = $1`, [DEMO_SITE_ID]);
    // A zone away from UTC, with summer time, so a wrong zone or a missing offset shows.
    zone = zone === 'UTC' ? 'America/Anchorage' : zone;
    await t.ds.query(`UPDATE site SET timezone = $2 WHERE id = $1`, [DEMO_SITE_ID, zone]);
    const [lab] = await t.ds.query(`SELECT id FROM app_user WHERE email = $1`, [demoEmail('lab')]);
    const out = await runResultsExport(
      t.ds,
      { siteId: DEMO_SITE_ID, selection: 'not-rejected', model: 'q10', userId: lab.id, license: 'CC0-1.0' },
      { jobId: '0b6d7e1a-2f4c-4d8e-9a1b-3c5d7e9f1a2b' },
    );
    const [{ bytes }] = await t.ds.query(`SELECT bytes FROM result_export WHERE id = $1`, [out.exportId]);
    files = await readZip(bytes as Buffer);
  });
  afterAll(() => t.close());

  it("when a table has a UTC time, then the column beside it is the same instant as the site's wall time with its offset", () => {
    const pairs: [string, string][] = [
      ['closures', 'started_at'],
      ['visits', 'arrived_at'],
      ['offset_sets', 'taken_at'],
      ['probe_readings', 'taken_at'],
      ['analyzer_checks', 'checked_at'],
      ['calibrations', 'calibrated_at'],
      ['soil_temperature_logs', 't'],
    ];
    let checked = 0;
    for (const [name, col] of pairs) {
      const rows = table(name);
      expect(Object.keys(rows[0] ?? { [col]: '', [`${col}_local`]: '' })).toEqual(expect.arrayContaining([col, `${col}_local`]));
      for (const r of rows.slice(0, 200)) {
        if (!r[col]) {
          expect(r[`${col}_local`]).toBe('');
          continue;
        }
        const local = r[`${col}_local`];
        expect(local).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[+-]\d{2}:\d{2}$/);
        expect(Date.parse(local)).toBe(Math.floor(Date.parse(r[col]) / 1000) * 1000);
        expect(local.slice(0, 19)).toBe(wall(r[col]));
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(100);
  });

  it("when the package describes the local columns, then the schema and the EML name the site's zone", () => {
    const pkg = JSON.parse(files.get('datapackage.json')!.toString('utf8'));
    const closures = pkg.resources.find((r: { name: string }) => r.name === 'closures');
    const field = closures.schema.fields.find((f: { name: string }) => f.name === 'started_at_local');
    expect(field.type).toBe('datetime');
    expect(field.description).toContain(zone);
    expect(closures.schema.fields.find((f: { name: string }) => f.name === 'started_at').description).toContain('UTC');
    const eml = files.get('metadata.eml.xml')!.toString('utf8');
    expect(eml).toContain(`<attributeName>started_at_local</attributeName>`);
    expect(eml).toContain(`local time at the site (${zone})`);
    expect(TABLES.flatMap((t) => t.fields).filter((f) => f.localOf).length).toBe(7);
  });
});
