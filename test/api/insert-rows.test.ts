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
    await t.ds
      .transaction(async (em) => {
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
        await em
          .getRepository(d.target)
          .createQueryBuilder()
          .insert()
          .values({ ...theirs, id: mine['id'] })
          .orIgnore()
          .execute();
        const built = await em.query(`SELECT * FROM ${d.table} WHERE id = $1`, [mine['id']]);
        expect(raw).toHaveLength(1);
        expect(raw[0]).toEqual(built[0]);
        expect(raw[0].updated_by).toBeNull();
        throw rollback;
      })
      .catch((err) => {
        if (err !== rollback) throw err;
      });
  });

  it('when rows of one call set different columns, then a missing one takes its default and of two equal codes the first is stored', async () => {
    const rollback = new Error('rollback');
    await t.ds
      .transaction(async (em) => {
        const base = { siteId: w.site.id, plotId: w.plot.id, rev: 1, deleted: false, updatedAt: new Date() };
        const rows = [
          { ...base, id: randomUUID(), code: `IR-${randomUUID()}`, notes: 'set' },
          { ...base, id: randomUUID(), code: `IR-${randomUUID()}` },
          { ...base, id: randomUUID(), code: 'IR-same', notes: 'first' },
          { ...base, id: randomUUID(), code: 'IR-same' },
        ];
        const stored = await insertRows(em, 'collar', rows);
        expect([...stored].sort()).toEqual([rows[0].id, rows[1].id, rows[2].id].sort());
        const got = await em.query(`SELECT id, notes, shape FROM collar WHERE id = ANY($1::uuid[])`, [rows.map((r) => r.id)]);
        const byId = new Map(got.map((r: { id: string }) => [r.id, r]));
        expect(byId.get(rows[0].id)).toMatchObject({ notes: 'set', shape: 'round' });
        expect(byId.get(rows[1].id)).toMatchObject({ notes: '', shape: 'round' });
        expect(byId.get(rows[2].id)).toMatchObject({ notes: 'first' });
        throw rollback;
      })
      .catch((err) => {
        if (err !== rollback) throw err;
      });
  });
});
