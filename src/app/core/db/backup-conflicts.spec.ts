import { BackupFileError, importBackup, makeBackup, parseBackup, summarizeBackup } from './backup-file';
import { resolveConflict } from './conflict-resolve';
import { saveEdit } from './outbox-writer';
import { applyPushResults, takeBatch } from './push-apply';
import { collar, testDb } from './testing/test-db';

const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const B = 'bbbbbbbb-bbbb-4bbb-8bbb-bbbbbbbbbbbb';
const USER = { id: '99999999-9999-4999-8999-999999999999', email: 'crew@fluxwalk.example', displayName: 'Crew' };

describe('backup file', () => {
  it('when saved and loaded on another device of the same user, then the same ops are queued once', async () => {
    const first = testDb();
    await first.records('collar').bulkPut([collar(A, 2), collar(B, 1)]);
    await saveEdit(first, 'collar', A, { notes: 'seen <script>alert(1)</script>' });
    await saveEdit(first, 'collar', B, { status: 'damaged', statusReason: 'trampled' });
    const text = JSON.stringify(await makeBackup(first, USER));

    const second = testDb();
    await second.records('collar').put(collar(A, 2));
    const tally = await importBackup(second, parseBackup(text), USER.id);
    const again = await importBackup(second, parseBackup(text), USER.id);

    expect(tally).toEqual({ queued: 2, skipped: 0 });
    expect(again).toEqual({ queued: 0, skipped: 2 });
    const ops = await second.outbox.orderBy('seq').toArray();
    const originals = await first.outbox.orderBy('seq').toArray();
    expect(ops.map((o) => [o.opId, o.baseRev, o.fields])).toEqual(originals.map((o) => [o.opId, o.baseRev, o.fields]));
    expect((await second.records('collar').get(A))?.['notes']).toBe('seen <script>alert(1)</script>');
  });

  it('when an op in the file was already acknowledged on this device, then it is skipped', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 1));
    await saveEdit(db, 'collar', A, { notes: 'a1' });
    const file = await makeBackup(db, USER);
    const sent = await takeBatch(db);
    await applyPushResults(db, sent, [{ opId: sent[0].opId, status: 'applied', rev: 2 }]);

    expect(await importBackup(db, file, USER.id)).toEqual({ queued: 0, skipped: 1 });
    expect(await db.outbox.count()).toBe(0);
  });

  it('when the file belongs to someone else, then it is refused for loading but can be read', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 1));
    await saveEdit(db, 'collar', A, { notes: 'x' });
    const file = await makeBackup(db, USER);
    await expect(importBackup(testDb(), file, 'someone-else')).rejects.toThrow(BackupFileError);
    expect(summarizeBackup(file)).toEqual([expect.objectContaining({ entity: 'collar', id: A, fields: ['notes'], created: false })]);
  });

  it('when the text is not a backup file, then it says so', () => {
    expect(() => parseBackup('{"hello":1}')).toThrow('not a Fluxwalk backup file');
    expect(() => parseBackup('nope')).toThrow('not JSON');
  });
});

describe('resolving a conflict', () => {
  async function conflicted() {
    const db = testDb();
    await db.records('collar').put(collar(A, 1, { notes: 'base', statusReason: null }));
    await saveEdit(db, 'collar', A, { notes: 'mine', status: 'damaged', statusReason: 'boar' });
    const sent = await takeBatch(db);
    await applyPushResults(db, sent, [
      {
        opId: sent[0].opId,
        status: 'conflict',
        rev: 2,
        conflict: { fields: ['notes'], server: collar(A, 2, { notes: 'theirs' }), serverRev: 2 },
      },
    ]);
    return { db, c: (await db.conflicts.toArray())[0] };
  }

  it('when the person keeps mine for the note, then one op on the server rev carries it and the other fields', async () => {
    const { db, c } = await conflicted();
    await resolveConflict(db, c, { notes: 'mine' });
    const ops = await db.outbox.toArray();
    expect(ops).toHaveLength(1);
    expect(ops[0]).toMatchObject({ baseRev: 2, op: 'upsert', fields: { notes: 'mine', status: 'damaged', statusReason: 'boar' } });
    expect(await db.conflicts.count()).toBe(0);
    expect((await db.records('collar').get(A))?.['notes']).toBe('mine');
  });

  it('when the person keeps theirs, then the fields the server did not touch are still sent', async () => {
    const { db, c } = await conflicted();
    await resolveConflict(db, c, { notes: 'theirs' });
    const ops = await db.outbox.toArray();
    expect(ops[0].fields).toEqual({ status: 'damaged', statusReason: 'boar' });
    expect((await db.records('collar').get(A))?.['notes']).toBe('theirs');
  });
});
