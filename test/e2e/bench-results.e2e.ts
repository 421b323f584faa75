/// <reference lib="dom" />
import { readFileSync } from 'node:fs';
import { readZip } from '../support/read-zip';
import { Page } from 'playwright-core';
import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { choose } from './support/walk-actions';
import { browserSuite } from './support/suite';

jest.setTimeout(240_000);

const suite = browserSuite();
const { server } = suite;

async function noSeriousProblems(page: Page, where: string) {
  expect([where, await seriousAccessibilityProblems(page)]).toEqual([where, []]);
}

describe('Bench results in Chromium', () => {
  it('when the lab opens the treatment summary, the temperature response and the seasonal totals, then downloads the data package, each shows real numbers', async () => {
    await suite.inBrowser('bench-results', async (page) => {
      await signInAs(page, server.baseUrl, 'lab');
      expect(new URL(page.url()).pathname).toBe('/bench');

      // Treatment summary: accepted closures only by default (the seed reviewed April and half of May).
      const summary = page.waitForResponse((r) => r.url().includes('/api/results/summary') && r.status() === 200);
      await page.getByRole('button', { name: 'Results' }).click();
      const s = await (await summary).json();
      const table = page.getByTestId('summary-table');
      await table.waitFor();
      expect(await table.locator('tbody tr').count()).toBe(s.cellMeans.length);
      const first = s.cellMeans[0];
      await table.locator('tbody tr').first().getByText(first.meanUmolM2S.toFixed(2), { exact: true }).waitFor();
      await noSeriousProblems(page, 'Results: treatment summary');

      // Temperature response with every closure not rejected, so each treatment has points across the season.
      let resp = page.waitForResponse((r) => r.url().includes('/api/results/responses') && r.status() === 200);
      await page.getByRole('tab', { name: 'Temperature response' }).click();
      await resp;
      resp = page.waitForResponse((r) => r.url().includes('closures=not-rejected') && r.url().includes('/api/results/responses'));
      await page.getByRole('combobox', { name: 'Closures', exact: true }).click();
      await page.getByRole('option', { name: 'accepted and not yet reviewed' }).click();
      const r = await (await resp).json();
      const chart = page.getByTestId('response-chart');
      await chart.waitFor();
      const shown = r.responses.find((x: { points: unknown[] }) => x.points.length);
      expect(await chart.locator('circle').count()).toBe(shown.points.length);
      await page.getByTestId('curve-lloyd-taylor').waitFor();
      await page.getByTestId('curve-q10').waitFor();
      expect(await page.getByTestId('response-table').locator('tbody tr').count()).toBe(r.responses.length);
      await noSeriousProblems(page, 'Results: temperature response');

      // Seasonal totals: cumulative lines and the totals with their t interval over plots (the default period has a value for every plot-day).
      const seas = page.waitForResponse((x) => x.url().includes('/api/results/seasonal') && x.status() === 200);
      await page.getByRole('tab', { name: 'Seasonal totals' }).click();
      const st = await (await seas).json();
      await page.getByTestId('seasonal-chart').waitFor();
      expect(await page.getByTestId('seasonal-chart').locator('path').count()).toBe(st.totals.length);
      const firstTotal = st.totals[0];
      expect(firstTotal.status).toBe('complete');
      await page.getByTestId('interval-note').waitFor();
      await page
        .getByTestId('seasonal-table')
        .getByText(Math.round(firstTotal.totalGCM2).toLocaleString('en-US'), { exact: true })
        .first()
        .waitFor();
      await noSeriousProblems(page, 'Results: seasonal totals');

      // Data package: a background job with progress, then a download.
      await page.getByRole('tab', { name: 'Data package' }).click();
      await choose(page, 'Data licence', /^CC-BY-4\.0/);
      await page.getByRole('button', { name: 'Build data package' }).click();
      const link = page.getByTestId('export-download');
      await link.waitFor({ timeout: 120_000 });
      await page
        .getByTestId('export-status')
        .getByText(/^completed/)
        .waitFor();
      await noSeriousProblems(page, 'Results: data package');
      const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
      expect(download.suggestedFilename()).toMatch(/^fluxwalk-results-.*\.zip$/);
      const files = await readZip(readFileSync((await download.path())!));
      const pkg = JSON.parse(files.get('datapackage.json')!.toString('utf8'));
      expect(pkg['fluxwalk:provenance'].generatedBy.email).toBe('lab@fluxwalk.example');
      expect(files.get('data/closures.csv')!.toString('utf8').split('\n')[0]).toMatch(/^closure_id,visit_id,collar_id,/);
      expect(files.has('metadata.eml.xml')).toBe(true);
    });
  });
});
