import { Client } from 'pg';
import type { Page } from 'playwright-core';
import { RunningServer, startAppServer } from './app-server';
import { Browser, BrowserShape, launchBrowser, withScreenshotOnFailure } from './browser';

/**
 * The usual frame of a browser test file: the real server on a freshly reset E2E database for the
 * whole file, and one fresh browser profile per test whose failure leaves a screenshot in
 * test-results/. Call at the top of a describe block or file.
 */
export function browserSuite() {
  let server: RunningServer | null = null;
  let browser: Browser | null = null;
  beforeAll(async () => {
    server = await startAppServer();
  });
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });
  afterEach(async () => {
    await browser?.close();
    browser = null;
  });
  return {
    get server(): RunningServer {
      if (!server) throw new Error('the server is not started yet (use it inside a test)');
      return server;
    },
    async inBrowser(name: string, body: (page: Page, b: Browser) => Promise<void>, shape: BrowserShape = {}): Promise<void> {
      browser = await launchBrowser(shape);
      const b = browser;
      await withScreenshotOnFailure(b.page, name, () => body(b.page, b));
    },
  };
}

/** A query against the E2E database, to check what reached PostgreSQL. */
export async function queryE2eDatabase<T = Record<string, unknown>>(sql: string, params: unknown[] = []): Promise<T[]> {
  const client = new Client({ connectionString: process.env['E2E_DATABASE_URL'] });
  await client.connect();
  try {
    return (await client.query(sql, params)).rows as T[];
  } finally {
    await client.end();
  }
}
