import { randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { httpSession } from '../support/http-session';
import { startServerProcess } from '../support/server-process';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const OPS = 4000;

describe('sync when the server process dies', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when the server is SIGKILLed during a large push and the client retries, then every op is applied exactly once', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const lead = await signIn(t.app, demoEmail('lead'));
    const world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    const ids = Array.from({ length: OPS }, () => randomUUID());
    const ops = ids.map((id, i) => ({
      opId: randomUUID(),
      entity: 'collarEvent',
      id,
      baseRev: null,
      op: 'upsert',
      fields: { siteId: world.site.id, collarId: world.collar.id, kind: 'clipped', date: '2026-06-01', note: `crash #${i}` },
    }));
    const body = { deviceId: randomUUID(), outboxSize: OPS, ops };
    const countStored = async () =>
      (await t.ds.query(`SELECT count(*)::int AS n FROM collar_event WHERE id = ANY($1::uuid[])`, [ids]))[0].n as number;

    const first = await startServerProcess(process.env['TEST_DATABASE_URL']!);
    const call = await httpSession(first.base, demoEmail('lead'));
    let answered = false;
    const lost = call('POST', '/api/sync/push', body).then(
      () => ((answered = true), 'answered'),
      () => 'lost',
    );
    // Kill while the push's transaction is open: a push of this size can answer within a few hundred
    // milliseconds, so a fixed delay may land after the commit. A transaction writing collar events holds
    // a RowExclusiveLock on the table until it commits.
    const writing = async () =>
      (
        await t.ds.query(`SELECT count(*)::int AS n FROM pg_locks l JOIN pg_class c ON c.oid = l.relation
          WHERE c.relname = 'collar_event' AND l.mode = 'RowExclusiveLock' AND l.pid <> pg_backend_pid()`)
      )[0].n > 0;
    const deadline = Date.now() + 30_000;
    while (!answered && Date.now() < deadline && !(await writing())) await new Promise((r) => setTimeout(r, 2));
    first.child.kill('SIGKILL');
    expect(await lost).toBe('lost');
    expect([0, OPS]).toContain(await countStored()); // a batch is all or nothing

    const second = await startServerProcess(process.env['TEST_DATABASE_URL']!);
    try {
      const retry = await (await httpSession(second.base, demoEmail('lead')))('POST', '/api/sync/push', body);
      expect(retry.status).toBe(200);
      const statuses = new Set(retry.json.results.map((r: { status: string; originalStatus?: string }) => r.originalStatus ?? r.status));
      expect([...statuses]).toEqual(['applied']);
      expect(await countStored()).toBe(OPS);
      const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM sync_op WHERE op_id = ANY($1::uuid[])`, [ops.map((o) => o.opId)]);
      expect(n).toBe(OPS);
      const [{ maxRev }] = await t.ds.query(`SELECT max(rev)::int AS "maxRev" FROM collar_event WHERE id = ANY($1::uuid[])`, [ids]);
      expect(maxRev).toBe(1);
    } finally {
      second.child.kill('SIGTERM');
    }
  });
});
