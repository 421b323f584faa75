/// <reference lib="dom" />
import { signInAs } from './support/app-actions';
import { choose } from './support/walk-actions';
import { browserSuite } from './support/suite';

jest.setTimeout(240_000);

const suite = browserSuite();
const { server } = suite;

describe('Bench temperature logs in Chromium at 390 px', () => {
  it('when the lab picks a logger file, fixes nothing, chooses a plot and depth, then the log is stored and the screen fits a phone', async () => {
    await suite.inBrowser('temperature-logs', { viewport: { width: 390, height: 844 } }, async (page) => {
      await signInAs(page, server.baseUrl, 'lab');
      await page.getByRole('link', { name: 'Temperature logs' }).click();
      await page.getByRole('heading', { name: 'Soil temperature logs' }).waitFor();
      const text = 'Zeit;Boden 5 cm\n2026-07-01 00:00;14,2\n2026-07-01 01:00;14,0\n2026-07-01 02:00;13,8\n';
      await page
        .locator('input[type=file][aria-label="Temperature logger file"]')
        .setInputFiles({ name: 'soil-5cm.csv', mimeType: 'text/csv', buffer: Buffer.from(text) });
      await page
        .getByTestId('preview-summary')
        .getByText(/3 readings/)
        .waitFor();
      await page.getByLabel('Depth (cm)').fill('5');
      // A multiple select stays open after a choice: pick one plot, then close it.
      await choose(page, 'Plot(s) this logger stands for', /.+/, { multiple: true });
      await page.keyboard.press('Escape');
      await page.getByRole('listbox').waitFor({ state: 'detached' });
      const done = page.waitForResponse((r) => r.url().includes('/api/results/temperature-logs/import'));
      await page.getByRole('button', { name: 'Import', exact: true }).click();
      expect((await done).status()).toBe(201);
      await page
        .getByTestId('outcome')
        .getByText(/Imported \(append\): 3 readings/)
        .waitFor();
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    });
  });
});
