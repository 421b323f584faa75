/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { browserSuite, queryE2eDatabase } from './support/suite';
import { syncNow, waitForFirstSync } from './support/sync-actions';
import { PHONE, choose } from './support/walk-actions';

jest.setTimeout(600_000);

const suite = browserSuite();
const { server } = suite;

/** This test's readings: the probe id typed here marks them. */
const PROBE = `REP-${Date.now().toString(36)}`;
const stored = () =>
  queryE2eDatabase<{ moisture_raw: number; deleted: boolean; taken_by_id: string | null }>(
    `SELECT moisture_raw, deleted, taken_by_id FROM probe_reading WHERE probe_id = $1 ORDER BY taken_at`,
    [PROBE],
  );
async function until<T>(read: () => Promise<T>, ok: (v: T) => boolean, what: string): Promise<T> {
  for (let i = 0; i < 60; i++) {
    const v = await read();
    if (ok(v)) return v;
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`timed out waiting for ${what}: ${JSON.stringify(await read())}`);
}

describe('Probe replicates on a phone', () => {
  it('when the crew takes three insertions at one collar and deletes one, then each is a record in PostgreSQL and the deleted one a tombstone', async () => {
    await suite.inBrowser('probe-replicates', { hasTouch: true, viewport: PHONE }, async (page) => {
      const user = await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      await page.goto(`${server.baseUrl}/walk`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk', exact: true }).waitFor();
      await choose(page, 'Round', 'Round 2');
      await page.locator('[data-testid="route-list"][data-round="2"]').waitFor();
      // The last collar of the route: other tests work the first ones. The list draws only rows near
      // the screen, so scroll to its end first.
      await page.evaluate(() => window.scrollTo(0, document.documentElement.scrollHeight));
      const size = await page.locator('[data-testid="route-list"] li').first().getAttribute('aria-setsize');
      await page.locator(`[data-testid="route-list"] li[aria-posinset="${size}"] a`).click();
      await page.getByTestId('visit-code').waitFor();

      await page.getByTestId('soil-temp-1').fill('8.2');
      await page.getByTestId('moisture-raw').fill('23.4');
      await page.getByLabel('Probe id').fill(PROBE);
      await page
        .getByTestId('probe-saved')
        .filter({ hasText: /Saved: 8\.2 °C/ })
        .waitFor();
      await page
        .getByTestId('probe-stats')
        .filter({ hasText: /^\s*1 replicate/ })
        .waitFor();

      // Each further insertion: one tap and one value.
      const add = page.getByTestId('add-replicate');
      for (const [n, v] of [
        [2, '25.1'],
        [3, '24.0'],
      ] as const) {
        const box = await add.boundingBox();
        expect(box!.height).toBeGreaterThanOrEqual(48);
        await add.tap();
        await page.getByTestId('moisture-raw').fill(v);
        await page
          .getByTestId('probe-stats')
          .filter({ hasText: new RegExp(`^\\s*${n} replicates`) })
          .waitFor();
      }
      // 23.4, 25.1, 24.0: mean 24.17, sample SD 0.86 (Python statistics.stdev).
      await page.getByTestId('probe-stats').filter({ hasText: 'VWC mean 24.2 %, SD 0.9 (n = 3)' }).waitFor();
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      await syncNow(page);
      const three = await until(stored, (r) => r.length === 3, 'three replicates on the server');
      expect(three.map((r) => [r.moisture_raw, r.deleted, r.taken_by_id])).toEqual([
        [23.4, false, user.id],
        [25.1, false, user.id],
        [24, false, user.id],
      ]);

      const del = page.getByRole('button', { name: 'Delete replicate 3' });
      expect((await del.boundingBox())!.height).toBeGreaterThanOrEqual(48);
      await del.tap();
      await page.getByRole('button', { name: 'Delete replicate 3' }).filter({ hasText: 'Delete replicate 3' }).tap();
      await page
        .getByTestId('probe-stats')
        .filter({ hasText: /^\s*2 replicates · VWC mean 24\.3 %/ })
        .waitFor();
      await syncNow(page);
      const after = await until(stored, (r) => r.some((x) => x.deleted), 'the tombstone');
      expect(after.map((r) => [r.moisture_raw, r.deleted])).toEqual([
        [23.4, false],
        [25.1, false],
        [24, true],
      ]);
    });
  });
});
