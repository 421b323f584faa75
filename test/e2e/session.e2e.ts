/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { Page } from 'playwright-core';
import { DEMO_PASSWORD, signInAs } from './support/app-actions';
import { browserSuite } from './support/suite';
import { waitForFirstSync } from './support/sync-actions';

// The project-level testTimeout in jest.config.js does not reach these tests (measured: 5 s).
jest.setTimeout(120_000);

const suite = browserSuite();
const inBrowser = suite.inBrowser;

async function signInMessage(page: Page): Promise<string> {
  const alert = page.getByRole('alert').filter({ hasText: /\S/ });
  await alert.waitFor();
  // The text without the icon's ligature name.
  return (await alert.locator('span').innerText()).trim();
}

describe('Signing in and sessions in Chromium', () => {
  it('when the password is wrong, then the form says so and stays on sign-in', async () => {
    await inBrowser('wrong-password', async (page) => {
      await page.goto(`${suite.server.baseUrl}/sign-in`, { waitUntil: 'load' });
      await page.getByLabel('E-mail').fill('crew@fluxwalk.example');
      await page.getByLabel('Password').fill('not-the-password');
      await page.getByRole('button', { name: 'Sign in' }).click();
      expect(await signInMessage(page)).toMatch(/password/i);
      expect(new URL(page.url()).pathname).toBe('/sign-in');
      expect(await page.evaluate(() => localStorage.getItem('fw.session'))).toBeNull();
    });
  });

  it('when sign-in is paused after many failures, then the form explains the wait', async () => {
    await inBrowser('too-many-attempts', async (page) => {
      await page.goto(`${suite.server.baseUrl}/sign-in`, { waitUntil: 'load' });
      // An address nobody uses, so the pause cannot block the other tests' demo users.
      const email = 'nobody-here@fluxwalk.example';
      const { token } = (await (await page.request.get(`${suite.server.baseUrl}/api/auth/csrf`)).json()) as { token: string };
      let status = 0;
      for (let i = 0; i < 30 && status !== 429; i++) {
        const res = await page.request.post(`${suite.server.baseUrl}/api/auth/login`, {
          headers: { 'X-CSRF-Token': token },
          data: { email, password: 'wrong' },
        });
        status = res.status();
        expect([401, 429]).toContain(status);
      }
      expect(status).toBe(429);

      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password').fill('wrong');
      await page.getByRole('button', { name: 'Sign in' }).click();
      expect(await signInMessage(page)).toMatch(/^Too many failed sign-in attempts with this e-mail\..*try again (in|later)/);
    });
  });

  it('when the server ends the session, then "sign in again" keeps the current screen', async () => {
    await inBrowser('sign-in-again', async (page, b) => {
      const user = await signInAs(page, suite.server.baseUrl, 'lead');
      await page.getByRole('link', { name: 'Setup' }).click();
      await page.getByRole('heading', { name: 'Setup' }).waitFor();

      // A marker that a page reload would wipe: the screen must stay, not be rebuilt.
      await page.evaluate(() => ((window as unknown as { fwMarker: number }).fwMarker = 42));
      // The first sync runs after sign-in; its answers renew the (rolling) session cookie, so
      // the cookie is dropped only once nothing is in flight any more.
      await waitForFirstSync(page);
      await page.waitForLoadState('networkidle');
      // The session cookie disappears as if the server had dropped the session.
      await b.context.clearCookies();
      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitem', { name: 'Refresh account and sites' }).click();
      await page.getByText('Your session has ended.').waitFor();
      expect(new URL(page.url()).pathname).toBe('/setup');

      await page.getByRole('button', { name: 'Sign in again' }).click();
      const dialog = page.getByRole('dialog', { name: 'Sign in again' });
      await dialog.getByLabel('Password').fill(DEMO_PASSWORD);
      const [login] = await Promise.all([
        page.waitForResponse((r) => r.url().endsWith('/api/auth/login')),
        dialog.getByRole('button', { name: 'Sign in' }).click(),
      ]);
      expect(login.status()).toBe(200);
      await dialog.waitFor({ state: 'detached' });

      await page.getByText('Your session has ended.').waitFor({ state: 'detached' });
      expect(new URL(page.url()).pathname).toBe('/setup');
      expect(await page.getByTestId('user-menu').innerText()).toContain(user.displayName);
      expect(await page.evaluate(() => (window as unknown as { fwMarker?: number }).fwMarker)).toBe(42);
      // The new session works for the app's own requests: refreshing raises no new banner.
      const me = page.waitForResponse((r) => r.url().endsWith('/api/auth/me'));
      await page.getByTestId('user-menu').click();
      await page.getByRole('menuitem', { name: 'Refresh account and sites' }).click();
      expect((await me).status()).toBe(200);
      expect(await page.getByText('Your session has ended.').count()).toBe(0);
    });
  });
});
