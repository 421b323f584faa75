import 'fake-indexeddb/auto';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { FluxDb, LocalRecord } from '../db/db-schema';
import { DeviceDb } from '../db/device-db';
import { createRecord } from '../db/outbox-writer';
import { validated } from '../db/validated';
import { SITE, testDb } from '../db/testing/test-db';
import { uploadPendingBlobs } from './attachment-upload';
import { SyncFailed } from './sync-api';
import { SyncEngine } from './sync-engine';
import { until } from '../db/testing/until';

const SHA = 'a'.repeat(64);
const fields = validated('attachment', {
  siteId: SITE,
  ownerEntity: 'closure',
  ownerId: '33333333-3333-4333-8333-333333333333',
  fileName: 'day.csv',
  mediaType: 'text/csv',
  sizeBytes: 5,
  sha256: SHA,
});
/** The meta the server answers with beside the record's fields. */
const SERVER_META = { updatedAt: '2025-06-12T07:30:00.000Z', updatedBy: null, deleted: false };
// jsdom's Blob does not survive fake-indexeddb's structured clone, so the tests keep a stand-in
// value in the blob column; the upload passes it through untouched, which is what is checked.
const BYTES = 'bytes-of-day.csv' as unknown as Blob;

async function keep(db: FluxDb, rev: number, extra: Record<string, unknown> = {}): Promise<string> {
  const rec = await createRecord(db, 'attachment', fields);
  if (rev > 0) {
    await db.outbox.clear();
    await db.records('attachment').put({ ...rec, rev, ...extra });
  }
  await db.blobs.put({ attachmentId: rec.id, blob: BYTES, mediaType: 'text/csv', createdAt: '2025-06-12T07:00:00.000Z', uploadedAt: null });
  return rec.id;
}

describe('uploadPendingBlobs', () => {
  it('when the record is not yet acknowledged, then the bytes wait and nothing is sent', async () => {
    const db = testDb();
    await keep(db, 0);
    const put = jest.fn();
    expect(await uploadPendingBlobs(db, put)).toEqual({ uploaded: 0, waiting: 1 });
    expect(put).not.toHaveBeenCalled();
  });

  it('when the record is on the server, then the bytes are PUT with its media type and the answer (with objectKey) is kept', async () => {
    const db = testDb();
    const id = await keep(db, 1);
    const put = jest.fn(async (aid: string) => ({
      ...fields,
      ...SERVER_META,
      id: aid,
      rev: 2,
      objectKey: `sites/${SITE}/attachments/${aid}`,
    }));
    const tally = await uploadPendingBlobs(db, put, () => new Date('2025-06-12T08:00:00Z'));
    expect(tally).toEqual({ uploaded: 1, waiting: 0 });
    expect(put).toHaveBeenCalledWith(id, 'text/csv', BYTES);
    expect(await db.records('attachment').get(id)).toMatchObject({ rev: 2, objectKey: `sites/${SITE}/attachments/${id}` });
    expect(await db.blobs.get(id)).toMatchObject({ uploadedAt: '2025-06-12T08:00:00.000Z', lastError: null });
  });

  it('when the PUT fails, then the blob stays queued with the reason, the error is thrown, and a later round sends it', async () => {
    const db = testDb();
    const id = await keep(db, 1);
    const failing = jest.fn(async () => {
      throw new SyncFailed({ kind: 'server', status: 503, message: 'File storage is not configured' });
    });
    await expect(uploadPendingBlobs(db, failing)).rejects.toThrow('File storage is not configured');
    expect(await db.blobs.get(id)).toMatchObject({ uploadedAt: null, attempts: 1, lastError: 'File storage is not configured' });
    const ok = jest.fn(async () => ({ ...fields, ...SERVER_META, id, rev: 2, objectKey: 'k' }));
    expect(await uploadPendingBlobs(db, ok)).toEqual({ uploaded: 1, waiting: 0 });
    expect(ok).toHaveBeenCalledTimes(1);
  });

  it('when a pull already brought objectKey (the answer was lost), then nothing is sent again and the blob is marked', async () => {
    const db = testDb();
    const id = await keep(db, 2, { objectKey: 'sites/x/attachments/y' });
    const put = jest.fn();
    expect(await uploadPendingBlobs(db, put)).toEqual({ uploaded: 1, waiting: 0 });
    expect(put).not.toHaveBeenCalled();
    expect((await db.blobs.get(id))!.uploadedAt).not.toBeNull();
  });
});

describe('SyncEngine upload step', () => {
  afterEach(() => localStorage.clear());

  it('when a round runs, then push acknowledges the record, the bytes are PUT, and the pull still runs after a failed PUT', async () => {
    localStorage.setItem(
      'fw.session',
      JSON.stringify({
        user: { id: '00000099-0000-4000-8000-000000000000', email: 'crew@fluxwalk.example', roles: ['crew'], siteIds: [] },
        sites: [],
      }),
    );
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    const engine = TestBed.inject(SyncEngine);
    const deviceDb = TestBed.inject(DeviceDb);
    const http = TestBed.inject(HttpTestingController);
    const db: FluxDb = await until(() => deviceDb.db(), 'the database');
    await deviceDb.deviceIdNow();
    const rec: LocalRecord = await createRecord(db, 'attachment', fields);
    await db.blobs.put({
      attachmentId: rec.id,
      blob: BYTES,
      mediaType: 'text/csv',
      createdAt: '2025-06-12T07:00:00.000Z',
      uploadedAt: null,
    });

    const done = engine.syncNow();
    const push = await until(() => http.match('/api/sync/push')[0], 'push');
    push.flush({
      results: [
        { opId: push.request.body.ops[0].opId, status: 'applied', rev: 1, record: { ...fields, id: rec.id, rev: 1, objectKey: null } },
      ],
    });
    const put = await until(() => http.match(`/api/attachments/${rec.id}/content`)[0], 'the PUT');
    expect(put.request.method).toBe('PUT');
    expect(put.request.headers.get('Content-Type')).toBe('text/csv');
    put.flush({ error: { message: 'File storage is not configured on this server' } }, { status: 503, statusText: 'Unavailable' });
    const pull = await until(() => http.match((r) => r.url === '/api/sync/pull')[0], 'the pull');
    pull.flush({ changes: [], cursor: 3, more: false });
    await done;

    expect(engine.lastError()).toBe('File storage is not configured on this server');
    expect(await db.blobs.get(rec.id)).toMatchObject({ uploadedAt: null, attempts: 1 });
  });
});
