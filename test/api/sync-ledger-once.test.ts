import { randomUUID } from 'node:crypto';
import type { SessionUser } from '../../shared/auth/roles';
import { applyBatch, parseOp } from '../../server/sync/sync-push';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * The op ledger row of a pushed op is written once, with its answer: no placeholder row that is
 * updated later (each update is one more row version for PostgreSQL to write). A replay racing in
 * another request still never applies an op twice.
 */
describe('the sync op ledger row is written once', () => {
  let t: TestApp;
  let lead: Session;
  let user: SessionUser;
  let w: World;
  const push = (ops: unknown[], deviceId = randomUUID()) => lead.post('/api/sync/push', { deviceId, outboxSize: ops.length, ops });
  const event = (note: string) => ({
    opId: randomUUID(),
    entity: 'collarEvent',
    id: randomUUID(),
    baseRev: null,
    op: 'upsert',
    fields: { siteId: w.site.id, collarId: w.collar.id, kind: 'clipped', date: '2026-06-01', note },
  });

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lab = await signIn(t.app, demoEmail('lab'));
    const made = await makeUser(admin, ['lead'], []);
    lead = await signIn(t.app, made.email);
    w = await buildWorld({ admin, lead, lab }, made.id, `lo${randomUUID().slice(0, 6)}`);
    user = (await lead.get('/api/auth/me')).body.user;
  });
  afterAll(() => t.close());

  it('when a batch of creates, an edit, a bad op and a repeat is pushed, then each ledger row is inserted once and never updated', async () => {
    const edit = { opId: randomUUID(), entity: 'collar', id: w.collar.id, baseRev: w.collar.rev, op: 'upsert', fields: { notes: 'once' } };
    const bad = { ...event('bad'), fields: { siteId: w.site.id, collarId: randomUUID(), kind: 'clipped', date: '2026-06-01' } };
    const creates = [event('a'), event('b'), event('c')];
    const ops = [...creates, edit, bad, creates[0]];
    const { results, counts } = await t.ds.transaction(async (em) => {
      const results = await applyBatch(em, user, randomUUID(), ops.length, ops.map(parseOp));
      const [counts] = await em.query(
        `SELECT n_tup_ins::int AS ins, n_tup_upd::int AS upd FROM pg_stat_xact_user_tables WHERE relname = 'sync_op'`,
      );
      return { results, counts };
    });
    expect(results.map((r) => r.status)).toEqual(['applied', 'applied', 'applied', 'applied', 'rejected', 'duplicate']);
    expect(counts).toEqual({ ins: 5, upd: 0 });
    const stored = await t.ds.query(`SELECT op_id, status, response FROM sync_op WHERE op_id = ANY($1::uuid[]) ORDER BY status`, [
      ops.map((o) => o.opId),
    ]);
    expect(stored).toHaveLength(5);
    expect(stored.find((r: { op_id: string }) => r.op_id === edit.opId)).toMatchObject({
      status: 'applied',
      response: { opId: edit.opId, rev: w.collar.rev + 1 },
    });
    expect(stored.find((r: { op_id: string }) => r.op_id === bad.opId).response.error.message).toBeTruthy();
  });

  it('when the same batch is pushed by two requests at once, then every op takes effect once and one of them answers duplicate', async () => {
    const [current] = await t.ds.query(`SELECT rev::int AS rev FROM collar WHERE id = $1`, [w.collar.id]);
    const edit = {
      opId: randomUUID(),
      entity: 'collar',
      id: w.collar.id,
      baseRev: current.rev,
      op: 'upsert',
      fields: { notes: `race ${randomUUID()}` },
    };
    const ops = [event('r1'), edit, event('r2')];
    const deviceId = randomUUID();
    const [a, b] = await Promise.all([push(ops, deviceId), push(ops, deviceId)]);
    expect([a.status, b.status]).toEqual([200, 200]);
    const statuses = [a, b].map((res) => res.body.results.map((r: { status: string }) => r.status).join());
    expect(statuses.sort()).toEqual(['applied,applied,applied', 'duplicate,duplicate,duplicate']);
    const [{ rev }] = await t.ds.query(`SELECT rev::int AS rev FROM collar WHERE id = $1`, [w.collar.id]);
    expect(rev).toBe(current.rev + 1);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM change_log WHERE record_id = ANY($1::uuid[]) AND rev = $2`, [
      [ops[0].id, ops[2].id],
      1,
    ]);
    expect(n).toBe(2);
    const [{ m }] = await t.ds.query(`SELECT count(*)::int AS m FROM sync_op WHERE op_id = ANY($1::uuid[])`, [ops.map((o) => o.opId)]);
    expect(m).toBe(3);
  });
});
