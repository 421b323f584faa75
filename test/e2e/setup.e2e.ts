/// <reference lib="dom" />
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { Page } from 'playwright-core';
import { pressureFromElevationKpa } from '../../shared/flux/standard-atmosphere';
import { decodePdfQrCodes } from '../fixtures/setup/pdf-qr';
import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { browserSuite } from './support/suite';

jest.setTimeout(240_000);

const CSV = path.resolve(__dirname, '../fixtures/setup/collars-40.csv');
const CREW_NAME = 'Rowan Ashby'; // the demo crew user

const suite = browserSuite();
const { server } = suite;

async function addRow(page: Page, table: string, values: Record<string, string>, selects: Record<string, string> = {}) {
  const form = page.getByRole('form', { name: `Add to ${table}` });
  for (const [label, value] of Object.entries(values)) await form.getByLabel(label, { exact: true }).fill(value);
  for (const [label, option] of Object.entries(selects)) {
    await form.getByRole('combobox', { name: label, exact: true }).click();
    await page.getByRole('option', { name: option, exact: true }).click();
  }
  const created = page.waitForResponse((r) => r.request().method() === 'POST' && r.status() === 201);
  await form.getByRole('button', { name: 'Add' }).click();
  return (await (await created).json()).record;
}

async function noSeriousProblems(page: Page, where: string) {
  const problems = await seriousAccessibilityProblems(page);
  expect([where, problems]).toEqual([where, []]);
}

describe('Setup in Chromium', () => {
  it('when the admin sets up a site from scratch, then collars import after fixing two rows and every tag scans to its collar', async () => {
    await suite.inBrowser('setup-site', async (page) => {
      await signInAs(page, server.baseUrl, 'admin');
      expect(new URL(page.url()).pathname).toBe('/setup');
      await page.getByRole('heading', { name: 'Setup', level: 1 }).waitFor();

      // Site, with the pressure its elevation implies.
      await page.getByRole('button', { name: 'New site' }).click();
      // Until the next render the shown site's form is still there under the same labels: typing now would
      // go into the form that is about to be replaced.
      await page.getByRole('heading', { name: 'New site', level: 2 }).waitFor();
      const siteName = `Birch Terrace <script>alert(1)</script> ${Date.now()}`;
      await page.getByLabel('Site name').fill(siteName);
      await page.getByLabel('Time zone (IANA)').fill('Europe/Berlin');
      await page.getByLabel('Elevation (m)').fill('420');
      expect(await page.getByTestId('default-pressure').innerText()).toContain(`${pressureFromElevationKpa(420).toFixed(2)} kPa`);
      await noSeriousProblems(page, 'new site form');
      const siteRes = page.waitForResponse((r) => r.url().endsWith('/api/sites') && r.request().method() === 'POST');
      await page.getByRole('button', { name: 'Create site' }).click();
      const site = (await (await siteRes).json()).record;
      expect(site.name).toBe(siteName);
      await page.getByRole('tab', { name: 'Site' }).waitFor();
      expect(await page.getByLabel('Site name').inputValue()).toBe(siteName);

      // Blocks, treatments and plots.
      await page.getByRole('tab', { name: 'Plots and treatments' }).click();
      await addRow(page, 'blocks', { 'Block code': 'B1' });
      await addRow(page, 'treatments', { 'Treatment code': 'CTRL', Name: 'Control' });
      await page.locator('fw-record-table').nth(2).click(); // refresh the block/treatment choices
      for (const code of ['P1', 'P2', 'P3', 'P4']) {
        const plot = await addRow(page, 'plots', { 'Plot code': code }, { Block: 'B1', Treatment: 'CTRL' });
        expect(plot.blockId).not.toBeNull();
      }

      // P1's outline drawn on the map (three corners, closed), saved through PATCH /api/plots/:id.
      await page.getByRole('combobox', { name: 'Plot to outline' }).click();
      await page.getByRole('option', { name: 'P1', exact: true }).click();
      const map = page.getByTestId('outline-map');
      await map.scrollIntoViewIfNeeded();
      const box = (await map.boundingBox())!;
      for (const [fx, fy] of [
        [0.3, 0.3],
        [0.7, 0.3],
        [0.5, 0.7],
      ])
        await map.click({ position: { x: box.width * fx!, y: box.height * fy! } });
      await page.getByRole('button', { name: 'Close outline' }).click();
      const patched = page.waitForResponse((r) => r.url().includes('/api/plots/') && r.request().method() === 'PATCH');
      await page.getByRole('button', { name: 'Save outline' }).click();
      const outlined = (await (await patched).json()).record;
      expect([outlined.code, outlined.outline.type, outlined.outline.coordinates[0].length]).toEqual(['P1', 'Polygon', 4]);
      expect(outlined.outline.coordinates[0][3]).toEqual(outlined.outline.coordinates[0][0]);
      await waitForText(page.getByTestId('outline-status'), 'Outline of P1 saved');
      expect(JSON.parse(await page.getByRole('textbox', { name: 'Outline as GeoJSON' }).inputValue())).toEqual(outlined.outline);
      expect(await map.locator('.leaflet-tile').count()).toBe(0); // no tile source on this site: nothing fetched
      await noSeriousProblems(page, 'plots and treatments');

      // The crew user becomes a member.
      await page.getByRole('tab', { name: 'Members' }).click();
      const member = page.waitForResponse((r) => r.url().includes('/api/users/') && r.request().method() === 'PATCH');
      await page.getByRole('checkbox', { name: `${CREW_NAME} is a member of this site` }).click();
      expect((await (await member).json()).user.siteIds).toContain(site.id);
      await noSeriousProblems(page, 'members');

      // A chamber profile.
      await page.getByRole('tab', { name: 'Equipment' }).click();
      const profile = await addRow(page, 'chamber profiles', {
        'Profile name': 'Opaque 20 cm',
        'Valid from': '2026-01-01',
        'Chamber volume (cm³)': '4000',
        'Loop volume (cm³)': '50',
        'Settle time (s)': '20',
      });
      expect(profile).toMatchObject({ validFrom: '2026-01-01', chamberVolumeCm3: 4000 });
      await noSeriousProblems(page, 'equipment');

      // The 40-collar file: two bad rows, fixed after the check, then imported.
      await page.getByRole('tab', { name: 'Collars' }).click();
      await page.getByTestId('collar-csv-input').setInputFiles(CSV);
      const status = page.getByTestId('import-status');
      await waitForText(status, '2 of 40 rows need a fix');
      expect(await page.getByTestId('import-error').allInnerTexts()).toEqual([
        expect.stringContaining('"200 mm" is in mm; Inner diameter must be in cm'),
        expect.stringContaining('Latitude must be at most 90 °'),
      ]);
      await noSeriousProblems(page, 'import preview');
      await page.getByLabel('Row 8 diameter_cm').fill('20');
      await page.getByLabel('Row 23 lat').fill('50.97362');
      await page.getByRole('button', { name: 'Check again' }).click();
      await waitForText(status, 'All 40 rows are ready to import.');
      await page.getByRole('button', { name: 'Import 40 collars' }).click();
      await waitForText(status, 'Imported 40 collars.');
      await waitForText(page.getByRole('heading', { name: /^Collars \(/ }), 'Collars (40)');
      // Text with markup is shown as text.
      await page.getByLabel('Filter collars').fill('C03');
      expect(await page.getByRole('listitem').filter({ hasText: 'C03' }).innerText()).toContain('<script>alert(1)</script>');
      expect(await page.evaluate(() => document.querySelectorAll('fw-collar-list script').length)).toBe(0);

      // The tag sheet: every QR on the printed pages reads back as one of the 40 collars.
      const download = page.waitForEvent('download');
      await page.getByTestId('tag-sheet').click();
      const file = await (await download).path();
      const { pages, codes } = decodePdfQrCodes(readFileSync(file));
      const collars = (await (await page.request.get(`${server.baseUrl}/api/collars?siteId=${site.id}&limit=100`)).json()).items as {
        id: string;
      }[];
      expect(pages).toBe(2);
      const ids = codes.flat().map((u) => u.split('/').pop());
      expect(ids).toHaveLength(40);
      expect([...ids].sort()).toEqual(collars.map((c) => c.id).sort());
      expect(codes.flat()[0]).toMatch(new RegExp(`^${server.baseUrl}/walk/collars/`));
      await noSeriousProblems(page, 'collars');

      await page.getByRole('tab', { name: 'Routes' }).click();
      await page.getByRole('heading', { name: 'Routes' }).waitFor();
      await noSeriousProblems(page, 'routes');
    });
  });
});

async function waitForText(locator: ReturnType<Page['locator']>, text: string) {
  await locator.filter({ hasText: text }).waitFor({ timeout: 20_000 });
}
