import { randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const CREW_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a01';

describe('sync push and pull', () => {
  let t: TestApp;
  let lead: Session, admin: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  const device = randomUUID();
  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
  });
  afterAll(() => t.close());

  const push = (s: Session, ops: unknown[], deviceId = device) => s.post('/api/sync/push', { deviceId, outboxSize: ops.length, ops });
  const collarEdit = (baseRev: number, fields: Record<string, unknown>) => ({
    opId: randomUUID(),
    entity: 'collar',
    id: world.collar.id,
    baseRev,
    op: 'upsert',
    fields,
  });
  const currentCollar = async () => (await lead.get(`/api/collars/${world.collar.id}`)).body.record;

  it('when an op is replayed, then the answer is duplicate with the first status and nothing changes', async () => {
    const base = await currentCollar();
    const op = collarEdit(base.rev, { notes: 'replay test' });
    const first = (await push(lead, [op])).body.results[0];
    const [{ n: logBefore }] = await t.ds.query(`SELECT count(*)::int AS n FROM change_log`);
    const again = (await push(lead, [op])).body.results[0];
    const [{ n: logAfter }] = await t.ds.query(`SELECT count(*)::int AS n FROM change_log`);
    expect(first.status).toBe('applied');
    expect(again).toMatchObject({ opId: op.opId, status: 'duplicate', originalStatus: 'applied', rev: first.rev });
    expect(logAfter).toBe(logBefore);
    expect((await currentCollar()).rev).toBe(first.rev);
  });

  it('when a stale base touches other fields than the server changed, then they merge', async () => {
    const base = await currentCollar();
    await push(lead, [collarEdit(base.rev, { notes: 'server side' })]);
    const r = (await push(lead, [collarEdit(base.rev, { heightCm: 12 })], randomUUID())).body.results[0];
    expect(r.status).toBe('merged');
    const now = await currentCollar();
    expect([now.notes, now.heightCm]).toEqual(['server side', 12]);
  });

  it('when a stale base touches a field the server changed too, then conflict and the server row is untouched', async () => {
    const base = await currentCollar();
    await push(lead, [collarEdit(base.rev, { notes: 'theirs' })]);
    const before = await currentCollar();
    const r = (await push(lead, [collarEdit(base.rev, { notes: 'mine', heightCm: 14 })], randomUUID())).body.results[0];
    expect(r.status).toBe('conflict');
    expect(r.conflict.fields).toEqual(['notes']);
    expect(r.conflict.server.notes).toBe('theirs');
    expect(await currentCollar()).toEqual(before);
  });

  it('when a create reuses an existing id, then identical content is duplicate and different content a conflict', async () => {
    const id = randomUUID();
    const fields = { siteId: world.site.id, code: `SYNC-${id.slice(0, 6)}`, plotId: world.plot.id, diameterCm: 20 };
    expect(
      (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: null, op: 'upsert', fields }])).body.results[0].status,
    ).toBe('applied');
    const same = (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: null, op: 'upsert', fields }])).body.results[0];
    expect(same.status).toBe('duplicate');
    expect(same.originalStatus).toBeUndefined();
    const other = (
      await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: null, op: 'upsert', fields: { ...fields, diameterCm: 25 } }])
    ).body.results[0];
    expect(other.status).toBe('conflict');
  });

  it('when a delete meets an edit, then a stale delete conflicts, an edit of a tombstone conflicts, a repeated delete is applied', async () => {
    const id = randomUUID();
    const fields = { siteId: world.site.id, code: `DEL-${id.slice(0, 6)}`, plotId: world.plot.id, diameterCm: 20 };
    await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: null, op: 'upsert', fields }]);
    await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: 1, op: 'upsert', fields: { notes: 'edited' } }]);
    const staleDelete = (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: 1, op: 'delete', fields: {} }])).body
      .results[0];
    expect(staleDelete.status).toBe('conflict');
    const del = (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: 2, op: 'delete', fields: {} }])).body.results[0];
    expect(del.status).toBe('applied');
    const editTomb = (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: 3, op: 'upsert', fields: { notes: 'x' } }]))
      .body.results[0];
    expect(editTomb.status).toBe('conflict');
    const again = (await push(lead, [{ opId: randomUUID(), entity: 'collar', id, baseRev: 3, op: 'delete', fields: {} }])).body.results[0];
    expect(again).toMatchObject({ status: 'applied', rev: 3 });
  });

  it('when one op of a batch is invalid, then it alone is rejected with a readable message', async () => {
    const base = await currentCollar();
    const bad = {
      opId: randomUUID(),
      entity: 'collar',
      id: randomUUID(),
      baseRev: null,
      op: 'upsert',
      fields: { siteId: world.site.id, code: 'NEG', plotId: world.plot.id, diameterCm: -3 },
    };
    const good = collarEdit(base.rev, { notes: 'batch mate' });
    const [rb, rg] = (await push(lead, [bad, good])).body.results;
    expect(rb.status).toBe('rejected');
    expect(rb.error.fields).toEqual([{ path: 'diameterCm', message: 'Collar diameter must be at least 5 cm' }]);
    expect(rg.status).toBe('applied');
  });

  it("when a crew member pushes to another site's collar, then it is rejected as a read would be, without the record", async () => {
    const crew = await signIn(t.app, demoEmail('crew'));
    const base = await currentCollar();
    const r = (await push(crew, [collarEdit(base.rev, { notes: 'not my site' })], randomUUID())).body.results[0];
    expect(r).toMatchObject({ status: 'rejected', error: { message: `No collar ${world.collar.id}` } });
    expect(r.record).toBeUndefined();
  });

  it('when a record changed several times within one page, then the page sends it once, at its latest change, in seq order', async () => {
    const dev = randomUUID();
    const [{ max }] = await t.ds.query(`SELECT coalesce(max(seq), 0)::int AS max FROM change_log`);
    const event = (id: string, baseRev: number | null, note: string) => ({
      opId: randomUUID(),
      entity: 'collarEvent',
      id,
      baseRev,
      op: 'upsert',
      fields: { siteId: world.site.id, collarId: world.collar.id, kind: 'clipped', date: '2026-06-01', note },
    });
    const [a, b] = [randomUUID(), randomUUID()];
    // a, then b, then a twice more: a's latest change comes after b's only one.
    for (const op of [event(a, null, 'a 1'), event(b, null, 'b 1'), event(a, 1, 'a 2'), event(a, 2, 'a 3')])
      expect((await push(lead, [op])).body.results[0].status).toBe('applied');
    const page = (await lead.get(`/api/sync/pull?cursor=${max}&limit=50&deviceId=${dev}`)).body;
    const ours = page.changes.filter((c: { id: string }) => c.id === a || c.id === b);
    expect(ours.map((c: { id: string; rev: number; record: { note: string } }) => [c.id, c.rev, c.record.note])).toEqual([
      [b, 1, 'b 1'],
      [a, 3, 'a 3'],
    ]);
    const seqs = page.changes.map((c: { seq: number }) => c.seq);
    expect(seqs).toEqual([...seqs].sort((x: number, y: number) => x - y));
    const [{ last }] = await t.ds.query(`SELECT max(seq)::int AS last FROM change_log WHERE record_id = $1`, [a]);
    expect(ours[1].seq).toBe(last);
  });

  it('when pulling in pages, then every page is ordered, the cursor advances and the last page says more=false', async () => {
    const dev = randomUUID();
    let cursor = 0,
      pages = 0,
      more = true;
    const seen = new Map<string, number>();
    while (more) {
      const r = await lead.get(`/api/sync/pull?cursor=${cursor}&limit=50&deviceId=${dev}`);
      expect(r.status).toBe(200);
      const seqs = r.body.changes.map((c: { seq: number }) => c.seq);
      expect(seqs).toEqual([...seqs].sort((a: number, b: number) => a - b));
      for (const c of r.body.changes) seen.set(`${c.entity}:${c.id}`, c.rev);
      expect(r.body.cursor).toBeGreaterThanOrEqual(cursor);
      cursor = r.body.cursor;
      more = r.body.more;
      pages++;
    }
    expect(pages).toBeGreaterThan(1);
    expect(seen.get(`collar:${world.collar.id}`)).toBe((await currentCollar()).rev);
  });

  it('when a user loses membership of a site, then the next pull removes its records with reason "access"', async () => {
    const crewSession = await signIn(t.app, demoEmail('crew'));
    const crewMe = (await crewSession.get('/api/auth/me')).body.user;
    await admin.patch(`/api/users/${CREW_ID}`, { siteIds: [...crewMe.siteIds, world.site.id] });
    const dev = randomUUID();
    let cursor = 0;
    for (let more = true; more;) {
      const r = await crewSession.get(`/api/sync/pull?cursor=${cursor}&limit=5000&deviceId=${dev}`);
      cursor = r.body.cursor;
      more = r.body.more;
    }
    await admin.patch(`/api/users/${CREW_ID}`, { siteIds: crewMe.siteIds });
    const after = await crewSession.get(`/api/sync/pull?cursor=${cursor}&limit=5000&deviceId=${dev}`);
    const removal = after.body.changes.find((c: { id: string }) => c.id === world.collar.id);
    expect(removal).toMatchObject({ deleted: true, record: null, reason: 'access' });
  });

  it('when the cursor is older than the tombstone horizon, then 410 asks for a full re-download', async () => {
    const [{ max }] = await t.ds.query(`SELECT max(seq)::int AS max FROM change_log`);
    await t.ds.query(`UPDATE sync_horizon SET min_seq = $1`, [max]);
    try {
      const r = await lead.get(`/api/sync/pull?cursor=1&limit=10&deviceId=${randomUUID()}`);
      expect(r.status).toBe(410);
      expect(r.body.reset).toBe(true);
      expect(r.body.error.message).toMatch(/download everything again/);
    } finally {
      await t.ds.query(`UPDATE sync_horizon SET min_seq = 0`);
    }
  });

  it('when a pushed edit changes the volume of a profile that closures use, then it is rejected: a new version is the way', async () => {
    const [p] = await t.ds.query(
      `SELECT p.id, p.rev FROM chamber_profile p WHERE EXISTS (SELECT 1 FROM closure c WHERE c.profile_id = p.id OR c.results->>'profileId' = p.id::text) LIMIT 1`,
    );
    const r = (
      await push(
        admin,
        [{ opId: randomUUID(), entity: 'chamberProfile', id: p.id, baseRev: Number(p.rev), op: 'upsert', fields: { loopVolumeCm3: 999 } }],
        randomUUID(),
      )
    ).body.results[0];
    expect(r.status).toBe('rejected');
    expect(r.error.message).toMatch(/add a new version/);
  });

  it('when a push body is over the limit, then 413 tells the device to split it', async () => {
    const big = Array.from({ length: 3 }, () => ({
      opId: randomUUID(),
      entity: 'collar',
      id: randomUUID(),
      baseRev: null,
      op: 'upsert',
      fields: { notes: 'x'.repeat(2 * 1024 * 1024) },
    }));
    const r = await push(lead, big);
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/smaller parts/);
  });
});
