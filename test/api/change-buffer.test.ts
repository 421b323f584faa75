import { randomUUID } from 'node:crypto';
import { ChangeBuffer, type ChangeEntry } from '../../server/records/change-buffer';
import { startTestApp, type TestApp } from '../support/test-app';

/**
 * The change log's rows are sent inside the commit's statement text: whatever the rows hold
 * (quotes, backslashes, dollar signs, the quoting's own tag), they are stored exactly, in order.
 */
describe('change log written at commit', () => {
  let t: TestApp;
  beforeAll(async () => (t = await startTestApp()));
  afterAll(() => t.close());

  it('when entries hold quotes, backslashes and dollar tags, then the change log stores them as given, in order', async () => {
    const [site] = await t.ds.query(`SELECT id FROM site LIMIT 1`);
    const awkward = [`it's`, `back\\slash`, `$fw$`, `ends $fw`, `$fw0$ and $$`, `"json" {}`, `Ünïcødé 土壌`];
    const entries: ChangeEntry[] = awkward.map((text, i) => ({
      entity: text,
      recordId: randomUUID(),
      rev: i + 1,
      siteId: site.id,
      fields: [text, `field${i}`],
      deleted: i % 2 === 0,
      userId: null,
      deviceId: null,
    }));
    const qr = t.ds.createQueryRunner();
    await qr.connect();
    try {
      await qr.startTransaction();
      const changes = new ChangeBuffer();
      entries.forEach((e) => changes.add(e));
      await changes.commit(qr);
      expect(qr.isTransactionActive).toBe(false);
    } finally {
      await qr.release();
    }
    const rows: { entity: string; record_id: string; rev: string; fields: string[]; deleted: boolean }[] = await t.ds.query(
      `SELECT entity, record_id, rev, fields, deleted FROM change_log WHERE record_id = ANY($1::uuid[]) ORDER BY seq`,
      [entries.map((e) => e.recordId)],
    );
    expect(rows.map((r) => [r.entity, r.record_id, Number(r.rev), r.fields, r.deleted])).toEqual(
      entries.map((e) => [e.entity, e.recordId, e.rev, e.fields, e.deleted]),
    );
    await t.ds.query(`DELETE FROM change_log WHERE record_id = ANY($1::uuid[])`, [entries.map((e) => e.recordId)]);
  });
});
