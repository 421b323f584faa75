/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { Page } from 'playwright-core';
import {
  DemoRole,
  destinationNames,
  goOffline,
  installabilityErrors,
  seriousAccessibilityProblems,
  signInAs,
  waitForServiceWorkerControl,
} from './support/app-actions';
import { browserSuite } from './support/suite';

// The project-level testTimeout in jest.config.js does not reach these tests (measured: 5 s).
jest.setTimeout(120_000);

const suite = browserSuite();
const inBrowser = suite.inBrowser;

async function userMenuText(page: Page): Promise<string> {
  return (await page.getByTestId('user-menu').innerText()).trim();
}

const expected: Record<DemoRole, { names: string[]; landing: string }> = {
  crew: { names: ['Walk'], landing: '/walk' },
  lead: { names: ['Walk', 'Board', 'Setup'], landing: '/walk' },
  lab: { names: ['Bench'], landing: '/bench' },
  admin: { names: ['Setup'], landing: '/setup' },
};

describe('App shell in Chromium', () => {
  for (const role of Object.keys(expected) as DemoRole[]) {
    it(`when the ${role} demo user signs in, then they see exactly their destinations and can sign out`, async () => {
      await inBrowser(`destinations-${role}`, async (page) => {
        const user = await signInAs(page, suite.server.baseUrl, role);

        expect(new URL(page.url()).pathname).toBe(expected[role].landing);
        expect(await destinationNames(page)).toEqual(expected[role].names);
        expect(await userMenuText(page)).toContain(user.displayName);

        await page.getByTestId('user-menu').click();
        await page.getByRole('menuitem', { name: 'Sign out', exact: true }).click();
        await page.waitForURL((url) => url.pathname === '/sign-in');
        expect(await page.evaluate(() => localStorage.getItem('fw.session'))).toBeNull();
      });
    });
  }

  it("when the lead signs out and removes this device's data, then their IndexedDB database and Board copies are gone; plain sign-out keeps them", async () => {
    await inBrowser('sign-out-remove', async (page) => {
      const databases = () => page.evaluate(async () => (await indexedDB.databases()).map((d) => d.name ?? ''));
      const keptFor = (id: string) => page.evaluate((userId) => Object.keys(localStorage).filter((k) => k.split('.').includes(userId)), id);
      const user = await signInAs(page, suite.server.baseUrl, 'lead');
      const dbName = `fluxwalk-user-${user.id}`;
      await page.goto(`${suite.server.baseUrl}/board`, { waitUntil: 'load' });
      await page.waitForFunction((id) => Object.keys(localStorage).some((k) => k.startsWith(`fw.board.${id}.`)), user.id, {
        timeout: 30_000,
      });
      expect(await databases()).toContain(dbName);

      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitem', { name: 'Sign out', exact: true }).click();
      await page.waitForURL((url) => url.pathname === '/sign-in');
      expect(await databases()).toContain(dbName); // plain sign-out keeps the user's data for next time
      expect((await keptFor(user.id)).length).toBeGreaterThan(0);

      await signInAs(page, suite.server.baseUrl, 'lead');
      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitem', { name: "Sign out and remove this device's data" }).click();
      await page.waitForURL((url) => url.pathname === '/sign-in');
      await page.waitForFunction(async (name) => !(await indexedDB.databases()).some((d) => d.name === name), dbName, { timeout: 30_000 });
      expect(await keptFor(user.id)).toEqual([]);
      expect(await page.evaluate(() => localStorage.getItem('fw.session'))).toBeNull();
    });
  });

  it('when a crew user opens Board by its address, then they land on Walk', async () => {
    await inBrowser('crew-board-address', async (page) => {
      await signInAs(page, suite.server.baseUrl, 'crew');
      await page.goto(`${suite.server.baseUrl}/board`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk' }).waitFor();
      expect(new URL(page.url()).pathname).toBe('/walk');
    });
  });

  it('when the crew reloads offline after the service worker took control, then Walk opens with their name', async () => {
    await inBrowser('crew-offline-reload', async (page, b) => {
      // From the bare address, as someone opening the installed app would.
      const user = await signInAs(page, suite.server.baseUrl, 'crew', '/');
      expect(new URL(page.url()).pathname).toBe('/walk');
      await waitForServiceWorkerControl(page);

      await goOffline(b.context);
      await page.reload({ waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk' }).waitFor({ timeout: 15_000 });

      expect(new URL(page.url()).pathname).toBe('/walk');
      expect(await userMenuText(page)).toContain(user.displayName);
      expect(await destinationNames(page)).toEqual(['Walk']);
      // The app's own fonts came from the worker's cache, not from any other host.
      const fonts = await page.evaluate(async () => ({
        text: (await document.fonts.load('16px "Source Sans 3"')).length,
        icons: (await document.fonts.load('24px "Material Symbols Outlined"')).length,
      }));
      expect(fonts.text).toBeGreaterThan(0);
      expect(fonts.icons).toBeGreaterThan(0);
    });
  });

  it('when a request fails while offline, then "Offline" is shown and no error dialog', async () => {
    await inBrowser('offline-request', async (page, b) => {
      await signInAs(page, suite.server.baseUrl, 'lead');
      await goOffline(b.context);

      // Other parts of the app (sync) may also be calling the API; this waits for the menu's own request.
      const failed = page.waitForEvent('requestfailed', (r) => new URL(r.url()).pathname === '/api/auth/me');
      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitem', { name: 'Refresh account and sites' }).click();
      expect((await failed).url()).toContain('/api/auth/me');

      // Said once: the sync chip's status; no second badge and no snackbar over the screen.
      await page
        .getByTestId('sync-label')
        .filter({ hasText: /^Offline/ })
        .waitFor();
      expect(await page.getByText(/Offline/).count()).toBe(1);
      expect(await page.locator('mat-snack-bar-container').count()).toBe(0);
      expect(await page.getByRole('dialog').count()).toBe(0);
      expect(await page.getByRole('alertdialog').count()).toBe(0);
      // The screen the user was on stays.
      expect(new URL(page.url()).pathname).toBe('/walk');
      await page.keyboard.press('Escape');
    });
  });

  it('when installed from the shell, then Chromium reports no installability errors', async () => {
    await inBrowser('installability', async (page, b) => {
      await signInAs(page, suite.server.baseUrl, 'crew');
      await waitForServiceWorkerControl(page);
      expect(await installabilityErrors(b.context, page)).toEqual([]);
    });
  });

  it('when checked with axe-core, then the sign-in page and the shell have no serious or critical violation', async () => {
    await inBrowser('accessibility', async (page) => {
      await page.goto(`${suite.server.baseUrl}/sign-in`, { waitUntil: 'networkidle' });
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      // The sign-in page with an error message on it.
      await page.getByLabel('E-mail').fill('crew@fluxwalk.example');
      await page.getByLabel('Password').fill('not-the-password');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('alert').filter({ hasText: /./ }).waitFor();
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      await signInAs(page, suite.server.baseUrl, 'lead');
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      await page.getByTestId('user-menu').click();
      await page.getByRole('menu').waitFor();
      expect(await seriousAccessibilityProblems(page)).toEqual([]);
      await page.keyboard.press('Escape');
    });
  });

  it('when outdoor contrast and a site are chosen, then both are remembered after a reload', async () => {
    await inBrowser('remembered-choices', async (page) => {
      await signInAs(page, suite.server.baseUrl, 'lead');
      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitemcheckbox', { name: 'Outdoor contrast' }).click();
      // The class follows the setting on the next change detection, not within the click.
      await page.waitForFunction(() => document.documentElement.classList.contains('fw-outdoor'), undefined, { timeout: 5_000 });

      await page.getByTestId('user-menu').click();
      const sites = page.getByRole('menuitemradio');
      const siteCount = await sites.count();
      expect(siteCount).toBeGreaterThan(0);
      const lastSite = (await sites.nth(siteCount - 1).innerText()).replace(/radio_button_\w+/, '').trim();
      await sites.nth(siteCount - 1).click();

      await page.reload({ waitUntil: 'load' });
      await page.getByRole('navigation', { name: 'Screens' }).waitFor();
      await page.waitForFunction(() => document.documentElement.classList.contains('fw-outdoor'), undefined, { timeout: 5_000 });
      expect((await page.getByTestId('current-site').innerText()).trim()).toBe(lastSite);
      // Outdoor contrast must stay accessible too.
      expect(await seriousAccessibilityProblems(page)).toEqual([]);
    });
  });

  it('when the app runs, then it asks no host other than its own server', async () => {
    await inBrowser('own-host-only', async (page) => {
      const hosts = new Set<string>();
      page.on('request', (r) => {
        const url = new URL(r.url());
        if (url.protocol.startsWith('http')) hosts.add(url.host);
      });
      await signInAs(page, suite.server.baseUrl, 'lead');
      await page.waitForLoadState('networkidle');
      expect([...hosts]).toEqual([new URL(suite.server.baseUrl).host]);
    });
  });
});
