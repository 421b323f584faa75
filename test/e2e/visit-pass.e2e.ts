/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { seriousAccessibilityProblems, signInAs, waitForServiceWorkerControl } from './support/app-actions';
import { waitForFirstSync } from './support/sync-actions';
import { VisitCounter } from './support/visit-counter';
import { PHONE, choose } from './support/walk-actions';
import { browserSuite } from './support/suite';

jest.setTimeout(600_000);

const suite = browserSuite();
const { server } = suite;

/** Before/after pictures for the change note (only when asked: VISIT_SCREENS=<folder>). */
async function noteShot(page: Page, name: string): Promise<void> {
  const dir = process.env['VISIT_SCREENS'];
  if (!dir) return;
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: `${dir}/${name}.png` });
}

/**
 * One closure as the analyzer logs it: a CO2 rise of 0.5 ppm/s every 2 s from chamber on to
 * chamber off, in the site's local time (Europe/Berlin, UTC+1 in December), the analyzer's clock
 * equal to the phone's.
 */
function loggerFile(onIso: string, seconds: number): Buffer {
  const on = Date.parse(onIso) + 3600_000;
  const lines = ['timestamp,co2_ppm,temp_c'];
  for (let t = 0; t <= seconds; t += 2)
    lines.push(`${new Date(on + t * 1000).toISOString().slice(0, 19).replace('T', ' ')},${(420 + 0.5 * t).toFixed(2)},8.00`);
  return Buffer.from(`${lines.join('\n')}\n`);
}

const CLOSURE_S = 120;

describe('One pass per collar on a phone', () => {
  it('when the crew does a full visit reusing the last offset set, then the taps, typed fields and scrolls are counted and within the target', async () => {
    await suite.inBrowser('visit-pass', { hasTouch: true, viewport: PHONE }, async (page) => {
      await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      await waitForServiceWorkerControl(page);
      await page.clock.install({ time: new Date('2026-12-04T08:20:00Z') });
      await page.clock.resume();
      await page.goto(`${server.baseUrl}/walk`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk', exact: true }).waitFor();

      // Start of day (not counted): the analyzer. The route shows it.
      await page.getByTestId('start-of-day-link').click();
      await page.getByRole('heading', { name: 'Start of day' }).waitFor();
      await choose(page, 'Analyzer', /.+/);
      await page.getByRole('link', { name: 'To the route' }).click();
      await page
        .getByTestId('start-of-day-link')
        .filter({ hasText: /· analyzer .+/ })
        .waitFor();
      await choose(page, 'Round', 'Round 2');
      await page.getByTestId('route-list').waitFor();

      // Collar A (not counted): the day's first logger import, which remembers the column mapping.
      await page.getByTestId('next-collar').getByRole('link').click();
      await page.getByTestId('visit-code').waitFor();
      await importClosure(page, null, '2026-12-04T08:30:00Z');

      // Collar B, counted from the moment it opens to the tap on "Next collar".
      const count = new VisitCounter();
      const next = page.getByTestId('next-collar-bar');
      const codeB = (await next.innerText()).trim().split(/\s+/).at(-1)!;
      await next.click();
      await page.getByTestId('visit-code').filter({ hasText: codeB }).waitFor();
      await noteShot(page, 'visit-after-open');
      await visitB(page, count);
      const summary = count.summary();
      // The number the change is judged by, printed for the closing note.
      console.log(`One visit at 390×844 with touch: ${summary}`);
      expect(count.count.scrolls).toBe(0);
      expect(count.count.taps).toBeLessThanOrEqual(12);
      expect(count.count.typedFields).toBeLessThanOrEqual(7);
      expect(await seriousAccessibilityProblems(page)).toEqual([]);
    });
  });
});

/** Chamber on, off after the profile's length, and the logger file of that closure through the import dialog. */
async function importClosure(page: Page, count: VisitCounter | null, on: string): Promise<void> {
  const tap = (l: ReturnType<Page['getByRole']>, name: string) => (count ? count.tap(l, name) : l.click());
  const bar = page.getByTestId('visit-bar');
  await page.clock.setSystemTime(new Date(on));
  await tap(bar.getByRole('button', { name: 'Chamber on' }), 'chamber on');
  await bar.getByRole('button', { name: 'Chamber off' }).waitFor();
  if (count) await duringTheClosure(page, count);
  await page.clock.setSystemTime(new Date(Date.parse(on) + CLOSURE_S * 1000));
  await page.getByTestId('closure-end').filter({ hasText: 'Closure length reached' }).waitFor();
  if (count) await noteShot(page, 'visit-after-timer');
  await tap(bar.getByRole('button', { name: 'Chamber off' }), 'chamber off');
  await bar.getByRole('button', { name: 'Chamber on' }).waitFor();
  await page.clock.setSystemTime(new Date(Date.parse(on) + (CLOSURE_S + 60) * 1000));

  await tap(page.getByRole('button', { name: 'Import logger file' }), 'import logger file');
  const dialog = page.getByRole('dialog');
  const file = { name: `closure-${on.slice(11, 16).replace(':', '')}.csv`, mimeType: 'text/csv', buffer: loggerFile(on, CLOSURE_S) };
  if (count) await count.pickFile(dialog.getByLabel('Logger file'), file, 'logger file');
  else await dialog.getByLabel('Logger file').setInputFiles(file);
  await tap(dialog.getByRole('button', { name: 'Read the file' }), 'read the file');
  await dialog.getByTestId('read-summary').waitFor();
  await tap(dialog.getByRole('button', { name: 'Save closures' }), 'save closures');
  await dialog.getByTestId('import-done').waitFor();
  expect((await dialog.getByTestId('import-done').innerText()).trim()).toMatch(/^1 closures? filled from/);
  await tap(dialog.getByRole('button', { name: 'Close' }), 'close');
  await dialog.waitFor({ state: 'detached' });
  // The flux of this closure, on the spot (0.5 ppm/s over 120 s).
  await page.locator('[data-closure] [data-testid="spot-flux"]').last().filter({ hasText: /µmol/ }).waitFor();
}

/** What the crew does while the chamber runs: conditions, the offset set as last time, the probes. */
async function duringTheClosure(page: Page, count: VisitCounter): Promise<void> {
  await noteShot(page, 'visit-after-running');
  const rain = page.getByRole('checkbox', { name: 'Rain in the last 24 h' });
  await count.tap(rain, 'rain 24 h');
  expect(await rain.isChecked()).toBe(true);
  await count.tap(page.getByTestId('offset-same'), 'same as last');
  await page.getByTestId('offset-saved').waitFor();
  // The conditions fold once the offsets are in (their own save waits for a pause after the tick).
  await page.getByTestId('conditions-saved').filter({ hasText: 'rain in the last 24 h' }).waitFor();
  await noteShot(page, 'visit-after-offsets');
  await count.type(page.getByTestId('soil-temp-1'), '6.4', 'soil temperature');
  await count.type(page.getByTestId('moisture-raw'), '23', 'moisture');
  await page
    .getByTestId('probe-saved')
    .filter({ hasText: /Saved: 6\.4 °C/ })
    .waitFor();
}

async function visitB(page: Page, count: VisitCounter): Promise<void> {
  await importClosure(page, count, '2026-12-04T08:40:00Z');
  await noteShot(page, 'closure-card-after');
  const next = page.getByTestId('next-collar-bar');
  const codeC = (await next.innerText()).trim().split(/\s+/).at(-1)!;
  await count.tap(next, 'next collar');
  await page.getByTestId('visit-code').filter({ hasText: codeC }).waitFor();
}
