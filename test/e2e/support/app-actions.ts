/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import AxeBuilder from '@axe-core/playwright';
import { BrowserContext, Page } from 'playwright-core';

export const DEMO_PASSWORD = 'fluxwalk-demo';
export type DemoRole = 'crew' | 'lead' | 'lab' | 'admin';

export interface SignedInUser {
  id: string;
  email: string;
  displayName: string;
  roles: string[];
}

/** Signs in through the real form, as a person would, and returns the user the server sent. */
export async function signInAs(page: Page, baseUrl: string, who: DemoRole, startAt = '/sign-in'): Promise<SignedInUser> {
  await page.goto(`${baseUrl}${startAt}`, { waitUntil: 'load' });
  await page.getByLabel('E-mail').fill(`${who}@fluxwalk.example`);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  const [login] = await Promise.all([
    page.waitForResponse((r) => r.url().endsWith('/api/auth/login') && r.request().method() === 'POST'),
    page.getByRole('button', { name: 'Sign in' }).click(),
  ]);
  if (login.status() !== 200) throw new Error(`sign-in as ${who} answered ${login.status()}: ${await login.text()}`);
  const { user } = (await login.json()) as { user: SignedInUser };
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  await page.getByRole('navigation', { name: 'Screens' }).waitFor();
  return user;
}

/** Names of the destinations in the main navigation, as assistive technology reads them. */
export async function destinationNames(page: Page): Promise<string[]> {
  const links = page.getByRole('navigation', { name: 'Screens' }).getByRole('link');
  const names: string[] = [];
  for (const link of await links.all()) {
    names.push((await link.evaluate((el) => el.querySelector('.label')?.textContent ?? '')).trim());
  }
  return names;
}

/** Waits until the service worker controls the page (it installs on the first visit, then a reload). */
export async function waitForServiceWorkerControl(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
  await page.reload({ waitUntil: 'load' });
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 20_000 });
}

export async function goOffline(context: BrowserContext): Promise<void> {
  await context.setOffline(true);
}

export interface AxeProblem {
  id: string;
  impact: string;
  help: string;
  nodes: string[];
}

/** axe-core on the current page (WCAG 2.1 A/AA rules); returns the serious and critical findings. */
export async function seriousAccessibilityProblems(page: Page): Promise<AxeProblem[]> {
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => ({ id: v.id, impact: v.impact ?? '', help: v.help, nodes: v.nodes.map((n) => n.target.join(' ')) }));
}

/** Chromium's own verdict on installability (manifest, icons, service worker). */
export async function installabilityErrors(context: BrowserContext, page: Page): Promise<unknown[]> {
  const cdp = await context.newCDPSession(page);
  try {
    const { installabilityErrors } = (await cdp.send('Page.getInstallabilityErrors')) as { installabilityErrors: unknown[] };
    return installabilityErrors;
  } finally {
    await cdp.detach();
  }
}
