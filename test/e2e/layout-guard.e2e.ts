/// <reference lib="dom" />
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Page } from 'playwright-core';
import { DemoRole, signInAs } from './support/app-actions';
import { axeFindings, layoutFindings, type LayoutFinding } from './support/layout-checks';
import { browserSuite } from './support/suite';
import { waitForFirstSync } from './support/sync-actions';

jest.setTimeout(600_000);

const SHOTS = path.resolve(__dirname, '../../test-results/layout');
const WIDTHS = [
  { name: '390', viewport: { width: 390, height: 844 }, touch: true },
  { name: '1366', viewport: { width: 1366, height: 768 }, touch: false },
];

/** One main screen: how to reach it from the previous one, and when it has drawn. */
interface Screen {
  name: string;
  open(page: Page, baseUrl: string): Promise<void>;
  /** A Walk screen (used at the collar, with gloves): every target at least 48×48 CSS px, not WCAG's 24. */
  walk?: boolean;
}

const tab =
  (name: string): Screen['open'] =>
  async (page) => {
    await page.getByRole('tab', { name, exact: true }).click();
    await page.getByRole('tab', { name, exact: true, selected: true }).waitFor();
  };

/**
 * One collar's visit page, opened from the route screen as the crew does: the next collar due, so
 * its forms are open as on arrival (any saved part, folded to a line with "Change", is unfolded).
 */
async function openVisit(page: Page, base: string): Promise<void> {
  await page.goto(`${base}/walk`);
  const next = page.getByTestId('next-collar').getByRole('link');
  const code = (await next.locator('.big-code').innerText()).trim();
  await next.click();
  await page.getByTestId('visit-code').filter({ hasText: code }).waitFor();
  await page.getByTestId('visit-bar').waitFor();
  await page.getByTestId('air-temp').or(page.getByTestId('conditions-saved')).first().waitFor();
  // A save the page makes as it opens folds its section again: let the forms' autosave pause (900 ms) pass first.
  await page.waitForTimeout(1500);
  for (const section of ['Conditions', 'Offset set', 'Probes']) {
    const change = page.getByRole('region', { name: section }).getByRole('button', { name: 'Change', exact: true });
    if (await change.isVisible()) await change.click();
  }
  await page.getByTestId('air-temp').waitFor();
  await page.getByTestId('offset-1').waitFor();
  await page.getByTestId('moisture-raw').waitFor();
  await page.evaluate(() => window.scrollTo(0, 0)); // as it opens: the sticky header over nothing scrolled under it
}

/**
 * The same page with the chamber on (the day's analyzer picked in the bar if asked): the running
 * closure's card and the timer. A closure this page's collar still runs from the phone-size test
 * is the same screen.
 */
async function startClosure(page: Page): Promise<void> {
  const bar = page.getByTestId('visit-bar');
  const on = bar.getByRole('button', { name: 'Chamber on' });
  const off = bar.getByRole('button', { name: 'Chamber off' });
  const gate = page.getByTestId('day-kit-gate');
  await on.or(off).or(gate).first().waitFor();
  if (await gate.isVisible()) {
    await gate.getByRole('button').first().click();
    await on.or(off).first().waitFor();
  }
  if (await on.isVisible()) await on.click();
  await page.getByTestId('closure-timer').waitFor();
  await off.waitFor();
  await page.locator('fw-closure-card').first().waitFor();
  await page.evaluate(() => window.scrollTo(0, 0));
}

const SCREENS: Record<DemoRole, Screen[]> = {
  crew: [
    {
      name: 'walk-route',
      walk: true,
      open: async (page) => {
        await waitForFirstSync(page);
        await page.getByTestId('route-list').waitFor();
      },
    },
    {
      name: 'walk-map',
      walk: true,
      open: async (page) => {
        await page.getByRole('link', { name: 'Map', exact: true }).click();
        await page.locator('.leaflet-container').waitFor();
      },
    },
    { name: 'walk-visit', walk: true, open: openVisit },
    { name: 'walk-visit-running', walk: true, open: startClosure },
  ],
  lead: [
    {
      name: 'board-progress',
      open: async (page, base) => {
        await page.goto(`${base}/board`);
        await page.getByTestId('campaign-select').waitFor();
        await page.locator('[data-testid="progress-row"]').first().waitFor();
      },
    },
    ...['Plan', 'Map', 'Anomalies', 'Devices', 'Digest'].map((t) => ({ name: `board-${t.toLowerCase()}`, open: tab(t) })),
    {
      name: 'setup-collars',
      open: async (page, base) => {
        await page.goto(`${base}/setup`);
        await tab('Collars')(page, base);
      },
    },
    { name: 'setup-routes', open: tab('Routes') },
  ],
  lab: [
    {
      name: 'bench-queue',
      open: async (page) => {
        await page.getByTestId('queue-total').filter({ hasText: /[1-9]/ }).waitFor();
      },
    },
    {
      name: 'bench-review',
      open: async (page) => {
        await page.getByTestId('review-state').waitFor();
        await page.getByTestId('history').scrollIntoViewIfNeeded();
      },
    },
    {
      name: 'bench-results',
      open: async (page) => {
        await page.getByRole('button', { name: 'Results' }).click();
        await page.getByTestId('summary-table').waitFor();
      },
    },
    {
      name: 'bench-response',
      open: async (page) => {
        await page.getByRole('tab', { name: 'Temperature response' }).click();
        await page.getByTestId('response-table').waitFor();
      },
    },
    {
      name: 'bench-seasonal',
      open: async (page) => {
        await page.getByRole('tab', { name: 'Seasonal totals' }).click();
        await page.getByTestId('seasonal-table').waitFor();
      },
    },
    { name: 'bench-package', open: tab('Data package') },
  ],
  admin: [
    {
      name: 'setup-site',
      open: async (page, base) => {
        await page.goto(`${base}/setup`);
        await page.getByRole('tab', { name: 'Site', selected: true }).waitFor();
      },
    },
    ...['Plots and treatments', 'Members', 'Equipment', 'Collars', 'Routes'].map((t) => ({
      name: `setup-${t.split(' ')[0].toLowerCase()}`,
      open: tab(t),
    })),
    {
      name: 'accounts-invite',
      open: async (page, base) => {
        await page.goto(`${base}/accounts/invite`);
        await page.getByRole('heading', { name: 'Invite someone' }).waitFor();
      },
    },
    {
      name: 'accounts-password',
      open: async (page, base) => {
        await page.goto(`${base}/accounts/password`);
        await page.getByRole('heading', { name: 'Change your password' }).waitFor();
      },
    },
  ],
};

describe('Layout guard: every main screen of every role, on a phone and at the station', () => {
  const suite = browserSuite();

  for (const role of Object.keys(SCREENS) as DemoRole[]) {
    for (const width of WIDTHS) {
      it(`${role} at ${width.name} px: no page wider than the screen, nothing cut or covered, Material controls only, targets ≥ 24 px (48 px on Walk), no axe finding`, async () => {
        const all: Record<string, LayoutFinding[]> = {};
        await suite.inBrowser(
          `layout-${role}-${width.name}`,
          async (page) => {
            const user = await signInAs(page, suite.server.baseUrl, role);
            mkdirSync(SHOTS, { recursive: true });
            // The header names the site the data belongs to, and a phone spends at most 64 px on it when there is one screen to go to.
            await page.getByTestId('current-site').filter({ hasText: /\S/ }).waitFor();
            const header = (await page.locator('header.top').boundingBox())!;
            const screens = await page.getByRole('navigation', { name: 'Screens' }).getByRole('link').count();
            if (width.touch && screens === 1 && header.height > 64)
              all['header'] = [{ check: 'header', where: `header ${header.height} px high for ${user.email}'s one screen` }];
            for (const screen of SCREENS[role]) {
              await screen.open(page, suite.server.baseUrl);
              await page.waitForTimeout(400); // let late rows and charts settle
              const found = [...(await layoutFindings(page, { minTargetPx: screen.walk ? 48 : 24 })), ...(await axeFindings(page))];
              await page.screenshot({ path: path.join(SHOTS, `${role}-${screen.name}-${width.name}.png`), fullPage: true });
              all[screen.name] = found;
            }
          },
          { viewport: width.viewport, hasTouch: width.touch },
        );
        writeFileSync(path.join(SHOTS, `${role}-${width.name}.json`), JSON.stringify({ findings: all }, null, 1));
        expect(all).toEqual(Object.fromEntries(Object.keys(all).map((k) => [k, []])));
        expect(Object.keys(all)).toEqual(expect.arrayContaining(SCREENS[role].map((x) => x.name)));
      });
    }
  }
});
