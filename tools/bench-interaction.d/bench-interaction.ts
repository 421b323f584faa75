/// <reference lib="dom" />
/**
 * Interaction latency on a slow phone: the demo scenario plus N collars on every route of the
 * first site, the real app in headless Chromium, synced, then the CPU slowed 4× (CDP). Each
 * interaction's time from input to the next paint comes from PerformanceObserver 'event' entries
 * (durationThreshold 16) that carry an interactionId (taps and keys, as Chromium's INP counts them);
 * the worst per step and per screen is printed. BENCH_TRACE=dir keeps a trace and a CPU profile of
 * each step at 4× and prints where the main thread spent its time (trace-summary.ts). Selectors are roles, labels and test
 * ids, so the bench survives layout changes; a step whose control is not found is reported, not fatal.
 * The same interactions at full speed are the reference in the same run. Target: ≤ 100 ms each.
 */
import os from 'node:os';
import { Client } from 'pg';
import type { Page } from 'playwright-core';
import { signInAs } from '../../test/e2e/support/app-actions';
import { launchBrowser } from '../../test/e2e/support/browser';
import { startBenchServer } from '../bench-pull.d/bench-server';
import { StepTrace } from './trace-summary';

const EXTRA = Number(process.argv[2] ?? 5_000);
const STEP_MS = 30_000;

async function addCollarsToRoutes(url: string, n: number): Promise<void> {
  const db = new Client({ connectionString: url });
  await db.connect();
  try {
    const [{ site_id, plot_id }] = (
      await db.query(`SELECT p.site_id, p.id AS plot_id FROM plot p JOIN site s ON s.id = p.site_id ORDER BY s.name, p.code LIMIT 1`)
    ).rows;
    await db.query('BEGIN');
    await db.query(`SELECT pg_advisory_xact_lock(72011)`); // the ChangeBuffer's lock: seq order stays commit order
    const made = await db.query(
      `INSERT INTO collar (id, site_id, code, plot_id, shape, diameter_cm, area_cm2, notes)
       SELECT gen_random_uuid(), $1, 'L-' || lpad(g::text, 5, '0'), $2, 'round', 20, 314.159, ''
         FROM generate_series(1, $3::int) g RETURNING id`,
      [site_id, plot_id, n],
    );
    const ids = made.rows.map((r: { id: string }) => r.id);
    await db.query(
      `INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted)
       SELECT nextval('change_seq'), 'collar', id, 1, $1, ARRAY['code'], false FROM unnest($2::uuid[]) id`,
      [site_id, ids],
    );
    const routes = await db.query(
      `UPDATE route SET collar_ids = collar_ids || $2::uuid[], rev = rev + 1 WHERE site_id = $1 RETURNING id, rev`,
      [site_id, ids],
    );
    for (const r of routes.rows) {
      await db.query(
        `INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted) VALUES (nextval('change_seq'), 'route', $1, $2, $3, ARRAY['collarIds'], false)`,
        [r.id, r.rev, site_id],
      );
    }
    await db.query('COMMIT');
  } finally {
    await db.end();
  }
}

type Entry = { name: string; duration: number; target: string; interactionId: number };
type Step = { screen: string; what: string; act: () => Promise<void>; measured?: false };

async function measure(page: Page, act: () => Promise<void>): Promise<Entry[] | string> {
  await page.evaluate(() => {
    // A page global this bench installs: not in TypeScript's Window.
    (window as unknown as { fwEvents: Entry[] }).fwEvents = [];
  });
  try {
    await act();
  } catch (err) {
    return `not reached (${String((err as Error).message)
      .split('\n')[0]
      .slice(0, 90)})`;
  }
  await page.waitForTimeout(300); // the observer reports after the next paint
  // A page global this bench installs: not in TypeScript's Window.
  return page.evaluate(() => (window as unknown as { fwEvents: Entry[] }).fwEvents);
}

const load = () =>
  os
    .loadavg()
    .map((x) => x.toFixed(1))
    .join(' ');

/**
 * The crew's moves, each pass on its own collar (the first one still due, so every pass finds an
 * empty offset set): open it from the route, a full offset set that saves itself, the
 * chamber on and off, back to the route, to the map and back. Choosing the day's analyzer and
 * chamber is set-up, not measured.
 */
function crewSteps(page: Page, baseUrl: string): Step[] {
  // Selectors by test id or by text inside a named part of the page: a role query computes every
  // element's accessible name, and the bench's next query runs in the page while it answers a tap.
  const bar = page.getByTestId('visit-bar');
  const chamber = (word: 'on' | 'off') => bar.locator('button', { hasText: `Chamber ${word}` });
  const link = (text: string) => page.locator('a', { hasText: text });
  return [
    {
      screen: 'route',
      what: 'open the Walk',
      measured: false,
      act: async () => {
        await page.goto(`${baseUrl}/walk`);
        await page.getByTestId('route-list').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'route',
      what: 'open a collar from the route',
      act: async () => {
        await page.locator('li[data-state="due"] [data-testid^="route-collar-"]').first().click({ timeout: STEP_MS });
        await page.getByTestId('visit-code').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'visit',
      what: "choose the day's analyzer and chamber",
      measured: false,
      act: async () => {
        await page.getByTestId('visit-bar').waitFor({ timeout: STEP_MS });
        await page.waitForTimeout(500);
        if (await page.getByTestId('day-kit-gate').isVisible()) {
          await page.getByTestId('day-kit-gate').getByRole('button').first().click();
          await page.waitForTimeout(500);
        }
        if (await page.getByTestId('day-kit-gate').isVisible()) await page.getByTestId('day-kit-gate').getByRole('button').first().click();
        await chamber('on').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'visit',
      what: 'key in an offset set (Enter to the next box; saves itself)',
      act: async () => {
        await page.getByTestId('offset-1').focus({ timeout: STEP_MS });
        for (const v of ['1.6', '1.7', '1.5', '1.6']) {
          await page.keyboard.type(v, { delay: 60 });
          await page.keyboard.press('Enter');
        }
        await page.getByTestId('offset-saved').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'visit',
      what: 'chamber tap (on, then off)',
      act: async () => {
        await chamber('on').click({ timeout: STEP_MS });
        await chamber('off').click({ timeout: STEP_MS });
        await chamber('on').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'route',
      what: 'back to the route',
      act: async () => {
        await link('Back to the route').click({ timeout: STEP_MS });
        await page.getByTestId('route-list').waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'map',
      what: 'switch to the map',
      act: async () => {
        await page.locator('nav a', { hasText: /^\s*Map\s*$/ }).click({ timeout: STEP_MS });
        await page.locator('.fw-marker').first().waitFor({ timeout: STEP_MS });
      },
    },
    {
      screen: 'map',
      what: 'from the map back to the route',
      act: async () => {
        await link('← Route').click({ timeout: STEP_MS });
        await page.getByTestId('route-list').waitFor({ timeout: STEP_MS });
      },
    },
  ];
}

async function main(): Promise<void> {
  const url = process.env['E2E_DATABASE_URL'];
  const root = process.env['BENCH_ROOT'];
  if (!url || !root) throw new Error('E2E_DATABASE_URL and BENCH_ROOT are not set: run tools/bench-interaction');
  const server = await startBenchServer(root, url, Number(process.env['BENCH_PORT'] ?? 4398));
  const browser = await launchBrowser();
  const { page, context } = browser;
  try {
    await addCollarsToRoutes(url, EXTRA);
    await page.setViewportSize({ width: 390, height: 844 });
    await context.addInitScript(() => {
      // A page global this bench installs: not in TypeScript's Window.
      const w = window as unknown as { fwEvents: Entry[] };
      w.fwEvents = [];
      new PerformanceObserver((list) => {
        for (const e of list.getEntries() as PerformanceEventTiming[]) {
          const t = e.target as Element | null;
          w.fwEvents.push({
            name: e.name,
            duration: e.duration,
            interactionId: (e as PerformanceEventTiming & { interactionId?: number }).interactionId ?? 0,
            target: t ? `${t.tagName.toLowerCase()} ${(t.textContent ?? '').trim().slice(0, 30)}` : '',
          });
        }
      }).observe({ type: 'event', durationThreshold: 16, buffered: false } as PerformanceObserverInit);
    });
    await signInAs(page, server.baseUrl, 'crew');
    await page.locator('[data-testid="sync-indicator"][data-synced-at]').waitFor({ timeout: 300_000 });
    console.log(
      `database: demo scenario + ${EXTRA} collars on every route of the first site; load average ${load()} (${os.cpus().length} cores)`,
    );
    const cdp = await context.newCDPSession(page);
    const trace = StepTrace.fromEnv(cdp);
    const steps = crewSteps(page, server.baseUrl);
    const worst: Record<string, Record<string, { ms: number; what: string }>> = {};
    // Full speed first: the reference, measured in the same run on the same machine.
    for (const rate of [1, 4]) {
      await cdp.send('Emulation.setCPUThrottlingRate', { rate });
      console.log(`CPU ${rate === 1 ? 'at full speed (reference)' : 'slowed 4x'}:`);
      for (const [i, step] of steps.entries()) {
        if (step.measured === false) {
          const r = await measure(page, () => step.act());
          if (typeof r === 'string') console.log(`  ${step.screen.padEnd(6)} ${step.what} (set-up): ${r}`);
          continue;
        }
        const tracing = trace && rate === 4;
        if (tracing) await trace.start();
        const r = await measure(page, () => step.act());
        const summary = tracing ? await trace.stop(`${i}-${step.what.replace(/\W+/g, '-')}`) : [];
        if (typeof r === 'string') {
          console.log(`  ${step.screen.padEnd(6)} ${step.what}: ${r}`);
          continue;
        }
        // An interaction (a tap, a key) is what carries an interactionId, as Chromium's INP counts it;
        // the pointer's hover events that a changed page sends under a still pointer are not.
        const worstOf = (list: Entry[]) => list.reduce<Entry | null>((a, e) => (!a || e.duration > a.duration ? e : a), null);
        const top = worstOf(r.filter((e) => e.interactionId > 0));
        const other = worstOf(r.filter((e) => e.interactionId === 0));
        const ms = top?.duration ?? 0;
        const screen = (worst[`x${rate}`] ??= {});
        if (ms >= (screen[step.screen]?.ms ?? 0)) screen[step.screen] = { ms, what: step.what };
        console.log(
          `  ${step.screen.padEnd(6)} ${step.what}: worst interaction ${ms.toFixed(0)} ms${top ? ` (${top.name} on ${top.target})` : ' (none over 16 ms)'}` +
            (other ? `; other events up to ${other.duration.toFixed(0)} ms (${other.name})` : ''),
        );
        for (const line of summary) console.log(line);
      }
    }
    await cdp.send('Emulation.setCPUThrottlingRate', { rate: 1 });
    for (const [screen, w] of Object.entries(worst['x4'] ?? {})) {
      const ref = worst['x1']?.[screen];
      console.log(
        `worst at 4x, ${screen}: ${w.ms.toFixed(0)} ms (${w.what}); full speed in the same run ${(ref?.ms ?? 0).toFixed(0)} ms` +
          ` -> ${w.ms <= 100 ? 'met' : 'NOT met'} (target <= 100 ms)`,
      );
    }
    console.log(`load average at the end: ${load()}`);
  } finally {
    await browser.close();
    await server.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
