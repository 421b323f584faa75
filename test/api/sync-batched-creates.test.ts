import { randomUUID } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import * as writer from '../../server/records/record-writer';
import { applyBatch, parseOp } from '../../server/sync/sync-push';
import { buildWorld, createBody, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * The push stores plain creates several rows to a statement. Whatever it batches, the answers, the
 * stored rows (derived values included), the change log (its order too) and the op ledger must be
 * exactly those of applying every op alone: both run on the same ops in a transaction rolled back after.
 */
describe('sync push: batched creates answer as single creates', () => {
  let t: TestApp;
  let admin: Session, lab: Session;
  let home: World, other: World;
  let lead: SessionUser, crew: SessionUser;
  let lockedVisitId: string;

  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const hl = await makeUser(admin, ['lead'], []);
    const ol = await makeUser(admin, ['lead'], []);
    const leadSession = await signIn(t.app, hl.email);
    home = await buildWorld({ admin, lead: leadSession, lab }, hl.id, `bc${randomUUID().slice(0, 6)}`);
    other = await buildWorld({ admin, lead: await signIn(t.app, ol.email), lab }, ol.id, `bo${randomUUID().slice(0, 6)}`);
    lead = (await leadSession.get('/api/auth/me')).body.user;
    crew = (await (await signIn(t.app, (await makeUser(admin, ['crew'], [home.site.id])).email)).get('/api/auth/me')).body.user;
    const campaign = (
      await leadSession.post('/api/campaigns', {
        siteId: home.site.id,
        name: 'Closed',
        startsOn: '2026-05-01',
        endsOn: '2026-05-01',
        rounds: 1,
      })
    ).body.record;
    lockedVisitId = (
      await leadSession.post('/api/visits', {
        siteId: home.site.id,
        campaignId: campaign.id,
        round: 1,
        collarId: home.collar.id,
        arrivedAt: '2026-05-01T08:00:00Z',
        skipped: true,
        skipReason: 'flooded',
      })
    ).body.record.id;
    expect((await leadSession.post(`/api/campaigns/${campaign.id}/lock`)).status).toBe(200);
  });
  afterAll(() => t.close());

  const create = (entity: string, fields: Record<string, unknown>, id: string = randomUUID()) => ({
    opId: randomUUID(),
    entity,
    id,
    baseRev: null,
    op: 'upsert',
    fields,
  });
  const event = (n: number, collarId = home.collar.id, siteId = home.site.id) =>
    create('collarEvent', { siteId, collarId, kind: 'clipped', date: '2026-06-03', note: `batched ${n}` });
  const offset = (over: Record<string, unknown> = {}) =>
    create('offsetSet', { ...createBody(home.offsetSet), readingsCm: [1.5, 2.5, 12], ...over });
  const probe = (over: Record<string, unknown> = {}) =>
    create('probeReading', { ...createBody(home.probeReading), moistureRaw: 18.25, ...over });

  /** Runs the ops in a transaction, reads back everything they wrote, and rolls it all back. */
  async function run(user: SessionUser, deviceId: string, ops: unknown[], batchCreates: boolean, deferEdits = true) {
    const rollback = new Error('rollback');
    let seen: unknown;
    const [{ s: since }] = await t.ds.query(`SELECT coalesce(max(seq), 0)::bigint AS s FROM change_log`);
    await t.ds
      .transaction(async (em: EntityManager) => {
        const results = await applyBatch(em, user, deviceId, ops.length, ops.map(parseOp), { batchCreates, deferEdits });
        const log = await em.query(
          `SELECT entity, record_id, rev, site_id, fields, deleted, user_id, device_id FROM change_log WHERE seq > $1 ORDER BY seq`,
          [since],
        );
        const rows: Record<string, unknown[]> = {};
        for (const table of ['collar_event', 'offset_set', 'probe_reading', 'visit', 'analyzer', 'collar']) {
          const ids = (ops as { id: string }[]).map((o) => o.id);
          rows[table] = (await em.query(`SELECT * FROM ${table} WHERE id::text = ANY($1) ORDER BY id`, [ids])).map(
            ({ updated_at: _u, ...r }: Record<string, unknown>) => r,
          );
        }
        const ledger = await em.query(`SELECT op_id, status, response FROM sync_op WHERE device_id = $1 ORDER BY op_id`, [deviceId]);
        seen = { results: JSON.parse(JSON.stringify(results, (k, v) => (k === 'updatedAt' ? undefined : v))), log, rows, ledger };
        throw rollback;
      })
      .catch((err) => {
        if (err !== rollback) throw err;
      });
    return seen as { results: { status: string }[]; log: unknown[]; rows: Record<string, unknown[]>; ledger: unknown[] };
  }

  async function bothWays(user: SessionUser, ops: unknown[]) {
    const deviceId = randomUUID();
    const spy = jest.spyOn(writer, 'insertPrepared');
    const batched = await run(user, deviceId, ops, true);
    const batchedRows = spy.mock.calls.reduce((n, c) => n + c[2].length, 0);
    spy.mockClear();
    const single = await run(user, deviceId, ops, false);
    expect(spy).not.toHaveBeenCalled();
    spy.mockRestore();
    expect(batched).toEqual(single);
    return { batched, batchedRows };
  }

  it('when a batch holds only good creates, then they are stored together with the same answers, derived values and change log', async () => {
    const ops = [event(1), event(2), offset(), probe(), event(3), probe({ moistureRaw: 30 }), offset({ readingsCm: [0, 2, 3] })];
    const { batched, batchedRows } = await bothWays(lead, ops);
    expect(batchedRows).toBe(ops.length);
    expect(batched.results.map((r) => r.status)).toEqual(ops.map(() => 'applied'));
    expect(batched.log).toHaveLength(ops.length);
    expect(batched.rows['offset_set'].map((r) => (r as { mean_cm: number }).mean_cm)).toEqual(expect.arrayContaining([expect.any(Number)]));
    expect(batched.rows['probe_reading'].every((r) => (r as { vwc_pct: number | null }).vwc_pct !== null)).toBe(true);
  });

  it('when good and refused creates mix with edits, replays and creates that need an earlier one, then every answer is the single-op one', async () => {
    const visitId = randomUUID();
    const twice = event(5);
    const sameId = event(6);
    const ops = [
      event(4),
      create('collarEvent', { siteId: home.site.id, collarId: home.collar.id, kind: 'not-a-kind', date: '2026-06-03' }), // invalid
      event(7, other.collar.id, other.site.id), // not a member of the other site
      probe({ collarId: other.collar.id }), // another site's collar
      probe({ visitId: lockedVisitId }), // disagrees with the locked campaign's visit
      create('analyzer', { siteId: home.site.id, name: 'Not for a lead', serial: 'X' }), // role
      create('collarEvent', createBody(home.collarEvent), home.collarEvent.id), // repeated create, same content
      create('collarEvent', { ...createBody(home.collarEvent), note: 'changed' }, home.collarEvent.id), // repeated create, other content
      twice,
      twice, // the same op twice
      sameId,
      { ...event(8), id: sameId.id }, // one id, two contents
      {
        opId: randomUUID(),
        entity: 'collar',
        id: home.collar.id,
        baseRev: home.collar.rev,
        op: 'upsert',
        fields: { notes: 'edited in the batch' },
      },
      create(
        'visit',
        { siteId: home.site.id, campaignId: home.campaign.id, round: 1, collarId: home.collar.id, arrivedAt: '2026-06-01T10:00:00Z' },
        visitId,
      ),
      offset({ visitId }),
      probe({ visitId }), // under the visit created just before
      create('collar', { siteId: home.site.id, code: home.collar.code as string, plotId: home.plot.id, diameterCm: 20 }), // taken code: guarded entity
      event(9),
      probe(),
    ];
    const { batched, batchedRows } = await bothWays(lead, ops);
    expect(batchedRows).toBeGreaterThanOrEqual(5);
    expect(batched.results.map((r) => r.status)).toEqual([
      'applied',
      'rejected',
      'rejected',
      'rejected',
      'rejected',
      'rejected',
      'duplicate',
      'conflict',
      'applied',
      'duplicate',
      'applied',
      'conflict',
      'applied',
      'applied',
      'applied',
      'applied',
      'rejected',
      'applied',
      'applied',
    ]);
  });

  it('when a crew member pushes creates their role allows and one it does not, then the answers are the single-op ones', async () => {
    const ops = [
      probe(),
      offset(),
      create('route', { siteId: home.site.id, name: 'Crew route', collarIds: [home.collar.id] }),
      probe(),
      event(10),
    ];
    const { batched } = await bothWays(crew, ops);
    expect(batched.results.filter((r) => r.status === 'applied').length).toBeGreaterThanOrEqual(3);
  });

  const editOf = (rec: { id: string; rev: number }, entity: string, fields: Record<string, unknown>) => ({
    opId: randomUUID(),
    entity,
    id: rec.id,
    baseRev: rec.rev,
    op: 'upsert',
    fields,
  });
  type Logged = { entity: string; record_id: string; rev: number };
  const logOrder = (log: unknown[]) => (log as Logged[]).map((l) => l.record_id);
  const sortedLog = (log: unknown[]) =>
    [...(log as Logged[])].sort((a, b) => `${a.record_id}${a.rev}`.localeCompare(`${b.record_id}${b.rev}`));

  /** The same ops with the independent edits held to the end and applied in op order: answers, rows and ledger must agree. */
  async function deferredAndInOrder(ops: unknown[]) {
    const deviceId = randomUUID();
    const deferred = await run(lead, deviceId, ops, true, true);
    const inOrder = await run(lead, deviceId, ops, true, false);
    expect(deferred.results).toEqual(inOrder.results);
    expect(deferred.rows).toEqual(inOrder.rows);
    expect(deferred.ledger).toEqual(inOrder.ledger);
    expect(sortedLog(deferred.log)).toEqual(sortedLog(inOrder.log));
    return { deferred, inOrder };
  }

  it('when a batch edits a record other devices edit too before its creates, then the edit is applied last, with the answers, rows and ledger of applying it in order', async () => {
    const shared = editOf(home.collarEvent, 'collarEvent', { note: 'edited early in the batch' });
    const ops = [shared, event(20), event(21), probe()];
    const { deferred, inOrder } = await deferredAndInOrder(ops);
    expect(deferred.results.map((r) => r.status)).toEqual(['applied', 'applied', 'applied', 'applied']);
    // Its row lock (the one other pushes wait for) is taken last: the change log shows it after the creates.
    expect(logOrder(inOrder.log)[0]).toBe(home.collarEvent.id);
    expect(logOrder(deferred.log).at(-1)).toBe(home.collarEvent.id);
  });

  it('when held-back edits include one of a record that does not exist and one that breaks a field rule, then each gets its in-order answer and the good one applies', async () => {
    const missing = editOf({ id: randomUUID(), rev: 1 }, 'collarEvent', { note: 'no such event' });
    const bad = editOf(home.collarEvent, 'collarEvent', { kind: 'not-a-kind' });
    const good = editOf(home.probeReading as { id: string; rev: number }, 'probeReading', { moistureRaw: 21.5 });
    const { deferred } = await deferredAndInOrder([missing, bad, good, event(25)]);
    expect(deferred.results.map((r) => r.status)).toEqual(['rejected', 'rejected', 'applied', 'applied']);
  });

  it('when a later op of the batch names the edited record, then the edit keeps its place', async () => {
    const first = editOf(home.collarEvent, 'collarEvent', { note: 'first of two edits' });
    const second = editOf(home.collarEvent, 'collarEvent', { date: '2026-06-04' });
    const made = event(22);
    const { deferred } = await deferredAndInOrder([first, made, second]);
    expect(logOrder(deferred.log)).toEqual([home.collarEvent.id, made.id, home.collarEvent.id]);
  });

  it('when a later create names the edited record inside its fields, then the edit keeps its place', async () => {
    const visitEdit = editOf(home.visit as { id: string; rev: number }, 'visit', {
      conditions: { other: 'edited before a reading under it' },
    });
    const made = event(24);
    const reading = probe(); // under the same visit: its checks read the visit
    expect(JSON.stringify(reading)).toContain(home.visit.id);
    const { deferred } = await deferredAndInOrder([visitEdit, made, reading]);
    expect(deferred.results.map((r) => r.status)).toEqual(['applied', 'applied', 'applied']);
    expect(logOrder(deferred.log)).toEqual([home.visit.id, made.id, reading.id]);
  });

  it("when an edit of another kind of record follows, then the earlier edit keeps its place (the collar's checks may read other records)", async () => {
    const shared = editOf(home.collarEvent, 'collarEvent', { note: 'before a collar edit' });
    const made = event(23);
    const collarEdit = editOf(home.collar as { id: string; rev: number }, 'collar', { notes: 'edited after the event' });
    const { deferred } = await deferredAndInOrder([shared, made, collarEdit]);
    expect(logOrder(deferred.log)).toEqual([home.collarEvent.id, made.id, home.collar.id]);
  });
});
