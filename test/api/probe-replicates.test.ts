import { randomUUID } from 'node:crypto';
import { ProbeReplicates1796426460000 } from '../../server/migrations/1796426460000-probe-replicates';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * A visit keeps every probe insertion (replicate) as its own probe reading: saving another never
 * overwrites one, each says when, at which depth and by whom it was taken, a wrong one is deleted
 * as a tombstone, and all of it travels through push and pull like any record.
 */
describe('probe replicates through sync', () => {
  let t: TestApp;
  let admin: Session, lab: Session, lead: Session, crew: Session, outsider: Session;
  let home: World, other: World;
  let crewId: string, outsiderId: string;

  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const hl = await makeUser(admin, ['lead'], []);
    const ol = await makeUser(admin, ['lead'], []);
    lead = await signIn(t.app, hl.email);
    home = await buildWorld({ admin, lead, lab }, hl.id, `pr${randomUUID().slice(0, 6)}`);
    other = await buildWorld({ admin, lead: await signIn(t.app, ol.email), lab }, ol.id, `po${randomUUID().slice(0, 6)}`);
    const c = await makeUser(admin, ['crew'], [home.site.id]);
    crewId = c.id;
    crew = await signIn(t.app, c.email);
    const o = await makeUser(admin, ['crew'], [other.site.id]);
    outsiderId = o.id;
    outsider = await signIn(t.app, o.email);
  });
  afterAll(() => t.close());

  const push = (s: Session, ops: unknown[], deviceId = randomUUID()) => s.post('/api/sync/push', { deviceId, outboxSize: ops.length, ops });
  const replicate = (over: Record<string, unknown> = {}) => ({
    siteId: home.site.id,
    visitId: home.visit.id,
    collarId: home.collar.id,
    campaignId: home.campaign.id,
    takenAt: '2026-06-01T08:10:00Z',
    takenById: crewId,
    soilTemps: [{ depthCm: 5, tempC: 11.5 }],
    moistureRaw: 23.4,
    moistureKind: 'vwc',
    rodLengthCm: 12,
    probeId: 'TDR-7',
    ...over,
  });
  const create = (fields: Record<string, unknown>, id = randomUUID()) => ({
    opId: randomUUID(),
    entity: 'probeReading',
    id,
    baseRev: null,
    op: 'upsert',
    fields,
  });
  const rows = async (visitId = home.visit.id) =>
    (await t.ds.query(
      `SELECT id, deleted, taken_by_id, moisture_raw, soil_temps FROM probe_reading WHERE visit_id = $1 ORDER BY taken_at, id`,
      [visitId],
    )) as { id: string; deleted: boolean; taken_by_id: string | null; moisture_raw: number | null; soil_temps: unknown }[];
  const maxSeq = async () => (await t.ds.query(`SELECT coalesce(max(seq), 0)::int AS n FROM change_log`))[0].n as number;
  async function pullFrom(s: Session, cursor: number) {
    const out: { entity: string; id: string; deleted: boolean; record: Record<string, unknown> | null }[] = [];
    const dev = randomUUID();
    for (let more = true; more;) {
      const r = await s.get(`/api/sync/pull?cursor=${cursor}&limit=5000&deviceId=${dev}`);
      expect(r.status).toBe(200);
      out.push(...r.body.changes);
      cursor = r.body.cursor;
      more = r.body.more;
    }
    return out;
  }

  it('when a crew pushes three replicates of one visit, then all three are stored and pulled back with time, depth and who took them; a replay changes nothing', async () => {
    const cursor = await maxSeq();
    const before = (await rows()).length;
    const ops = [
      create(replicate({ takenAt: '2026-06-01T08:10:00Z', moistureRaw: 23.4 })),
      create(replicate({ takenAt: '2026-06-01T08:10:30Z', moistureRaw: 25.1, soilTemps: [{ depthCm: 5, tempC: 11.7 }] })),
      create(replicate({ takenAt: '2026-06-01T08:11:00Z', moistureRaw: 24.0, soilTemps: [{ depthCm: 10, tempC: 10.2 }] })),
    ];
    const first = await push(crew, ops);
    expect(first.body.results.map((r: { status: string }) => r.status)).toEqual(['applied', 'applied', 'applied']);
    const logAfterFirst = await maxSeq();
    const again = await push(crew, ops);
    expect(again.body.results.map((r: { status: string }) => r.status)).toEqual(['duplicate', 'duplicate', 'duplicate']);
    expect(await maxSeq()).toBe(logAfterFirst);
    const stored = await rows();
    expect(stored.length).toBe(before + 3);
    const mine = stored.filter((r) => ops.some((o) => o.id === r.id));
    expect(mine.map((r) => [r.moisture_raw, r.taken_by_id])).toEqual([
      [23.4, crewId],
      [25.1, crewId],
      [24.0, crewId],
    ]);

    // The lead's device pulls them: three separate records, each with its own time, depth and taker.
    const pulled = (await pullFrom(lead, cursor)).filter((c) => c.entity === 'probeReading' && ops.some((o) => o.id === c.id));
    expect(
      pulled.map((c) => [
        c.record?.['takenAt'],
        (c.record?.['soilTemps'] as { depthCm: number }[])[0].depthCm,
        c.record?.['takenById'],
        c.record?.['vwcPct'],
      ]),
    ).toEqual([
      ['2026-06-01T08:10:00.000Z', 5, crewId, 23.4],
      ['2026-06-01T08:10:30.000Z', 5, crewId, 25.1],
      ['2026-06-01T08:11:00.000Z', 10, crewId, 24],
    ]);
  });

  it('when another replicate is saved, then the earlier one keeps its values and revision', async () => {
    const firstId = randomUUID();
    expect((await push(crew, [create(replicate({ moistureRaw: 30.5 }), firstId)])).body.results[0].status).toBe('applied');
    const before = (await crew.get(`/api/probe-readings/${firstId}`)).body.record;
    expect((await push(crew, [create(replicate({ moistureRaw: 31.5 }))])).body.results[0].status).toBe('applied');
    expect((await crew.get(`/api/probe-readings/${firstId}`)).body.record).toEqual(before);
  });

  it('when a crew deletes a replicate, then it becomes a tombstone that pulls as deleted, the others stay, and a replayed delete changes nothing', async () => {
    const keep = randomUUID(),
      drop = randomUUID();
    await push(crew, [create(replicate({ moistureRaw: 19 }), keep), create(replicate({ moistureRaw: 99 }), drop)]);
    const cursor = await maxSeq();
    const del = { opId: randomUUID(), entity: 'probeReading', id: drop, baseRev: 1, op: 'delete', fields: {} };
    expect((await push(crew, [del])).body.results[0].status).toBe('applied');
    const seqAfter = await maxSeq();
    expect((await push(crew, [del])).body.results[0]).toMatchObject({ status: 'duplicate', originalStatus: 'applied' });
    expect(await maxSeq()).toBe(seqAfter);
    const stored = new Map((await rows()).map((r) => [r.id, r.deleted]));
    expect([stored.get(keep), stored.get(drop)]).toEqual([false, true]);
    const pulled = (await pullFrom(lead, cursor)).filter((c) => c.id === drop || c.id === keep);
    expect(pulled.map((c) => [c.id, c.deleted])).toEqual([[drop, true]]);
  });

  it('when the lab, an admin or a crew of another site writes a replicate, then refused and nothing is stored', async () => {
    const before = await rows();
    for (const s of [lab, admin]) {
      const r = await push(s, [create(replicate({ takenById: null }))]);
      expect(r.body.results[0].status).toBe('rejected');
      expect((await s.post('/api/probe-readings', replicate({ takenById: null }))).status).toBe(403);
    }
    const foreign = await push(outsider, [create(replicate({ takenById: outsiderId }))]);
    expect(foreign.body.results[0].status).toBe('rejected');
    // Deleting another site's replicate answers as if it did not exist.
    const theirs = await push(outsider, [
      { opId: randomUUID(), entity: 'probeReading', id: home.probeReading.id, baseRev: home.probeReading.rev, op: 'delete', fields: {} },
    ]);
    expect(theirs.body.results[0]).toMatchObject({ status: 'rejected', error: { message: `No probeReading ${home.probeReading.id}` } });
    expect((await lab.delete(`/api/probe-readings/${home.probeReading.id}`)).status).toBe(403);
    expect(await rows()).toEqual(before);
  });

  it('when the taker is not a member of the site, then refused with a takenById message', async () => {
    const r = await crew.post('/api/probe-readings', replicate({ takenById: outsiderId }));
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toEqual([{ path: 'takenById', message: expect.any(String) }]);
  });

  it('when moisture is out of range, in wrong units or text, then a clear message and the stored replicates are unchanged', async () => {
    const before = await rows();
    const cases: [Record<string, unknown>, string][] = [
      [{ moistureRaw: 150 }, 'VWC must be between 0 and 100 %'],
      [{ moistureRaw: 0.5, moistureKind: 'permittivity' }, 'Permittivity Ka must be between 1 and 90'],
      [{ moistureKind: 'percent' }, ''],
      [{ moistureRaw: 'twenty' }, ''],
      [{ soilTemps: [{ depthCm: 5, tempC: 'warm' }] }, ''],
    ];
    for (const [over, message] of cases) {
      const r = await crew.post('/api/probe-readings', replicate(over));
      expect(r.status).toBe(400);
      expect(r.body.error.fields.length).toBeGreaterThan(0);
      if (message) expect(r.body.error.fields.map((f: { message: string }) => f.message)).toContain(message);
      const synced = await push(crew, [create(replicate(over))]);
      expect(synced.body.results[0].status).toBe('rejected');
    }
    expect(await rows()).toEqual(before);
  });
});

describe('the replicate migration', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it("when a single reading stored before the migration is migrated, then it stays as the visit's one replicate, taken by the visit's crew", async () => {
    const q = t.ds.createQueryRunner();
    await q.connect();
    await q.startTransaction();
    try {
      const [visit] = await q.query(
        `SELECT v.id, v.crew_id FROM visit v JOIN probe_reading p ON p.visit_id = v.id WHERE v.crew_id IS NOT NULL LIMIT 1`,
      );
      expect(visit).toBeDefined();
      const migration = new ProbeReplicates1796426460000();
      await migration.down(q);
      const [{ n: before }] = await q.query(`SELECT count(*)::int AS n FROM probe_reading WHERE visit_id = $1`, [visit.id]);
      const [legacy] = await q.query(`SELECT id, moisture_raw, soil_temps FROM probe_reading WHERE visit_id = $1 LIMIT 1`, [visit.id]);
      await migration.up(q);
      const after = await q.query(`SELECT id, moisture_raw, soil_temps, taken_by_id FROM probe_reading WHERE visit_id = $1`, [visit.id]);
      expect(after.length).toBe(before);
      expect(legacy).toBeDefined();
      expect(after.find((r: { id: string }) => r.id === legacy.id)).toEqual({ ...legacy, taken_by_id: visit.crew_id });
    } finally {
      await q.rollbackTransaction();
      await q.release();
    }
  });
});
