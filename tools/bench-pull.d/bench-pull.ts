/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
/**
 * Pull benchmark: the demo scenario plus N extra collars in PostgreSQL, the
 * real server, and the real app in headless Chromium signed in as the crew. The sync engine pulls
 * everything into Dexie; the time is the engine's own measure of its pull loop (first request to
 * last page written), and the wall time from sign-in to "Up to date" is printed beside it.
 * Also: the page's JS heap sampled over CDP during the pull (target under 300 MB); the server side
 * alone (every page fetched from Node, with the server's and PostgreSQL's CPU per record read from
 * /proc) and the Dexie side alone (the same records written from memory into a scratch database)
 * for several page and transaction sizes, each against the same database.
 * Target: 50 000 records in ≤ 3 s.
 */
import { randomUUID } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { Client } from 'pg';
import { httpSession } from '../../test/support/http-session';
import { signInAs } from '../../test/e2e/support/app-actions';
import { launchBrowser } from '../../test/e2e/support/browser';
import { startBenchServer } from './bench-server';

const EXTRA = Number(process.argv[2] ?? 50_000);
const TARGET_S = 3;
const PAGE_SIZES = [1000, 2500, 5000];
/**
 * [page size, pages a transaction, variant] for the Dexie-only runs; pages of 5 000 first and last to
 * show the drift (each run in one browser is slower than the one before), the variants between.
 */
const DEXIE_RUNS: [number, number, { durability?: 'relaxed'; noIndex?: boolean }][] = [
  [5000, 1, {}],
  [1000, 1, {}],
  [2500, 1, {}],
  [5000, 10, {}],
  [5000, 1, { durability: 'relaxed' }],
  [5000, 1, { noIndex: true }],
  [5000, 1, {}],
];
const TICKS_PER_S = 100; // USER_HZ on Linux

/** User + system CPU ticks of one process (0 when it is gone). */
function cpuTicks(pid: number): number {
  try {
    const f = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return Number(f[11]) + Number(f[12]);
  } catch {
    return 0;
  }
}

/** CPU ticks of the benchmark's PostgreSQL: its backends alive now plus those ended (reaped by the postmaster). */
function clusterTicks(): number {
  const postmaster = Number(readFileSync(`${process.env['BENCH_PGDATA']}/postmaster.pid`, 'utf8').split('\n')[0]);
  const own = readFileSync(`/proc/${postmaster}/stat`, 'utf8').split(') ')[1].split(' ');
  let sum = Number(own[13]) + Number(own[14]);
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const f = readFileSync(`/proc/${d}/stat`, 'utf8').split(') ')[1].split(' ');
      if (Number(f[1]) === postmaster) sum += Number(f[11]) + Number(f[12]);
    } catch {
      // gone meanwhile
    }
  }
  return sum;
}

async function addCollars(url: string, n: number): Promise<number> {
  const db = new Client({ connectionString: url });
  await db.connect();
  try {
    const [{ site_id, plot_id }] = (
      await db.query(`SELECT p.site_id, p.id AS plot_id FROM plot p JOIN site s ON s.id = p.site_id ORDER BY s.name, p.code LIMIT 1`)
    ).rows;
    await db.query('BEGIN');
    // Sequence numbers under the advisory lock the server's ChangeBuffer takes (72011), so seq order stays commit order.
    await db.query(`SELECT pg_advisory_xact_lock(72011)`);
    await db.query(
      `WITH made AS (
         INSERT INTO collar (id, site_id, code, plot_id, shape, diameter_cm, area_cm2, notes)
         SELECT gen_random_uuid(), $1, 'BENCH-' || lpad(g::text, 6, '0'), $2, 'round', 20, 314.159,
                'Bench collar ' || g || ': litter layer and root notes for the pull benchmark'
           FROM generate_series(1, $3::int) g
         RETURNING id, site_id)
       INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted)
       SELECT nextval('change_seq'), 'collar', id, 1, site_id, ARRAY['code','plotId','notes'], false FROM made`,
      [site_id, plot_id, n],
    );
    await db.query('COMMIT');
    const [{ count }] = (await db.query(`SELECT count(*)::int AS count FROM change_log`)).rows;
    return count;
  } finally {
    await db.end();
  }
}

async function main(): Promise<void> {
  const url = process.env['E2E_DATABASE_URL'];
  const root = process.env['BENCH_ROOT'];
  if (!url || !root) throw new Error('E2E_DATABASE_URL and BENCH_ROOT are not set: run tools/bench-pull');
  const server = await startBenchServer(root, url, Number(process.env['BENCH_PORT'] ?? 4399));
  const browser = await launchBrowser();
  try {
    const logRows = await addCollars(url, EXTRA);
    console.log(`database: demo scenario + ${EXTRA} extra collars (${logRows} change-log rows)`);
    const cdp = await browser.context.newCDPSession(browser.page);
    let heapMax = 0;
    let sampling = true;
    const sampler = (async () => {
      // Bounded: at most 10 minutes of 100 ms samples.
      for (let i = 0; sampling && i < 6000; i++) {
        const h = (await cdp.send('Runtime.getHeapUsage').catch(() => null)) as { usedSize: number } | null;
        if (h) heapMax = Math.max(heapMax, h.usedSize);
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    const t0 = Date.now();
    const user = await signInAs(browser.page, server.baseUrl, 'crew');
    // The indicator carries the time of the last complete sync once the first one is done.
    await browser.page.locator('[data-testid="sync-indicator"][data-synced-at]').waitFor({ timeout: 300_000 });
    const wall = (Date.now() - t0) / 1000;
    sampling = false;
    await sampler;
    const stats = await browser.page.evaluate(async (name) => {
      const db = await new Promise<IDBDatabase>((res, rej) => {
        const r = indexedDB.open(name);
        r.onsuccess = () => res(r.result);
        r.onerror = () => rej(r.error);
      });
      const get = <T>(store: string, fn: (s: IDBObjectStore) => IDBRequest<T>) =>
        new Promise<T>((res, rej) => {
          const r = fn(db.transaction(store).objectStore(store));
          r.onsuccess = () => res(r.result);
          r.onerror = () => rej(r.error);
        });
      const lastPull = (
        (await get('meta', (s) => s.get('lastPull'))) as { value: { ms: number; fetchMs: number; writeMs: number; records: number } }
      ).value;
      const collars = await get('collar', (s) => s.count());
      const records = await Promise.all(
        Array.from(db.objectStoreNames)
          .filter((n) => !['meta', 'outbox', 'conflicts', 'rejected', 'acked'].includes(n))
          .map((n) => get(n, (s) => s.count())),
      );
      db.close();
      return { lastPull, collars, total: records.reduce((a, b) => a + b, 0) };
    }, `fluxwalk-user-${user.id}`);
    const s = stats.lastPull.ms / 1000;
    console.log(`records in Dexie: ${stats.total} (${stats.collars} collars)`);
    console.log(
      `pull loop (engine): ${stats.lastPull.records} records in ${s.toFixed(2)} s = ${Math.round(stats.lastPull.records / s)} records/s`,
    );
    console.log(
      `  of which waiting for the server ${(stats.lastPull.fetchMs / 1000).toFixed(2)} s, writing to Dexie ${(stats.lastPull.writeMs / 1000).toFixed(2)} s`,
    );
    console.log(`  Dexie side alone: ${Math.round(stats.lastPull.records / (stats.lastPull.writeMs / 1000))} records/s`);
    console.log(`sign-in to "Up to date" (wall): ${wall.toFixed(2)} s`);
    console.log(
      `page JS heap during the pull: max ${(heapMax / 1e6).toFixed(0)} MB (target < 300 MB) -> ${heapMax < 300e6 ? 'met' : 'NOT met'}`,
    );
    console.log('server side alone (every page fetched by Node over HTTP, gzip as the browser gets it, JSON parsed; nothing written):');
    console.log('  page size | pages | records | seconds | records/s | server CPU µs/record | PostgreSQL CPU µs/record');
    const call = await httpSession(server.baseUrl, 'crew@fluxwalk.example');
    for (const limit of PAGE_SIZES) {
      const deviceId = randomUUID();
      const cpu0 = [cpuTicks(server.pid), clusterTicks()];
      const t = performance.now();
      let cursor = 0,
        pages = 0,
        records = 0;
      for (let i = 0; i < 10_000; i++) {
        const r = await call('GET', `/api/sync/pull?cursor=${cursor}&limit=${limit}&deviceId=${deviceId}`);
        if (r.status !== 200) throw new Error(`pull answered ${r.status}`);
        pages++;
        records += r.json.changes.length;
        cursor = r.json.cursor;
        if (!r.json.more) break;
      }
      const sec = (performance.now() - t) / 1000;
      const perRecord = (ticks: number) => ((ticks * 1e6) / TICKS_PER_S / records).toFixed(0);
      console.log(
        `  ${String(limit).padStart(9)} | ${String(pages).padStart(5)} | ${String(records).padStart(7)} | ${sec.toFixed(2).padStart(7)} | ` +
          `${String(Math.round(records / sec)).padStart(9)} | ${perRecord(cpuTicks(server.pid) - cpu0[0]).padStart(20)} | ${perRecord(clusterTicks() - cpu0[1]).padStart(24)}`,
      );
    }
    // The Dexie side alone: the records of a full pull, already in the page, written the engine's way.
    const bundle = readFileSync(process.env['BENCH_DEXIE_BUNDLE'] ?? '', 'utf8');
    await browser.page.evaluate(bundle);
    const held = await browser.page.evaluate(async () => {
      const deviceId = crypto.randomUUID();
      const all: unknown[] = [];
      let cursor = 0;
      for (let i = 0; i < 10_000; i++) {
        const res = await fetch(`/api/sync/pull?cursor=${cursor}&limit=5000&deviceId=${deviceId}`, { credentials: 'include' });
        const a = (await res.json()) as {
          changes: { entity: string; id: string; rev: number; record: Record<string, unknown> | null }[];
          cursor: number;
          more: boolean;
        };
        for (const c of a.changes) if (c.entity === 'collar' && c.record) all.push({ ...c.record, id: c.id, rev: c.rev });
        cursor = a.cursor;
        if (!a.more) break;
      }
      // Page globals the bench installs (dexie-writer.ts, the page above): not in TypeScript's globalThis.
      (globalThis as unknown as { benchRecords: unknown[] }).benchRecords = all;
      return all.length;
    });
    console.log(
      `Dexie side alone (${held} collar records in memory, bulkPut of a page + the cursor, the app's indexes; fresh database each run):`,
    );
    const parse = await browser.page.evaluate(() => {
      // Page globals the bench installs (dexie-writer.ts, the page above): not in TypeScript's globalThis.
      const g = globalThis as unknown as {
        benchRecords: { id: string }[];
        benchParseCost(r: { id: string }[]): { checkMs: number; parseMs: number; records: number };
      };
      return g.benchParseCost(g.benchRecords);
    });
    const perS = (ms: number) => Math.round(parse.records / (ms / 1000));
    console.log(
      `  schema step: the engine's check for missing defaults ${parse.checkMs.toFixed(0)} ms (${perS(parse.checkMs)} records/s); ` +
        `a full zod parse of every record would take ${parse.parseMs.toFixed(0)} ms (${perS(parse.parseMs)} records/s)`,
    );
    console.log('  page size | pages a transaction | variant            | seconds | records/s');
    const rawFirst = await browser.page.evaluate(() => {
      // Page globals the bench installs (dexie-writer.ts, the page above): not in TypeScript's globalThis.
      const g = globalThis as unknown as {
        benchRecords: { id: string }[];
        benchRawWrite(r: { id: string }[], p: number): Promise<{ ms: number; records: number }>;
      };
      return g.benchRawWrite(g.benchRecords, 5000);
    });
    console.log(
      `  IndexedDB put() without Dexie, pages of 5000 (before the Dexie runs): ${(rawFirst.ms / 1000).toFixed(2)} s = ${Math.round(rawFirst.records / (rawFirst.ms / 1000))} records/s`,
    );
    for (const [pageSize, perTxn, opts] of DEXIE_RUNS) {
      const r = await browser.page.evaluate(
        ([p, n, o]) => {
          // Page globals the bench installs (dexie-writer.ts, the page above): not in TypeScript's globalThis.
          const g = globalThis as unknown as {
            benchRecords: { id: string }[];
            benchDexieWrite(r: { id: string }[], p: number, n: number, o: object): Promise<{ ms: number; records: number }>;
          };
          return g.benchDexieWrite(g.benchRecords, p, n, o);
        },
        [pageSize, perTxn, opts] as const,
      );
      const variant = opts.durability ? 'relaxed durability' : opts.noIndex ? 'no siteId index' : "the app's";
      console.log(
        `  ${String(pageSize).padStart(9)} | ${String(perTxn).padStart(19)} | ${variant.padEnd(18)} | ${(r.ms / 1000).toFixed(2).padStart(7)} | ${Math.round(r.records / (r.ms / 1000))}`,
      );
    }
    // Reference: IndexedDB's own put() without Dexie, pages of 5 000, first and last to bracket the drift.
    const raw = await browser.page.evaluate(() => {
      // Page globals the bench installs (dexie-writer.ts, the page above): not in TypeScript's globalThis.
      const g = globalThis as unknown as {
        benchRecords: { id: string }[];
        benchRawWrite(r: { id: string }[], p: number): Promise<{ ms: number; records: number }>;
      };
      return g.benchRawWrite(g.benchRecords, 5000);
    });
    console.log(
      `  IndexedDB put() without Dexie, pages of 5000 (after the runs above): ${(raw.ms / 1000).toFixed(2)} s = ${Math.round(raw.records / (raw.ms / 1000))} records/s`,
    );
    console.log(`target: ${EXTRA} records in <= ${TARGET_S} s -> ${s <= TARGET_S ? 'met' : 'NOT met'}`);
    if (stats.collars < EXTRA) throw new Error(`only ${stats.collars} collars reached Dexie`);
  } finally {
    await browser.close();
    await server.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
