/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import path from 'node:path';
import { signInAs } from './support/app-actions';
import { browserSuite, queryE2eDatabase } from './support/suite';
import { waitForFirstSync } from './support/sync-actions';
import { PHONE } from './support/walk-actions';

jest.setTimeout(600_000);

const EXTRA = 2000;

/** EXTRA more collars at the end of every route of the first site, logged so devices pull them. */
async function lengthenRoutes(): Promise<void> {
  await queryE2eDatabase(`
    WITH first AS (SELECT p.site_id, p.id AS plot_id FROM plot p JOIN site s ON s.id = p.site_id ORDER BY s.name, p.code LIMIT 1),
    lock AS (SELECT pg_advisory_xact_lock(72011)),
    made AS (
      INSERT INTO collar (id, site_id, code, plot_id, shape, diameter_cm, area_cm2, notes)
      SELECT gen_random_uuid(), first.site_id, 'L-' || lpad(g::text, 5, '0'), first.plot_id, 'round', 20, 314.159, ''
        FROM first, lock, generate_series(1, ${EXTRA}) g RETURNING id, site_id, code),
    logged AS (
      INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted)
      SELECT nextval('change_seq'), 'collar', id, 1, site_id, ARRAY['code'], false FROM (SELECT * FROM made ORDER BY code) m),
    routes AS (
      UPDATE route SET collar_ids = collar_ids || (SELECT array_agg(id ORDER BY code) FROM made), rev = rev + 1
       WHERE site_id = (SELECT site_id FROM first) RETURNING id, rev, site_id)
    INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted)
    SELECT nextval('change_seq'), 'route', id, rev, site_id, ARRAY['collarIds'], false FROM routes`);
}

describe('Walk on a route of thousands of collars', () => {
  const suite = browserSuite();

  it('when the route holds 2 000 more collars, then only rows near the screen are drawn, Tab walks row by row past them, the last collar is reached by scrolling and opens', async () => {
    await lengthenRoutes();
    await suite.inBrowser('walk-long-route', async (page) => {
      await page.setViewportSize(PHONE);
      await signInAs(page, suite.server.baseUrl, 'crew');
      await waitForFirstSync(page, 180_000);
      await page.goto(`${suite.server.baseUrl}/walk`, { waitUntil: 'load' });
      const rows = page.locator('[data-testid="route-list"] li');
      await rows.first().waitFor();
      const total = Number(await rows.first().getAttribute('aria-setsize'));
      expect(total).toBeGreaterThan(EXTRA);
      // The heading counts every collar of the route, drawn or not.
      const counted = async () =>
        (await page.locator('#list-title').innerText())
          .match(/\d+/g)!
          .map(Number)
          .reduce((a, b) => a + b, 0);
      expect(await counted()).toBe(total);
      expect(await rows.count()).toBeLessThan(60);
      await page.locator('#list-title').evaluate((h) => h.scrollIntoView());
      await page.screenshot({ path: path.resolve(__dirname, '../../test-results/walk-long-route.png') });
      await page.evaluate(() => window.scrollTo(0, 0));

      // Keyboard: from the first row, 40 presses of Tab land on the 41st row (most of them were not drawn at first).
      await rows.first().locator('a').focus();
      for (let i = 0; i < 40; i++) {
        await page.keyboard.press('Tab');
        await page.waitForTimeout(30); // the list draws the next rows on the scroll that focus causes
      }
      const focused = await page.evaluate(() => {
        const li = document.activeElement?.closest('li');
        const r = document.activeElement?.getBoundingClientRect();
        return { at: li?.getAttribute('aria-posinset') ?? null, shown: !!r && r.top >= 0 && r.bottom <= innerHeight };
      });
      expect(focused).toEqual({ at: '41', shown: true });

      // The end of the list: scrolled to, drawn, and its collar opens.
      await page.evaluate(() => window.scrollTo(0, document.documentElement.scrollHeight));
      const last = page.locator(`[data-testid="route-list"] li[aria-posinset="${total}"] a`);
      await last.waitFor();
      expect(await rows.count()).toBeLessThan(60);
      const code = (await last.locator('.code').innerText()).trim();
      // A tap (the locator finds the row again at the moment of the tap: the list may still be placing rows after the scroll).
      await last.click();
      await page.getByTestId('visit-code').filter({ hasText: code }).waitFor();

      // Back on the route: the list is there at once, still drawn in part only.
      await page.locator('a', { hasText: 'Back to the route' }).click();
      await rows.first().waitFor();
      expect(await rows.count()).toBeLessThan(60);
    });
  });
});
