/**
 * The Dexie side of a pull alone, as a browser bundle: records already in memory are written the
 * way the sync engine writes pull pages (bulkPut of a page plus the cursor in one transaction),
 * into a scratch database with the app's collar indexes, for several page and transaction sizes.
 */
import Dexie from 'dexie';

interface Run {
  pageSize: number;
  pagesPerTransaction: number;
  records: number;
  ms: number;
}

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

/** The same writes with IndexedDB's own put() and no Dexie: what the Dexie layer costs on top. */
async function writeRaw(records: { id: string }[], pageSize: number): Promise<Run> {
  const name = `bench-idb-${crypto.randomUUID()}`;
  const db = await new Promise<IDBDatabase>((resolve, reject) => {
    const r = indexedDB.open(name, 1);
    r.onupgradeneeded = () => {
      r.result.createObjectStore('collar', { keyPath: 'id' }).createIndex('siteId', 'siteId');
      r.result.createObjectStore('meta', { keyPath: 'key' });
    };
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
  });
  const t = performance.now();
  for (let at = 0; at < records.length; at += pageSize) {
    await new Promise<void>((resolve, reject) => {
      const tx = db.transaction(['collar', 'meta'], 'readwrite');
      const store = tx.objectStore('collar');
      for (const r of records.slice(at, at + pageSize)) store.put(r);
      tx.objectStore('meta').put({ key: 'cursor', value: at });
      tx.oncomplete = () => resolve();
      tx.onerror = () => reject(tx.error);
    });
  }
  const ms = performance.now() - t;
  db.close();
  await new Promise((r) => {
    const d = indexedDB.deleteDatabase(name);
    d.onsuccess = d.onerror = r;
  });
  return { pageSize, pagesPerTransaction: 1, records: records.length, ms };
}

Object.assign(globalThis, { benchDexieWrite: writeAll, benchRawWrite: writeRaw });
