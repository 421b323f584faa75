import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import Dexie from 'dexie';
import { AuthStore } from '../auth/auth-store';
import { dbNameFor } from '../db/db-schema';
import { signedInDevice } from '../db/testing/signed-in-device';
import { until } from '../db/testing/until';
import { DeviceDb } from '../db/device-db';
import { DeviceRemoval } from './device-removal';

const OP = {
  opId: 'op-1',
  entity: 'collar',
  id: 'c-1',
  baseRev: null,
  op: 'upsert',
  fields: { code: 'A1' },
  base: {},
  sentAt: null,
  createdAt: 'now',
  updatedAt: 'now',
} as const;

async function answerSignOut(): Promise<void> {
  const backend = TestBed.inject(HttpTestingController);
  await until(() => {
    backend.match('/api/auth/csrf').forEach((r) => r.flush({ token: 't' }));
    return backend.match('/api/auth/logout').map((r) => r.flush(null, { status: 204, statusText: 'No Content' })).length;
  }, 'the logout');
}

describe('DeviceRemoval', () => {
  beforeEach(() => localStorage.clear());

  it('when a device holds unsynced work, refused changes and conflicts, then they are counted before anything is removed', async () => {
    const { db } = await signedInDevice();
    await db.outbox.add({ ...OP });
    await db.rejected.add({
      opId: 'op-2',
      entity: 'collar',
      id: 'c-2',
      op: 'upsert',
      fields: {},
      baseRev: 1,
      message: 'no',
      problems: [],
      at: 'now',
    });
    await db.blobs.add({ attachmentId: 'a-1', blob: new Blob(['x']), mediaType: 'text/csv', createdAt: 'now', uploadedAt: null });
    expect(await TestBed.inject(DeviceRemoval).unsaved()).toEqual({ pending: 2, refused: 1, conflicts: 0 });
  });

  it("when the user signs out and removes the device data, then their database and every value kept for them are gone; others' stay", async () => {
    const { db, userId } = await signedInDevice();
    await db.outbox.add({ ...OP });
    localStorage.setItem(`fw.board.${userId}.progress.c1.all`, '{}');
    localStorage.setItem(`fw.walk.${userId}`, '{}');
    localStorage.setItem(`fw.site.${userId}`, '"s"');
    localStorage.setItem('fw.board.someone-else.progress.c1.all', '{}');
    localStorage.setItem('fw.outdoor', 'true');
    expect(await Dexie.exists(dbNameFor(userId))).toBe(true);
    const done = TestBed.inject(DeviceRemoval).signOutAndRemove();
    await answerSignOut();
    await done;
    expect(await Dexie.exists(dbNameFor(userId))).toBe(false);
    expect(Object.keys(localStorage).sort()).toEqual(['fw.board.someone-else.progress.c1.all', 'fw.outdoor']);
    expect(TestBed.inject(AuthStore).user()).toBeNull();
    expect(TestBed.inject(DeviceDb).db()).toBeNull();
  });
});
