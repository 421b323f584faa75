/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { Page } from 'playwright-core';

/** The toolbar's sync label, as shown. */
export async function syncLabel(page: Page): Promise<string> {
  return (await page.getByTestId('sync-label').innerText()).trim();
}

/** Waits until the toolbar's sync label matches. */
export async function waitForSyncLabel(page: Page, pattern: RegExp, timeout = 30_000): Promise<void> {
  await page.waitForFunction(
    (source) => new RegExp(source).test(document.querySelector('[data-testid="sync-label"]')?.textContent?.trim() ?? ''),
    pattern.source,
    { timeout },
  );
}

/** Waits until this device has finished a whole sync (push and pull) at least once. */
export async function waitForFirstSync(page: Page, timeout = 60_000): Promise<void> {
  await page.locator('[data-testid="sync-indicator"][data-synced-at]').waitFor({ timeout });
}

/** Opens the sync sheet and presses "Sync now", then closes the sheet. */
export async function syncNow(page: Page): Promise<void> {
  await page.getByTestId('sync-indicator').click();
  await page.getByRole('button', { name: 'Sync now' }).click();
  await page.keyboard.press('Escape');
  await page.getByTestId('sync-sheet').waitFor({ state: 'detached' });
}

export interface ServerCollar {
  id: string;
  code: string;
  rev: number;
  notes: string;
}

/** A collar as the server has it now, read with the page's own session. */
export async function serverCollar(page: Page, baseUrl: string, id: string): Promise<ServerCollar> {
  const res = await page.request.get(`${baseUrl}/api/collars/${id}`);
  if (!res.ok()) throw new Error(`GET /api/collars/${id} answered ${res.status()}`);
  return ((await res.json()) as { record: ServerCollar }).record;
}

export async function firstCollars(page: Page, baseUrl: string, n: number): Promise<ServerCollar[]> {
  const res = await page.request.get(`${baseUrl}/api/collars?limit=${n}`);
  if (!res.ok()) throw new Error(`GET /api/collars answered ${res.status()}`);
  return ((await res.json()) as { items: ServerCollar[] }).items;
}

/** Replaces the notes on the open collar page and saves them on the device. */
export async function editNotes(page: Page, text: string): Promise<void> {
  const box = page.getByLabel('Edit notes');
  await box.fill(text);
  await page.getByRole('button', { name: 'Save notes' }).click();
  await page.getByText(/Notes saved on this device|Nothing changed/).waitFor();
}

export async function shownNotes(page: Page): Promise<string> {
  return page.getByTestId('collar-notes').evaluate((el) => el.textContent ?? '');
}
