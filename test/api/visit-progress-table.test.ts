import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const COLUMNS = 'visit_id, campaign_id, collar_id, round, skipped, skip_reason, arrived_at, offsets, probes, closures';

/** visit_progress is kept by triggers in the writing transaction (server/migrations/20261204232500-visit-progress.ts). */
describe('visit_progress table', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when the demo season was written through the record writer, then the kept rows equal a recount from scratch', async () => {
    const kept = await t.ds.query(`SELECT ${COLUMNS} FROM visit_progress ORDER BY visit_id`);
    expect(kept.length).toBeGreaterThan(0);
    const runner = t.ds.createQueryRunner();
    await runner.connect();
    await runner.startTransaction();
    try {
      await runner.query(`DELETE FROM visit_progress`);
      await runner.query(`SELECT visit_progress_recount(ARRAY(SELECT id FROM visit))`);
      expect(await runner.query(`SELECT ${COLUMNS} FROM visit_progress ORDER BY visit_id`)).toEqual(kept);
    } finally {
      await runner.rollbackTransaction();
      await runner.release();
    }
  });

  it('when a closure moves to another visit or a visit is deleted, then both visits are recounted in the same statement', async () => {
    const runner = t.ds.createQueryRunner();
    await runner.connect();
    await runner.startTransaction();
    try {
      // Other test files add single-visit campaigns to this database, so the pick must insist on a second visit
      // (and be ordered, so a failure repeats).
      const [c] = await runner.query(`SELECT c.id, c.visit_id, o.id AS other
                                        FROM closure c JOIN visit v ON v.id = c.visit_id
                                        JOIN LATERAL (SELECT v2.id FROM visit v2 WHERE v2.campaign_id = v.campaign_id AND v2.id <> v.id
                                                         AND NOT v2.deleted ORDER BY v2.id LIMIT 1) o ON true
                                       WHERE NOT c.deleted AND c.review_state <> 'rejected' AND jsonb_array_length(c.series->'tS') > 0
                                       ORDER BY c.id LIMIT 1`);
      expect(c).toBeDefined();
      const before = await runner.query(`SELECT visit_id, closures FROM visit_progress WHERE visit_id = ANY($1) ORDER BY visit_id`, [
        [c.visit_id, c.other],
      ]);
      await runner.query(`UPDATE closure SET visit_id = $2 WHERE id = $1`, [c.id, c.other]);
      await runner.query(`UPDATE visit SET deleted = true WHERE id = $1`, [c.visit_id]);
      const after = await runner.query(`SELECT visit_id, closures FROM visit_progress WHERE visit_id = ANY($1)`, [[c.visit_id, c.other]]);
      expect(after).toEqual([
        { visit_id: c.other, closures: before.find((r: { visit_id: string }) => r.visit_id === c.other).closures + 1 },
      ]);
      const kept = await runner.query(`SELECT ${COLUMNS} FROM visit_progress ORDER BY visit_id`);
      await runner.query(`DELETE FROM visit_progress`);
      await runner.query(`SELECT visit_progress_recount(ARRAY(SELECT id FROM visit))`);
      expect(await runner.query(`SELECT ${COLUMNS} FROM visit_progress ORDER BY visit_id`)).toEqual(kept);
    } finally {
      await runner.rollbackTransaction();
      await runner.release();
    }
  });

  it('when two transactions add closures at one visit at once, then both count', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const lead = await signIn(t.app, demoEmail('lead'));
    const w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    const visit = (
      await lead.post('/api/visits', {
        siteId: w.site.id,
        campaignId: w.campaign.id,
        round: 1,
        collarId: w.collar.id,
        arrivedAt: '2026-06-01T08:00:00Z',
      })
    ).body.record;
    const tS = Array.from({ length: 30 }, (_, i) => i);
    const first = await lead.post('/api/closures', {
      siteId: w.site.id,
      visitId: visit.id,
      collarId: w.collar.id,
      campaignId: w.campaign.id,
      startedAt: '2026-06-01T08:02:00Z',
      settleS: 5,
      series: { tS, co2Ppm: tS.map((s) => 420 + s) },
    });
    expect(first.status).toBe(201);
    const copy = `INSERT INTO closure SELECT (jsonb_populate_record(NULL::closure, to_jsonb(c) || jsonb_build_object('id', gen_random_uuid()))).*
                    FROM closure c WHERE c.id = $1`;
    const [a, b] = [t.ds.createQueryRunner(), t.ds.createQueryRunner()];
    await a.connect();
    await b.connect();
    try {
      await a.startTransaction();
      await b.startTransaction();
      await a.query(copy, [first.body.record.id]);
      const second = b.query(copy, [first.body.record.id]); // waits for a's lock on the visit's row
      await new Promise((r) => setTimeout(r, 300));
      await a.commitTransaction();
      await second;
      await b.commitTransaction();
    } finally {
      await a.release();
      await b.release();
    }
    const [row] = await t.ds.query(`SELECT closures FROM visit_progress WHERE visit_id = $1`, [visit.id]);
    expect(row.closures).toBe(3);
  });
});
