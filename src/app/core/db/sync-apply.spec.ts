import type { PullAnswer } from '../../../../shared/sync/sync-wire';
import { createRecord, saveEdit } from './outbox-writer';
import { applyPullPage, readCursor, resetForRedownload } from './pull-apply';
import { applyPushResults, takeBatch } from './push-apply';
import { collar, PLOT, SITE, testDb } from './testing/test-db';
import { validated } from './validated';

const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const B = 'bbbbbbbb-bbbb-4bbb-8bbb-bbbbbbbbbbbb';

function page(changes: PullAnswer['changes'], cursor: number, more = false): PullAnswer {
  return { changes, cursor, more };
}

describe('applying pull pages', () => {
  it('when a page arrives, then its records, removals and cursor are stored together', async () => {
    const db = testDb();
    await db.records('collar').put(collar(B, 1));

    await applyPullPage(
      db,
      page(
        [
          { seq: 7, entity: 'collar', id: A, rev: 2, deleted: false, record: collar(A, 2, { notes: 'from server' }) },
          { seq: 8, entity: 'collar', id: B, rev: 2, deleted: true, record: null, reason: 'deleted' },
          { seq: 9, entity: 'somethingNew', id: A, rev: 1, deleted: false, record: {} },
        ],
        9,
      ),
    );

    expect((await db.records('collar').get(A))?.['notes']).toBe('from server');
    expect(await db.records('collar').get(B)).toBeUndefined();
    expect(await readCursor(db)).toBe(9);
  });

  it('when a page brings a record with a queued edit, then the edit stays laid over the server copy', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 1, { notes: 'old', code: 'C-01' }));
    await saveEdit(db, 'collar', A, { notes: 'mine' });

    await applyPullPage(
      db,
      page([{ seq: 3, entity: 'collar', id: A, rev: 2, deleted: false, record: collar(A, 2, { notes: 'old', code: 'C-01b' }) }], 3),
    );

    const rec = await db.records('collar').get(A);
    expect(rec).toMatchObject({ rev: 2, code: 'C-01b', notes: 'mine' });
    expect((await db.outbox.toArray())[0].baseRev).toBe(1);
  });

  it('when a page holds an older rev than the copy from a push answer, then the newer copy is kept', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 5, { notes: 'rev 5' }));
    await applyPullPage(
      db,
      page([{ seq: 3, entity: 'collar', id: A, rev: 4, deleted: false, record: collar(A, 4, { notes: 'rev 4' }) }], 3),
    );
    expect((await db.records('collar').get(A))?.['notes']).toBe('rev 5');
  });

  it('when a page brings back a copy at the rev the device holds and nothing is queued, then the stored record is not written again', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 2, { notes: 'same' }));
    await db.records('collar').put(collar(B, 1, { notes: 'old' }));
    let writes = 0;
    const table = db.records('collar');
    table.hook('creating', () => void writes++);
    table.hook('updating', () => void writes++);

    // A push answer already stored rev 2 of A; the next pull brings that change back, and B's newer rev.
    await applyPullPage(
      db,
      page(
        [
          { seq: 4, entity: 'collar', id: A, rev: 2, deleted: false, record: collar(A, 2, { notes: 'same' }) },
          { seq: 5, entity: 'collar', id: B, rev: 2, deleted: false, record: collar(B, 2, { notes: 'new' }) },
        ],
        5,
      ),
    );

    expect(writes).toBe(1); // B only: a rewrite of A would wake every live query that reads collars for nothing
    expect((await table.get(B))?.notes).toBe('new');
    expect(await readCursor(db)).toBe(5);
  });

  it('when the server answers 410, then copies and cursor are reset but the outbox and local creates are kept', async () => {
    const db = testDb();
    await db.records('collar').bulkPut([collar(A, 2), collar(B, 1)]);
    await saveEdit(db, 'collar', A, { notes: 'unsent edit' });
    const made = await createRecord(db, 'collar', validated('collar', { siteId: SITE, code: 'NEW', plotId: PLOT, diameterCm: 20 }));
    await db.meta.put({ key: 'pullCursor', value: 40 });

    await resetForRedownload(db);

    expect(await readCursor(db)).toBe(0);
    expect(await db.outbox.count()).toBe(2);
    expect(await db.records('collar').get(B)).toBeUndefined();
    expect((await db.records('collar').get(made.id))?.['code']).toBe('NEW');
    // The full download then brings A back with the queued edit over it.
    await applyPullPage(
      db,
      page([{ seq: 50, entity: 'collar', id: A, rev: 3, deleted: false, record: collar(A, 3, { notes: 'server' }) }], 50),
    );
    expect((await db.records('collar').get(A))?.['notes']).toBe('unsent edit');
  });
});

describe('applying push answers', () => {
  it('when a batch is taken, then it holds one op per record and marks them sent', async () => {
    const db = testDb();
    await db.records('collar').bulkPut([collar(A, 1), collar(B, 1)]);
    const first = await saveEdit(db, 'collar', A, { notes: '1' });
    await db.outbox.update(first!.seq!, { sentAt: '2025-01-01T00:00:00.000Z' });
    await saveEdit(db, 'collar', A, { notes: '2' });
    await saveEdit(db, 'collar', B, { notes: 'b' });

    const batch = await takeBatch(db);

    expect(batch.map((o) => [o.id, o.fields['notes']])).toEqual([
      [A, '1'],
      [B, 'b'],
    ]);
    expect((await db.outbox.toArray()).filter((o) => o.sentAt !== null)).toHaveLength(2);
  });

  it('when ops exceed the byte budget, then the batch stops before the budget', async () => {
    const db = testDb();
    await db.records('collar').bulkPut([collar(A, 1), collar(B, 1)]);
    await saveEdit(db, 'collar', A, { notes: 'x'.repeat(3000) });
    await saveEdit(db, 'collar', B, { notes: 'y'.repeat(3000) });
    expect(await takeBatch(db, 4000)).toHaveLength(1);
    expect(await takeBatch(db, 4000)).toHaveLength(1); // each op alone fits; the first one is still queued
  });

  it('when ops are applied, conflicted and rejected, then each lands where it belongs', async () => {
    const db = testDb();
    const C = 'cccccccc-cccc-4ccc-8ccc-cccccccccccc';
    await db.records('collar').bulkPut([collar(A, 1, { notes: 'a0' }), collar(B, 1, { notes: 'b0' }), collar(C, 1, { notes: 'c0' })]);
    await saveEdit(db, 'collar', A, { notes: 'a1' });
    await saveEdit(db, 'collar', B, { notes: 'b1' });
    await saveEdit(db, 'collar', C, { code: 'C-99' });
    const sent = await takeBatch(db);
    await saveEdit(db, 'collar', A, { status: 'damaged', statusReason: 'frost heave' }); // made while the push was out

    const tally = await applyPushResults(db, sent, [
      { opId: sent[0].opId, status: 'applied', rev: 2, record: collar(A, 2, { notes: 'a1' }) },
      {
        opId: sent[1].opId,
        status: 'conflict',
        rev: 3,
        conflict: { fields: ['notes'], server: collar(B, 3, { notes: 'lead' }), serverRev: 3 },
      },
      { opId: sent[2].opId, status: 'rejected', error: { message: 'Only a lead may change code of a collar' } },
    ]);

    expect(tally).toEqual({ done: 1, conflicts: 1, rejected: 1 });
    const left = await db.outbox.toArray();
    expect(left).toHaveLength(1);
    expect(left[0]).toMatchObject({ id: A, baseRev: 2, fields: { status: 'damaged', statusReason: 'frost heave' } });
    expect(await db.records('collar').get(A)).toMatchObject({ rev: 2, notes: 'a1', status: 'damaged' });
    const conflict = (await db.conflicts.toArray())[0];
    expect(conflict).toMatchObject({ recordId: B, fields: ['notes'], mine: { notes: 'b1' }, base: { notes: 'b0' }, serverRev: 3 });
    expect((await db.records('collar').get(B))?.['notes']).toBe('lead');
    expect((await db.rejected.toArray())[0]).toMatchObject({ id: C, message: 'Only a lead may change code of a collar' });
    expect((await db.records('collar').get(C))?.['code']).toBe('C-01');
  });

  it('when a replayed op reports that it first conflicted, then it is shown as a conflict, not as done', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 1, { notes: 'a0' }));
    await saveEdit(db, 'collar', A, { notes: 'a1' });
    const sent = await takeBatch(db);
    const tally = await applyPushResults(db, sent, [
      {
        opId: sent[0].opId,
        status: 'duplicate',
        originalStatus: 'conflict',
        rev: 4,
        conflict: { fields: ['notes'], server: null, serverRev: 4 },
      },
    ]);
    expect(tally.conflicts).toBe(1);
    expect(await db.conflicts.count()).toBe(1);
  });

  it('when an answer is missing for an op, then the op stays queued with the same opId', async () => {
    const db = testDb();
    await db.records('collar').put(collar(A, 1));
    await saveEdit(db, 'collar', A, { notes: 'a1' });
    const sent = await takeBatch(db);
    await applyPushResults(db, sent, []);
    expect((await db.outbox.toArray())[0].opId).toBe(sent[0].opId);
  });
});
