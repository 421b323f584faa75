/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
/**
 * Pull benchmark (Device store issue): the demo scenario plus N extra collars in PostgreSQL, the
 * real server, and the real app in headless Chromium signed in as the crew. The sync engine pulls
 * everything into Dexie; the time is the engine's own measure of its pull loop (first request to
 * last page written), and the wall time from sign-in to "Up to date" is printed beside it.
 * Also: the page's JS heap sampled over CDP during the pull (target under 300 MB), the Dexie side
 * alone (records / time spent writing), and the pull endpoint alone (every page fetched and parsed
 * in the page, nothing written) for several page sizes, each against the same database.
 * Target: 50 000 records in ≤ 3 s.
 */
import { Client } from 'pg';
import { signInAs } from '../../test/e2e/support/app-actions';
import { launchBrowser } from '../../test/e2e/support/browser';
import { startBenchServer } from './bench-server';

const EXTRA = Number(process.argv[2] ?? 50_000);
const TARGET_S = 3;
const PAGE_SIZES = [1000, 2500, 5000];

async function addCollars(url: string, n: number): Promise<number> {
  const db = new Client({ connectionString: url });
  await db.connect();
  try {
    const [{ site_id, plot_id }] = (await db.query(
      `SELECT p.site_id, p.id AS plot_id FROM plot p JOIN site s ON s.id = p.site_id ORDER BY s.name, p.code LIMIT 1`)).rows;
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
      [site_id, plot_id, n]);
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
    const user = (await signInAs(browser.page, server.baseUrl, 'crew')) as unknown as { id: string };
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
      const get = <T>(store: string, fn: (s: IDBObjectStore) => IDBRequest<T>) => new Promise<T>((res, rej) => {
        const r = fn(db.transaction(store).objectStore(store));
        r.onsuccess = () => res(r.result);
        r.onerror = () => rej(r.error);
      });
      const lastPull = (await get('meta', (s) => s.get('lastPull')) as { value: { ms: number; fetchMs: number; writeMs: number; records: number } }).value;
      const collars = await get('collar', (s) => s.count());
      const records = await Promise.all(Array.from(db.objectStoreNames).filter((n) => !['meta', 'outbox', 'conflicts', 'rejected', 'acked'].includes(n)).map((n) => get(n, (s) => s.count())));
      db.close();
      return { lastPull, collars, total: records.reduce((a, b) => a + b, 0) };
    }, `fluxwalk-user-${user.id}`);
    const s = stats.lastPull.ms / 1000;
    console.log(`records in Dexie: ${stats.total} (${stats.collars} collars)`);
    console.log(`pull loop (engine): ${stats.lastPull.records} records in ${s.toFixed(2)} s = ${Math.round(stats.lastPull.records / s)} records/s`);
    console.log(`  of which waiting for the server ${(stats.lastPull.fetchMs / 1000).toFixed(2)} s, writing to Dexie ${(stats.lastPull.writeMs / 1000).toFixed(2)} s`);
    console.log(`  Dexie side alone: ${Math.round(stats.lastPull.records / (stats.lastPull.writeMs / 1000))} records/s`);
    console.log(`sign-in to "Up to date" (wall): ${wall.toFixed(2)} s`);
    console.log(`page JS heap during the pull: max ${(heapMax / 1e6).toFixed(0)} MB (target < 300 MB) -> ${heapMax < 300e6 ? 'met' : 'NOT met'}`);
    console.log('pull endpoint alone (fetch + JSON parse of every page in the page, no Dexie writes):');
    console.log('  page size | pages | records | seconds | records/s');
    for (const limit of PAGE_SIZES) {
      const r = await browser.page.evaluate(async (lim) => {
        const deviceId = crypto.randomUUID();
        const t = performance.now();
        let cursor = 0;
        let pages = 0;
        let records = 0;
        for (let i = 0; i < 10_000; i++) {
          const res = await fetch(`/api/sync/pull?cursor=${cursor}&limit=${lim}&deviceId=${deviceId}`, { credentials: 'include' });
          if (!res.ok) throw new Error(`pull answered ${res.status}`);
          const a = (await res.json()) as { changes: unknown[]; cursor: number; more: boolean };
          pages++;
          records += a.changes.length;
          cursor = a.cursor;
          if (!a.more) break;
        }
        return { pages, records, ms: performance.now() - t };
      }, limit);
      console.log(`  ${String(limit).padStart(9)} | ${String(r.pages).padStart(5)} | ${String(r.records).padStart(7)} | ${(r.ms / 1000).toFixed(2).padStart(7)} | ${Math.round(r.records / (r.ms / 1000))}`);
    }
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
