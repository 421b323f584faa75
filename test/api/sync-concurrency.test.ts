import { randomUUID } from 'node:crypto';
import { SYNC_ENTITIES } from '../../shared/model/entities';
import { ENTITY_DEFS } from '../../server/records/entity-registry';
import { toWire } from '../../server/records/wire';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const DEVICES = 20;
const OPS_PER_DEVICE = 500;
const SHARED_COLLARS = 10;

/** 20 devices push 500 ops each at the same time, on purpose overlapping on ten shared collars. */
describe('sync under concurrency', () => {
  let t: TestApp;
  let lead: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  const shared: string[] = [];
  beforeAll(async () => {
    t = await startTestApp({});
    const admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
    for (let i = 0; i < SHARED_COLLARS; i++) {
      shared.push(
        (await lead.post('/api/collars', { siteId: world.site.id, code: `SH-${i}`, plotId: world.plot.id, diameterCm: 20 })).body.record.id,
      );
    }
  });
  afterAll(() => t.close());

  function deviceOps(d: number) {
    const ops: Record<string, unknown>[] = [];
    for (let i = 0; ops.length < OPS_PER_DEVICE; i++) {
      const kind = i % 10;
      if (kind < 6) {
        ops.push({
          opId: randomUUID(),
          entity: 'collarEvent',
          id: randomUUID(),
          baseRev: null,
          op: 'upsert',
          fields: { siteId: world.site.id, collarId: shared[i % SHARED_COLLARS], kind: 'clipped', date: '2026-06-01', note: `d${d} #${i}` },
        });
      } else if (kind < 8) {
        // Every device edits the shared collars from rev 1: the first wins, disjoint fields merge, the rest conflict.
        const field = kind === 6 ? { notes: `device ${d} op ${i}` } : { heightCm: 5 + d };
        ops.push({ opId: randomUUID(), entity: 'collar', id: shared[i % SHARED_COLLARS], baseRev: 1, op: 'upsert', fields: field });
      } else if (kind === 8) {
        ops.push({ ...ops[ops.length - 3] }); // the same opId again in the same batch: a replay
      } else {
        ops.push({
          opId: randomUUID(),
          entity: 'collar',
          id: randomUUID(),
          baseRev: null,
          op: 'upsert',
          fields: { siteId: world.site.id, code: `BAD-${d}-${i}`, plotId: world.plot.id, diameterCm: 500 },
        });
      }
    }
    return ops;
  }

  it('when 20 devices push at once, then every op is answered once, nothing is duplicated and a full pull reproduces the database', async () => {
    const batches = Array.from({ length: DEVICES }, (_, d) => deviceOps(d));
    const answers = await Promise.all(
      batches.map((ops) => lead.post('/api/sync/push', { deviceId: randomUUID(), outboxSize: ops.length, ops })),
    );

    const statuses: Record<string, number> = {};
    for (const a of answers) {
      expect(a.status).toBe(200);
      for (const r of a.body.results) statuses[r.status] = (statuses[r.status] ?? 0) + 1;
    }
    const sent = DEVICES * OPS_PER_DEVICE;
    expect(Object.values(statuses).reduce((x, y) => x + y, 0)).toBe(sent);
    expect(statuses['rejected']).toBe(DEVICES * 50);
    expect(statuses['duplicate']).toBe(DEVICES * 50);
    expect(statuses['applied']).toBeGreaterThan(DEVICES * 300 - 1);

    const uniqueOpIds = new Set(batches.flat().map((o) => o['opId'] as string));
    const [{ n: ledger }] = await t.ds.query(`SELECT count(*)::int AS n FROM sync_op WHERE op_id = ANY($1::uuid[])`, [[...uniqueOpIds]]);
    expect(ledger).toBe(uniqueOpIds.size);
    const [{ n: events }] = await t.ds.query(`SELECT count(*)::int AS n FROM collar_event WHERE site_id = $1`, [world.site.id]);
    expect(events).toBe(DEVICES * 300);
    const [{ n: revs }] = await t.ds.query(
      `SELECT count(*)::int AS n FROM (SELECT record_id, rev FROM change_log GROUP BY 1, 2 HAVING count(*) > 1) x`,
    );
    expect(revs).toBe(0);

    // A full pull from cursor 0 reproduces every record of the site exactly.
    const pulled = new Map<string, Record<string, unknown> | null>();
    let cursor = 0;
    for (let more = true; more;) {
      const r = await lead.get(`/api/sync/pull?cursor=${cursor}&limit=5000&deviceId=${randomUUID()}`);
      for (const c of r.body.changes) pulled.set(`${c.entity}:${c.id}`, c.record);
      cursor = r.body.cursor;
      more = r.body.more;
    }
    for (const entity of SYNC_ENTITIES) {
      const d = ENTITY_DEFS[entity];
      const where = entity === 'site' ? { id: world.site.id } : { siteId: world.site.id };
      const rows = await t.ds.getRepository(d.target).findBy(where);
      for (const row of rows) expect(pulled.get(`${entity}:${row['id']}`)).toEqual(toWire(row));
    }
  });
});
