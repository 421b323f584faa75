import Dexie from 'dexie';
import { createRecord, deleteRecord, saveEdit } from './outbox-writer';
import { collar, PLOT, SITE, testDb } from './testing/test-db';
import { validated } from './validated';

const ID = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';

describe('local writes and the outbox', () => {
  it('when a note is edited, then the record and one op with the server rev as base are written together', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 3, { notes: 'old' }));

    await saveEdit(db, 'collar', ID, { notes: 'roots exposed' });

    expect((await db.records('collar').get(ID))?.['notes']).toBe('roots exposed');
    const ops = await db.outbox.toArray();
    expect(ops).toHaveLength(1);
    expect(ops[0]).toMatchObject({
      entity: 'collar',
      id: ID,
      baseRev: 3,
      op: 'upsert',
      fields: { notes: 'roots exposed' },
      base: { notes: 'old' },
      sentAt: null,
    });
  });

  it('when the write fails inside the transaction, then neither the record nor the op is stored', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 3, { notes: 'old' }));
    const realAdd = db.outbox.add.bind(db.outbox);
    db.outbox.add = () => Dexie.Promise.reject(new Error('disk full'));

    await expect(saveEdit(db, 'collar', ID, { notes: 'lost?' })).rejects.toThrow('disk full');

    db.outbox.add = realAdd;
    expect((await db.records('collar').get(ID))?.['notes']).toBe('old');
    expect(await db.outbox.count()).toBe(0);
  });

  it('when the same record is edited twice before sync, then one op keeps the first baseRev and both fields', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 3, { notes: 'old' }));

    await saveEdit(db, 'collar', ID, { notes: 'first' });
    await db.records('collar').update(ID, { rev: 5 }); // a pull brought a newer server copy meanwhile
    await saveEdit(db, 'collar', ID, { notes: 'second', status: 'damaged', statusReason: 'boar' });

    const ops = await db.outbox.toArray();
    expect(ops).toHaveLength(1);
    expect(ops[0].baseRev).toBe(3);
    expect(ops[0].fields).toEqual({ notes: 'second', status: 'damaged', statusReason: 'boar' });
    // The base of fields first touched after the copy moved on is unknown, so it is not invented.
    expect(ops[0].base).toEqual({ notes: 'old' });
  });

  it('when an op was already sent, then a later edit becomes a new op and the sent one is unchanged', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 3));
    const first = await saveEdit(db, 'collar', ID, { notes: 'a' });
    await db.outbox.update(first!.seq!, { sentAt: '2025-01-01T00:00:00.000Z' });

    await saveEdit(db, 'collar', ID, { notes: 'b' });

    const ops = await db.outbox.orderBy('seq').toArray();
    expect(ops.map((o) => o.fields['notes'])).toEqual(['a', 'b']);
    expect(ops[0].opId).toBe(first!.opId);
  });

  it('when nothing really changes, then no op is queued', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 3, { notes: 'same' }));
    expect(await saveEdit(db, 'collar', ID, { notes: 'same' })).toBeNull();
    expect(await db.outbox.count()).toBe(0);
  });

  it('when a record created here is deleted before it was sent, then both the record and its create disappear', async () => {
    const db = testDb();
    const rec = await createRecord(db, 'collar', validated('collar', { siteId: SITE, code: 'NEW', plotId: PLOT, diameterCm: 20 }));
    await saveEdit(db, 'collar', rec.id, { notes: 'typo' });
    expect(await db.outbox.count()).toBe(1); // the edit merged into the create

    await deleteRecord(db, 'collar', rec.id);

    expect(await db.outbox.count()).toBe(0);
    expect(await db.records('collar').get(rec.id)).toBeUndefined();
  });

  it('when an edited server record is deleted, then the pending op becomes a delete with the first baseRev', async () => {
    const db = testDb();
    await db.records('collar').put(collar(ID, 4));
    await saveEdit(db, 'collar', ID, { notes: 'x' });

    await deleteRecord(db, 'collar', ID);

    const ops = await db.outbox.toArray();
    expect(ops).toHaveLength(1);
    expect(ops[0]).toMatchObject({ op: 'delete', baseRev: 4, fields: {} });
    expect(await db.records('collar').get(ID)).toBeUndefined();
  });
});
