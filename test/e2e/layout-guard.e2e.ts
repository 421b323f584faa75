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
interface Screen { name: string; open(page: Page, baseUrl: string): Promise<void> }

const tab = (name: string): Screen['open'] => async (page) => {
  await page.getByRole('tab', { name, exact: true }).click();
  await page.getByRole('tab', { name, exact: true, selected: true }).waitFor();
};

const SCREENS: Record<DemoRole, Screen[]> = {
  crew: [
    { name: 'walk-route', open: async (page) => { await waitForFirstSync(page); await page.getByTestId('route-list').waitFor(); } },
    { name: 'walk-map', open: async (page) => { await page.getByRole('link', { name: 'Map', exact: true }).click(); await page.locator('.leaflet-container').waitFor(); } },
  ],
  lead: [
    { name: 'board-progress', open: async (page, base) => { await page.goto(`${base}/board`); await page.getByTestId('campaign-select').waitFor(); await page.locator('[data-testid="progress-row"]').first().waitFor(); } },
    ...['Plan', 'Map', 'Anomalies', 'Devices', 'Digest'].map((t) => ({ name: `board-${t.toLowerCase()}`, open: tab(t) })),
    { name: 'setup-collars', open: async (page, base) => { await page.goto(`${base}/setup`); await tab('Collars')(page, base); } },
    { name: 'setup-routes', open: tab('Routes') },
  ],
  lab: [
    { name: 'bench-queue', open: async (page) => { await page.getByTestId('queue-total').filter({ hasText: /[1-9]/ }).waitFor(); } },
    { name: 'bench-review', open: async (page) => { await page.getByTestId('review-state').waitFor(); await page.getByTestId('history').scrollIntoViewIfNeeded(); } },
    { name: 'bench-results', open: async (page) => { await page.getByRole('button', { name: 'Results' }).click(); await page.getByTestId('summary-table').waitFor(); } },
    { name: 'bench-response', open: async (page) => { await page.getByRole('tab', { name: 'Temperature response' }).click(); await page.getByTestId('response-table').waitFor(); } },
    { name: 'bench-seasonal', open: async (page) => { await page.getByRole('tab', { name: 'Seasonal totals' }).click(); await page.getByTestId('seasonal-table').waitFor(); } },
    { name: 'bench-package', open: tab('Data package') },
  ],
  admin: [
    { name: 'setup-site', open: async (page, base) => { await page.goto(`${base}/setup`); await page.getByRole('tab', { name: 'Site', selected: true }).waitFor(); } },
    ...['Plots and treatments', 'Members', 'Equipment', 'Collars', 'Routes'].map((t) => ({ name: `setup-${t.split(' ')[0].toLowerCase()}`, open: tab(t) })),
    { name: 'accounts-invite', open: async (page, base) => { await page.goto(`${base}/accounts/invite`); await page.getByRole('heading', { name: 'Invite someone' }).waitFor(); } },
    { name: 'accounts-password', open: async (page, base) => { await page.goto(`${base}/accounts/password`); await page.getByRole('heading', { name: 'Change your password' }).waitFor(); } },
  ],
};

/**
 * Findings that belong to parts another piece of the work owns (Setup's analyzer checks):
 * they are reported as pending, by name and with the reason, and do not fail this file. Anything
 * else found on those screens fails.
 */
const PENDING: { screen: RegExp; check: LayoutFinding['check']; where: RegExp; note: string }[] = [
  { screen: /^setup-equipment$/, check: 'cut-off', where: /^fw-analyzer-checks > /, note: 'the analyzer checks table is wider than a phone; the analyzer checks are being reworked separately' },
];

describe('Layout guard: every main screen of every role, on a phone and at the station', () => {
  const suite = browserSuite();

  for (const role of Object.keys(SCREENS) as DemoRole[]) {
    for (const width of WIDTHS) {
      it(`${role} at ${width.name} px: no page wider than the screen, nothing cut or covered, Material controls only, targets ≥ 24 px, no axe finding`, async () => {
        const all: Record<string, LayoutFinding[]> = {};
        const pending: string[] = [];
        await suite.inBrowser(`layout-${role}-${width.name}`, async (page, b) => {
          await b.page.setViewportSize(width.viewport);
          const user = await signInAs(page, suite.server.baseUrl, role);
          mkdirSync(SHOTS, { recursive: true });
          // The header names the site the data belongs to, and a phone spends at most 64 px on it when there is one screen to go to.
          await page.getByTestId('current-site').filter({ hasText: /\S/ }).waitFor();
          const header = (await page.locator('header.top').boundingBox())!;
          const screens = (await page.getByRole('navigation', { name: 'Screens' }).getByRole('link').count());
          if (width.touch && screens === 1 && header.height > 64) all['header'] = [{ check: 'header', where: `header ${header.height} px high for ${user.email}'s one screen` }];
          for (const screen of SCREENS[role]) {
            await screen.open(page, suite.server.baseUrl);
            await page.waitForTimeout(400); // let late rows and charts settle
            const found = [...(await layoutFindings(page)), ...(await axeFindings(page))];
            await page.screenshot({ path: path.join(SHOTS, `${role}-${screen.name}-${width.name}.png`), fullPage: true });
            all[screen.name] = found.filter((f) => {
              const p = PENDING.find((x) => x.screen.test(screen.name) && x.check === f.check && x.where.test(f.where));
              if (p) pending.push(`${screen.name} ${f.check}: ${f.where} — ${p.note}`);
              return !p;
            });
          }
        });
        writeFileSync(path.join(SHOTS, `${role}-${width.name}.json`), JSON.stringify({ findings: all, pending }, null, 1));
        if (pending.length) console.warn(`PENDING (owned by the Walk screens' work, not fixed here):\n${pending.join('\n')}`);
        expect(all).toEqual(Object.fromEntries(Object.keys(all).map((k) => [k, []])));
        expect(Object.keys(all)).toEqual(expect.arrayContaining(SCREENS[role].map((x) => x.name)));
      });
    }
  }
});
