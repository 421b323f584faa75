import { randomUUID } from 'node:crypto';
import { SYNC_ENTITIES, type EntityName } from '../../shared/model/entities';
import type { SessionUser } from '../../shared/auth/roles';
import { ENTITY_DEFS } from '../../server/records/entity-registry';
import { toWire } from '../../server/records/wire';
import { wireRecords } from '../../server/sync/pull-records';
import { pullChanges } from '../../server/sync/sync-pull';
import { buildWorld, deleteWorld, makeUser } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

/**
 * Pull pages are built from raw rows, not hydrated TypeORM entities. The reference here is the
 * hydrated path (entity → toWire): for every synced entity, over the demo scenario plus a site with
 * one live and one deleted record of every kind, both must serialise to the same bytes.
 */
describe('pull records from raw rows', () => {
  let t: TestApp;
  let lead: SessionUser;
  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lab = await signIn(t.app, demoEmail('lab'));
    const made = await makeUser(admin, ['lead'], []);
    const leadSession = await signIn(t.app, made.email);
    const by = { admin, lead: leadSession, lab };
    await buildWorld(by, made.id, `rw${randomUUID().slice(0, 6)}`);
    await deleteWorld(by, await buildWorld(by, made.id, `rd${randomUUID().slice(0, 6)}`));
    // A record with odd values: an empty note, a negative and a tiny number, unicode text.
    const w = await buildWorld(by, made.id, `ro${randomUUID().slice(0, 6)}`);
    const res = await leadSession.patch(`/api/collars/${w.collar.id}`, {
      rev: w.collar.rev,
      notes: 'Größe ≈ 20 cm "quoted" \\ back\nline',
      latitude: -0.000001234,
      longitude: 1e-7,
    });
    expect([res.status, res.body.error]).toEqual([200, undefined]);
    // Times PostgreSQL holds to the microsecond (a default of now(), a script's write) and given in another zone.
    await t.ds.query(
      `UPDATE visit SET arrived_at = '2026-06-01 08:00:00.999999+02', updated_at = '2026-06-01 23:59:59.0005+00' WHERE id = $1`,
      [w.visit.id],
    );
    lead = (await leadSession.get('/api/auth/me')).body.user;
  });
  afterAll(() => t.close());

  const hydrated = async (entity: EntityName, ids: string[]) =>
    (await t.ds.getRepository(ENTITY_DEFS[entity].target).createQueryBuilder('r').where('r.id = ANY(:ids)', { ids }).getMany()).map(toWire);

  it.each(SYNC_ENTITIES)(
    "when %s records are read for a pull page, then their JSON is byte for byte the hydrated entities' JSON",
    async (entity) => {
      const ids = ((await t.ds.query(`SELECT id FROM ${ENTITY_DEFS[entity].table}`)) as { id: string }[]).map((r) => r.id);
      expect(ids.length).toBeGreaterThan(1);
      const byId = (recs: Record<string, unknown>[]) => new Map(recs.map((r) => [r['id'] as string, JSON.stringify(r)]));
      const before = byId(await hydrated(entity, ids));
      const after = byId(await wireRecords(t.ds, entity, ids));
      expect(after.size).toBe(ids.length);
      for (const id of ids) expect(after.get(id)).toBe(before.get(id));
    },
  );

  it("when a whole download is pulled, then every record in it is the hydrated entity's wire form", async () => {
    let cursor = 0;
    const seen = new Map<EntityName, Map<string, string>>();
    for (let page = 0; page < 100; page++) {
      const a = await pullChanges(t.ds, lead, randomUUID(), cursor, 7);
      for (const c of a.changes) {
        if (!c.record) continue;
        const entity = c.entity as EntityName; // the wire names an entity as text
        const m = seen.get(entity) ?? new Map<string, string>();
        seen.set(entity, m.set(c.id, JSON.stringify(c.record)));
      }
      cursor = a.cursor;
      if (!a.more) break;
    }
    expect(seen.size).toBeGreaterThanOrEqual(10);
    for (const [entity, recs] of seen) {
      const ref = new Map((await hydrated(entity, [...recs.keys()])).map((r) => [r['id'] as string, JSON.stringify(r)]));
      for (const [id, json] of recs) expect(json).toBe(ref.get(id));
    }
  });

  it('when ids are missing, then they are left out and an empty list reads nothing', async () => {
    expect(await wireRecords(t.ds, 'collar', [randomUUID()])).toEqual([]);
    expect(await wireRecords(t.ds, 'collar', [])).toEqual([]);
  });
});
