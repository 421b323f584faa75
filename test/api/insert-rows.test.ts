import { randomUUID } from 'node:crypto';
import { ENTITY_NAMES } from '../../shared/model/entities';
import { ENTITY_DEFS } from '../../server/records/entity-registry';
import { insertRows } from '../../server/records/insert-rows';
import { buildWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

/**
 * The push's batched creates are stored by a hand-built multi-row INSERT. For every entity, a row
 * stored that way must equal the same row stored by TypeORM's insert builder, column for column
 * (arrays, jsonb, dates, bigints, defaults for missing properties).
 */
describe('multi-row insert of prepared rows', () => {
  let t: TestApp;
  let w: World;
  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lab = await signIn(t.app, demoEmail('lab'));
    const made = await makeUser(admin, ['lead'], []);
    w = await buildWorld({ admin, lead: await signIn(t.app, made.email), lab }, made.id, `ir${randomUUID().slice(0, 6)}`);
  });
  afterAll(() => t.close());

  it.each(ENTITY_NAMES)('when a %s row is inserted, then it is stored as the insert builder stores it', async (entity) => {
    const d = ENTITY_DEFS[entity];
    const rollback = new Error('rollback');
    await t.ds.transaction(async (em) => {
      const source = (await em.getRepository(d.target).findOneByOrFail({ id: w[entity].id })) as Record<string, unknown>;
      // Unique values (codes, names) are made unique per copy; a missing property takes the column default.
      const copy = (tag: string) => {
        const row: Record<string, unknown> = { ...source, id: randomUUID() };
        for (const k of ['code', 'name', 'serial']) if (typeof row[k] === 'string') row[k] = `${row[k]}-${tag}`;
        delete row['updatedBy'];
        return row;
      };
      const [mine, theirs] = [copy('x'), copy('x')];
      expect([...(await insertRows(em, entity, [mine]))]).toEqual([mine['id']]);
      // The same id again is skipped, as ON CONFLICT DO NOTHING skips it.
      expect((await insertRows(em, entity, [mine])).size).toBe(0);
      const raw = await em.query(`SELECT * FROM ${d.table} WHERE id = $1`, [mine['id']]);
      await em.query(`DELETE FROM ${d.table} WHERE id = $1`, [mine['id']]);
      await em.getRepository(d.target).createQueryBuilder().insert().values({ ...theirs, id: mine['id'] }).orIgnore().execute();
      const built = await em.query(`SELECT * FROM ${d.table} WHERE id = $1`, [mine['id']]);
      expect(raw).toHaveLength(1);
      expect(raw[0]).toEqual(built[0]);
      expect(raw[0].updated_by).toBeNull();
      throw rollback;
    }).catch((err) => { if (err !== rollback) throw err; });
  });
});
