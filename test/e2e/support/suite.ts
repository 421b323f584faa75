import { Client } from 'pg';
import type { Page } from 'playwright-core';
import { startFakeSmtp, type FakeSmtp } from '../../../tools/fake-smtp-server';
import { RunningServer, startAppServer } from './app-server';
import { Browser, BrowserShape, launchBrowser, withScreenshotOnFailure } from './browser';

export interface SuiteOptions {
  /** A fake SMTP server started before the app server, which inherits its address: the app's mail lands in `suite.smtp`. */
  mail?: boolean;
}

export interface OpenOptions extends BrowserShape {
  /** Keep this browser (its profile, its signed-in session) for the later tests of the file; closed after the last. */
  untilEnd?: boolean;
}

type InBrowserBody = (page: Page, b: Browser) => Promise<void>;

/**
 * The usual frame of a browser test file: the real server on a freshly reset E2E database for the
 * whole file (with a fake mailbox when asked), and fresh browser profiles per test, closed after
 * it; `inBrowser` leaves a screenshot in test-results/ when its body fails. Call at the top of a
 * file or describe block.
 */
export function browserSuite(options: SuiteOptions = {}) {
  let server: RunningServer | null = null;
  let smtp: FakeSmtp | null = null;
  const perTest: Browser[] = [];
  const perFile: Browser[] = [];
  beforeAll(async () => {
    if (options.mail) {
      smtp = await startFakeSmtp();
      Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port) });
    }
    server = await startAppServer();
  });
  afterAll(async () => {
    for (const b of [...perTest.splice(0), ...perFile.splice(0)]) await b.close();
    await server?.stop();
    await smtp?.close();
  });
  afterEach(async () => {
    for (const b of perTest.splice(0)) await b.close();
  });
  const open = async ({ untilEnd = false, ...shape }: OpenOptions = {}): Promise<Browser> => {
    const b = await launchBrowser(shape);
    (untilEnd ? perFile : perTest).push(b);
    return b;
  };
  /**
   * A fresh browser for `body`; a failure leaves a screenshot named `name`. The shape goes before
   * the body (`inBrowser(name, { viewport: PHONE }, async (page) => …)`) or, as earlier, after it.
   */
  function inBrowser(name: string, body: InBrowserBody, shape?: OpenOptions): Promise<void>;
  function inBrowser(name: string, shape: OpenOptions, body: InBrowserBody): Promise<void>;
  async function inBrowser(name: string, a: InBrowserBody | OpenOptions, c?: InBrowserBody | OpenOptions): Promise<void> {
    const [body, shape] = typeof a === 'function' ? [a, c as OpenOptions | undefined] : [c as InBrowserBody, a];
    const b = await open(shape);
    await withScreenshotOnFailure(b.page, name, () => body(b.page, b));
  }
  const started = (): RunningServer => {
    if (!server) throw new Error('the server is not started yet (use it inside a test)');
    return server;
  };
  // A stable view of the file's server, so a file may name it once at the top (`const { server } = suite`).
  const serverView: RunningServer = {
    get baseUrl() {
      return started().baseUrl;
    },
    get storage() {
      return started().storage;
    },
    stop: () => started().stop(),
  };
  return {
    server: serverView,
    get smtp(): FakeSmtp {
      if (!smtp) throw new Error('no fake mailbox: call browserSuite({ mail: true })');
      return smtp;
    },
    /** A fresh browser of this shape, closed after the test (or after the file, `untilEnd`). */
    open,
    inBrowser,
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
