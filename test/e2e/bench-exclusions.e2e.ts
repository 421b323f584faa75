/// <reference lib="dom" />
import { Page } from 'playwright-core';
import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { browserSuite } from './support/suite';

jest.setTimeout(300_000);

const suite = browserSuite();
const { server } = suite;

const queueAnswer = (page: Page) => page.waitForResponse((r) => r.url().includes('/api/bench/queue') && r.status() === 200);
const detailAnswer = (page: Page) =>
  page.waitForResponse((r) => /\/api\/bench\/closures\/[0-9a-f-]+$/.test(new URL(r.url()).pathname) && r.status() === 200);
const pointsAnswer = (page: Page) => page.waitForResponse((r) => /\/exclusions(\/restore)?$/.test(new URL(r.url()).pathname));

async function pick(page: Page, label: string, option: string): Promise<void> {
  await page.getByRole('combobox', { name: label, exact: true }).click();
  await page
    .getByRole('option')
    .filter({ hasText: new RegExp(`^\\s*${option}\\s*$`) })
    .first()
    .click();
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

describe('Bench: points left out of a fit, on a phone', () => {
  it('when the lab taps a point on the chart and leaves it out, then the flux is recomputed, the history says so, and it can be put back', async () => {
    await suite.inBrowser('bench-exclusions', { viewport: { width: 390, height: 844 }, touch: true }, async (page) => {
      const loaded = queueAnswer(page);
      await signInAs(page, server.baseUrl, 'lab');
      await loaded;
      // On a phone the filters start folded.
      await page
        .getByRole('button', { name: /^Filters/ })
        .first()
        .click();
      let q = queueAnswer(page);
      // The campaign under way (the past season's campaigns are locked: no points can be left out there).
      await pick(page, 'Campaign', 'December 2026 survey, two rounds');
      await q;
      q = queueAnswer(page);
      const d = detailAnswer(page);
      await pick(page, 'Review', 'unreviewed');
      await q;
      const detail = await (await d).json();
      await page.locator('#closure-title').waitFor();

      // H2O, chamber air temperature and pressure under the CO2 chart, each its own canvas.
      expect(await page.locator('fw-closure-traces canvas').count()).toBe(3);

      // Tap the middle of the chart: the nearest sample becomes the range.
      await page.waitForLoadState('networkidle');
      const over = page.locator('fw-closure-chart .u-over').first();
      const size = await over.evaluate((e) => ({ w: e.clientWidth, h: e.clientHeight }));
      await over.click({ position: { x: Math.round(size.w * 0.6), y: Math.round(size.h / 2) } });
      await page.waitForFunction(() => (document.querySelector('[data-testid="exclude-from"]') as HTMLInputElement | null)?.value !== '');
      const button = page.getByRole('button', { name: 'Leave out 1 point' });
      let a = pointsAnswer(page);
      let again = detailAnswer(page);
      await button.click();
      const excluded = (await (await a).json()).record;
      await again;
      expect(excluded.reviewExclusions).toHaveLength(1);
      expect(excluded.reviewExclusions[0].reason).toBe('Spike');
      expect(excluded.series).toEqual(detail.closure.series);
      await page.getByTestId('excluded-points').getByText(`Samples ${excluded.reviewExclusions[0].index}`, { exact: false }).waitFor();
      await page.getByTestId('history').getByText(`points left out: none → ${excluded.reviewExclusions[0].index} (Spike)`).waitFor();
      expect(Number((await page.getByTestId('flux').innerText()).trim())).toBeCloseTo(excluded.fluxUmolM2S, 4);
      expect(excluded.results.review.linear.n).toBe(detail.closure.results.raw.linear.n - 1);

      // Nothing wider than the phone, no serious accessibility problem.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      a = pointsAnswer(page);
      again = detailAnswer(page);
      await page.getByTestId('excluded-points').getByRole('button', { name: 'Put back' }).click();
      const back = (await (await a).json()).record;
      await again;
      expect(back.reviewExclusions).toEqual([]);
      expect(back.fluxUmolM2S).toBe(detail.closure.fluxUmolM2S);
      await page.getByTestId('history').getByText(`points left out: ${excluded.reviewExclusions[0].index} (Spike) → none`).waitFor();
    });
  });
});
