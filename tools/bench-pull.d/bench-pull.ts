/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
/**
 * Pull benchmark (Device store issue): the demo scenario plus N extra collars in PostgreSQL, the
 * real server, and the real app in headless Chromium signed in as the crew. The sync engine pulls
 * everything into Dexie; the time is the engine's own measure of its pull loop (first request to
 * last page written), and the wall time from sign-in to "Up to date" is printed beside it.
 * Target (issue): 50 000 records in ≤ 10 s.
 */
import { Client } from 'pg';
import { signInAs } from '../../test/e2e/support/app-actions';
import { launchBrowser } from '../../test/e2e/support/browser';
import { startBenchServer } from './bench-server';

const EXTRA = Number(process.argv[2] ?? 50_000);

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
    const t0 = Date.now();
    const user = (await signInAs(browser.page, server.baseUrl, 'crew')) as unknown as { id: string };
    // The indicator carries the time of the last complete sync once the first one is done.
    await browser.page.locator('[data-testid="sync-indicator"][data-synced-at]').waitFor({ timeout: 300_000 });
    const wall = (Date.now() - t0) / 1000;
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
    console.log(`sign-in to "Up to date" (wall): ${wall.toFixed(2)} s`);
    console.log(`target: ${EXTRA} records in <= 10 s -> ${s <= 10 ? 'met' : 'NOT met'}`);
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
