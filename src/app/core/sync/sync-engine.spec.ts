import 'fake-indexeddb/auto';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { FluxDb } from '../db/db-schema';
import { DeviceDb } from '../db/device-db';
import { readCursor } from '../db/pull-apply';
import { collar } from '../db/testing/test-db';
import { PendingWorkGuard } from '../sw-update/pending-work-guard';
import { LocalWrites } from './local-writes';
import { SyncEngine } from './sync-engine';
import { until } from '../db/testing/until';

const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const B = 'bbbbbbbb-bbbb-4bbb-8bbb-bbbbbbbbbbbb';
let userNo = 0;

async function setUp() {
  const userId = `0000000${++userNo}-0000-4000-8000-000000000000`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({ user: { id: userId, email: 'crew@fluxwalk.example', roles: ['crew'], siteIds: [] }, sites: [] }),
  );
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
  const engine = TestBed.inject(SyncEngine);
  const deviceDb = TestBed.inject(DeviceDb);
  const http = TestBed.inject(HttpTestingController);
  const db: FluxDb = await until(() => deviceDb.db(), 'the database');
  await deviceDb.deviceIdNow();
  return { engine, db, http, writes: TestBed.inject(LocalWrites), pending: TestBed.inject(PendingWorkGuard) };
}

function request(http: HttpTestingController, url: string) {
  return until(() => http.match((r) => r.url === url)[0], url);
}

describe('SyncEngine', () => {
  afterEach(() => localStorage.clear());

  it('when an edit is queued, then the pending-work guard counts it, so an update reload is held back', async () => {
    const { db, writes, pending } = await setUp();
    await db.records('collar').put(collar(A, 1));
    await writes.edit('collar', A, { notes: 'queued' });
    await until(() => pending.count() === 1, 'the pending count');
    expect(pending.allowsReload()).toBe(false);
  });

  it('when a sync runs, then the push goes first and the pull pages follow until more is false', async () => {
    const { engine, db, http, writes } = await setUp();
    await db.records('collar').put(collar(A, 1));
    const op = await writes.edit('collar', A, { notes: 'from the field' });
    const done = engine.syncNow();

    const push = await request(http, '/api/sync/push');
    expect(push.request.body.ops).toEqual([
      { opId: op!.opId, entity: 'collar', id: A, baseRev: 1, op: 'upsert', fields: { notes: 'from the field' } },
    ]);
    push.flush({ results: [{ opId: op!.opId, status: 'applied', rev: 2, record: collar(A, 2, { notes: 'from the field' }) }] });
    const first = await request(http, '/api/sync/pull');
    expect(first.request.params.get('cursor')).toBe('0');
    first.flush({ changes: [{ seq: 1, entity: 'collar', id: B, rev: 1, deleted: false, record: collar(B, 1) }], cursor: 1, more: true });
    const second = await request(http, '/api/sync/pull');
    expect(second.request.params.get('cursor')).toBe('1');
    second.flush({ changes: [], cursor: 9, more: false });
    await done;

    expect(await db.outbox.count()).toBe(0);
    expect(await db.records('collar').get(B)).toBeDefined();
    expect(await readCursor(db)).toBe(9);
    expect(engine.view().label).toBe('Up to date');
  });

  it('when the push answers 401, then the outbox is kept and nothing is pulled', async () => {
    const { engine, db, http, writes } = await setUp();
    await db.records('collar').put(collar(A, 1));
    await writes.edit('collar', A, { notes: 'keep me' });
    const done = engine.syncNow();
    (await request(http, '/api/sync/push')).flush({ error: { message: 'Sign in' } }, { status: 401, statusText: 'Unauthorized' });
    await done;
    expect(await db.outbox.count()).toBe(1);
    http.expectNone('/api/sync/pull');
  });

  it('when the pull answers 410, then the device downloads everything again from cursor 0', async () => {
    const { engine, db, http } = await setUp();
    await db.records('collar').put(collar(A, 3));
    await db.meta.put({ key: 'pullCursor', value: 40 });
    const done = engine.syncNow();
    const stale = await request(http, '/api/sync/pull');
    expect(stale.request.params.get('cursor')).toBe('40');
    stale.flush({ error: { message: 'Download everything again' }, reset: true }, { status: 410, statusText: 'Gone' });
    const fresh = await request(http, '/api/sync/pull');
    expect(fresh.request.params.get('cursor')).toBe('0');
    fresh.flush({ changes: [{ seq: 50, entity: 'collar', id: B, rev: 1, deleted: false, record: collar(B, 1) }], cursor: 50, more: false });
    await done;
    expect(await db.records('collar').get(A)).toBeUndefined();
    expect(await db.records('collar').get(B)).toBeDefined();
    expect(await readCursor(db)).toBe(50);
  });

  it('when the network fails, then the state is offline, not an error', async () => {
    const { engine, db, http, writes } = await setUp();
    await db.records('collar').put(collar(A, 1));
    await writes.edit('collar', A, { notes: 'x' });
    const done = engine.syncNow();
    (await request(http, '/api/sync/push')).error(new ProgressEvent('error'), { status: 0 });
    await done;
    expect(engine.lastError()).toBeNull();
    expect(await db.outbox.count()).toBe(1);
  });

  it('when a file waits for upload, then it counts in "n not yet synced" and holds back an update reload until it is uploaded', async () => {
    const { engine, db, pending } = await setUp();
    await db.records('collar').put(collar(A, 1));
    await db.blobs.put({
      attachmentId: B,
      blob: new Blob(['timestamp,co2_ppm\n']),
      mediaType: 'text/csv',
      createdAt: '2025-06-12T07:00:00.000Z',
      uploadedAt: null,
    });
    await until(() => engine.filesWaiting() === 1, 'the file count');
    expect(engine.pending()).toBe(1);
    expect(engine.view().label).toBe('1 not yet synced');
    await until(() => pending.count() === 1, 'the pending-work guard');
    expect(pending.allowsReload()).toBe(false);

    // Uploaded: the copy may stay on the device, but it no longer counts.
    await db.blobs.update(B, { uploadedAt: '2025-06-12T08:00:00.000Z' });
    await until(() => engine.pending() === 0, 'the count after upload');
    expect(engine.view().label).toBe('Up to date');
    expect(await db.blobs.count()).toBe(1);
  });
});
