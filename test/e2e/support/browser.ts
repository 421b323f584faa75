import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { BrowserContext, Page, chromium } from 'playwright-core';

const RESULTS = path.resolve(__dirname, '../../../test-results');

export interface Browser {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/**
 * Debian's chromium through playwright-core, with a fresh profile each time. A persistent
 * context is what lets the service worker and storage behave as in a real install
 * (`launch()` refuses --user-data-dir).
 */
export interface BrowserShape {
  viewport?: { width: number; height: number };
  /** A phone: touch events and the mobile viewport (meta viewport honoured). */
  touch?: boolean;
  /** Touch events only, with the desktop viewport. */
  hasTouch?: boolean;
}

export async function launchBrowser(shape: BrowserShape = {}): Promise<Browser> {
  const profile = mkdtempSync(path.join(tmpdir(), 'fw-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium',
    headless: true,
    viewport: shape.viewport ?? { width: 1000, height: 760 },
    hasTouch: shape.touch ?? shape.hasTouch ?? false,
    isMobile: shape.touch ?? false,
    // As a user who asks for less motion: nothing is caught mid-fade when axe or a screenshot looks.
    reducedMotion: 'reduce',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Runs a browser step; on failure keeps a full-page screenshot in test-results/ (git-ignored). */
export async function withScreenshotOnFailure<T>(page: Page, name: string, step: () => Promise<T>): Promise<T> {
  try {
    return await step();
  } catch (err) {
    mkdirSync(RESULTS, { recursive: true });
    const file = path.join(RESULTS, `${name.replace(/[^a-z0-9]+/gi, '-').toLowerCase()}.png`);
    await page.screenshot({ path: file, fullPage: true }).catch(() => undefined);
    if (err instanceof Error) err.message += `\n(screenshot: ${path.relative(process.cwd(), file)})`;
    throw err;
  }
}
