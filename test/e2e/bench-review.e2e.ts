/// <reference lib="dom" />
import { Page } from 'playwright-core';
import { signInAs } from './support/app-actions';
import { RunningServer, startAppServer } from './support/app-server';
import { Browser, launchBrowser, withScreenshotOnFailure } from './support/browser';

jest.setTimeout(180_000);

let server: RunningServer;
let browser: Browser | null = null;

beforeAll(async () => {
  server = await startAppServer();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

const queueAnswer = (page: Page) => page.waitForResponse((r) => r.url().includes('/api/bench/queue') && r.status() === 200);
const detailAnswer = (page: Page) => page.waitForResponse((r) => /\/api\/bench\/closures\/[0-9a-f-]+$/.test(new URL(r.url()).pathname) && r.status() === 200);
const patchAnswer = (page: Page) => page.waitForResponse((r) => r.url().includes('/api/closures/') && r.request().method() === 'PATCH');

async function title(page: Page): Promise<string> {
  return (await page.locator('#closure-title').innerText()).trim();
}

/** Moves focus off the filter fields so the Bench's keys reach the page, as a click on the page does. */
async function focusPage(page: Page): Promise<void> {
  await page.getByRole('heading', { name: 'Bench', level: 1 }).click();
}

describe('Bench review in Chromium', () => {
  it('when the lab filters by a flag and reviews with the keyboard, then decisions, a moved settle time and a bulk accept are saved', async () => {
    browser = await launchBrowser();
    const page = browser.page;
    await withScreenshotOnFailure(page, 'bench-review', async () => {
      const loaded = queueAnswer(page);
      await signInAs(page, server.baseUrl, 'lab');
      expect(new URL(page.url()).pathname).toBe('/bench');
      await loaded;

      // Filter: one QC flag, unreviewed only.
      let q = queueAnswer(page);
      await page.locator('select[name=flag]').selectOption('exp-linear-ratio-high');
      await q;
      q = queueAnswer(page);
      let d = detailAnswer(page);
      await page.locator('select[name=reviewState]').selectOption('unreviewed');
      const filtered = await (await q).json();
      await d;
      expect(filtered.total).toBeGreaterThanOrEqual(3);
      expect(filtered.items.every((i: { flags: string[] }) => i.flags.includes('exp-linear-ratio-high'))).toBe(true);
      await focusPage(page);

      // 1st: accept with A; the Bench moves on to the next closure.
      const first = await title(page);
      let p = patchAnswer(page);
      d = detailAnswer(page);
      await page.keyboard.press('a');
      expect((await (await p).json()).record.reviewState).toBe('accepted');
      await d;
      await page.waitForFunction((t) => document.querySelector('#closure-title')?.textContent?.trim() !== t, first);

      // 2nd: widen the settle time with ] and see the flux change, then accept it with A.
      const fluxBefore = (await page.getByTestId('flux').innerText()).trim();
      p = patchAnswer(page);
      d = detailAnswer(page);
      await page.keyboard.press(']');
      const moved = (await (await p).json()).record;
      await d;
      expect(moved.reviewSettleS).toBe(moved.settleS + 5);
      await page.waitForFunction((f) => document.querySelector('[data-testid="flux"]')?.textContent?.trim() !== f, fluxBefore);
      expect(Number((await page.getByTestId('flux').innerText()).trim())).toBeCloseTo(moved.fluxUmolM2S, 4);
      await focusPage(page);
      p = patchAnswer(page);
      d = detailAnswer(page);
      await page.keyboard.press('a');
      expect((await (await p).json()).record.reviewState).toBe('accepted');
      await d;

      // 3rd: R puts the cursor in the reason; Enter rejects with it.
      await page.keyboard.press('r');
      await page.keyboard.type('Curve bends over within a minute: chamber not sealed');
      p = patchAnswer(page);
      await page.keyboard.press('Enter');
      const rejected = (await (await p).json()).record;
      expect(rejected).toMatchObject({ reviewState: 'rejected', reviewReason: 'Curve bends over within a minute: chamber not sealed' });
      await page.getByTestId('review-state').filter({ hasText: 'rejected' }).waitFor();
      await page.getByTestId('history').getByText('reviewState: unreviewed → rejected').waitFor();

      // Bulk accept: unflagged, unreviewed closures of one campaign.
      q = queueAnswer(page);
      await page.locator('select[name=flag]').selectOption('none');
      await q;
      const campaign = (await page.locator('select[name=campaignId]').locator('option').nth(1).getAttribute('value'))!;
      q = queueAnswer(page);
      await page.locator('select[name=campaignId]').selectOption(campaign);
      const before = await (await q).json();
      expect(before.total).toBeGreaterThan(0);
      const bulk = page.waitForResponse((r) => r.url().includes('/api/bench/bulk-accept'));
      q = queueAnswer(page);
      await page.getByRole('button', { name: 'Accept all without flags in this filter' }).click();
      expect((await (await bulk).json()).accepted).toBe(before.total);
      expect((await (await q).json()).total).toBe(0);
      await page.getByRole('status').filter({ hasText: `${before.total} closures without flags accepted` }).waitFor();
    });
  });
});
