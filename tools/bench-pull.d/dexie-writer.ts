/**
 * The Dexie side of a pull alone, as a browser bundle: records already in memory are written the
 * way the sync engine writes pull pages (bulkPut of a page plus the cursor in one transaction),
 * into a scratch database with the app's collar indexes, for several page and transaction sizes,
 * with relaxed durability and without the secondary index; and the cost of the schema parse.
 */
import Dexie from 'dexie';
import { ENTITY_FIELDS } from '../../shared/model/entities';
import { pulledRecord } from '../../src/app/core/db/pulled-record';

/** Variants of the write: Chromium's relaxed durability, or the collar table without its siteId index. */
export interface WriteOptions {
  durability?: 'relaxed';
  noIndex?: boolean;
}

interface Run {
  pageSize: number;
  pagesPerTransaction: number;
  records: number;
  ms: number;
}

async function writeAll(records: { id: string }[], pageSize: number, pagesPerTransaction: number, opts: WriteOptions = {}): Promise<Run> {
  const name = `bench-dexie-${crypto.randomUUID()}`;
  const db = new Dexie(name, opts.durability ? { chromeTransactionDurability: opts.durability } : undefined);
  db.version(1).stores({ collar: opts.noIndex ? 'id' : 'id, siteId', meta: 'key' });
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

/**
 * What the schema step of a pull costs on these records: the engine's path (a check for missing
 * defaulted fields; these records have them all, so none is parsed) and a full parse of every record.
 */
function parseCost(records: { id: string; rev?: number }[]): { checkMs: number; parseMs: number; records: number } {
  let t = performance.now();
  for (const r of records) pulledRecord('collar', { ...r, rev: r.rev ?? 1 });
  const checkMs = performance.now() - t;
  t = performance.now();
  for (const r of records) ENTITY_FIELDS.collar.safeParse(r);
  return { checkMs, parseMs: performance.now() - t, records: records.length };
}

Object.assign(globalThis, { benchDexieWrite: writeAll, benchRawWrite: writeRaw, benchParseCost: parseCost });
