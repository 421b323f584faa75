import { randomUUID } from 'node:crypto';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/** The op ledger answers a replay only to the user who sent the op: an opId is no key to someone else's answer. */
describe('the sync op ledger is per user', () => {
  let t: TestApp;
  let owner: Session, other: Session, sameSite: Session;
  let w: World;
  const push = (s: Session, ops: unknown[]) => s.post('/api/sync/push', { deviceId: randomUUID(), outboxSize: ops.length, ops });

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lab = await signIn(t.app, demoEmail('lab'));
    const lead = await makeUser(admin, ['lead'], []);
    owner = await signIn(t.app, lead.email);
    w = await buildWorld({ admin, lead: owner, lab }, lead.id, `lg${randomUUID().slice(0, 6)}`);
    other = await signIn(t.app, (await makeUser(admin, ['crew'], [])).email);
    sameSite = await signIn(t.app, (await makeUser(admin, ['crew'], [w.site.id])).email);
  });
  afterAll(() => t.close());

  it("when another user replays someone's opId, then the op is judged as theirs and the stored answer stays with its sender", async () => {
    const op = {
      opId: randomUUID(),
      entity: 'collar',
      id: w.collar.id,
      baseRev: w.collar.rev,
      op: 'upsert',
      fields: { notes: 'ledger test' },
    };
    const first = (await push(owner, [op])).body.results[0];
    expect(first).toMatchObject({ status: 'applied', rev: w.collar.rev + 1 });
    const stolen = (await push(other, [op])).body.results[0];
    expect(stolen.status).toBe('rejected');
    expect(stolen.originalStatus).toBeUndefined();
    expect(stolen.rev).toBeUndefined();
    expect(stolen.error.message).toBe(`No collar ${w.collar.id}`);
    // A member of the site replaying it gets its own answer (the edit is already there: nothing changes), not a duplicate.
    const member = (await push(sameSite, [op])).body.results[0];
    expect(member.status).not.toBe('duplicate');
    // The sender still gets the stored answer on a replay.
    expect((await push(owner, [op])).body.results[0]).toMatchObject({ status: 'duplicate', originalStatus: 'applied', rev: first.rev });
    const rows = await t.ds.query(`SELECT count(*)::int AS n FROM sync_op WHERE op_id = $1`, [op.opId]);
    expect(rows[0].n).toBe(3);
  });
});
