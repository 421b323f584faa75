/**
 * The Dexie side of a pull alone, as a browser bundle: records already in memory are written the
 * way the sync engine writes pull pages (bulkPut of a page plus the cursor in one transaction),
 * into a scratch database with the app's collar indexes, for several page and transaction sizes.
 */
import Dexie from 'dexie';

interface Run { pageSize: number; pagesPerTransaction: number; records: number; ms: number }

async function writeAll(records: { id: string }[], pageSize: number, pagesPerTransaction: number): Promise<Run> {
  const name = `bench-dexie-${crypto.randomUUID()}`;
  const db = new Dexie(name);
  db.version(1).stores({ collar: 'id, siteId', meta: 'key' });
  await db.open();
  const t = performance.now();
  const perTransaction = pageSize * pagesPerTransaction;
  for (let at = 0; at < records.length; at += perTransaction) {
    await db.transaction('rw', db.table('collar'), db.table('meta'), async () => {
      for (let p = at; p < Math.min(at + perTransaction, records.length); p += pageSize) {
        await db.table('collar').bulkPut(records.slice(p, Math.min(p + pageSize, at + perTransaction, records.length)));
        await db.table('meta').put({ key: 'cursor', value: p });
      }
    });
  }
  const ms = performance.now() - t;
  db.close();
  await Dexie.delete(name);
  return { pageSize, pagesPerTransaction, records: records.length, ms };
}

(globalThis as unknown as { benchDexieWrite: typeof writeAll }).benchDexieWrite = writeAll;
