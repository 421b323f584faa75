import 'reflect-metadata';
import { Client } from 'pg';
import type { EntityName } from '../../shared/model/entities';
import { CURRENT_CAMPAIGN_ID } from './demo-current';
import { ENTITY_DEFS } from '../records/entity-registry';
import { buildDemoScenario } from './demo-scenario';
import { DEMO_SITE_ID } from './demo-accounts';
import { demoUserId } from './demo-plan';
import { demoId } from './prng';
import { isolatedDatabase } from '../../test/support/isolated-database';

/**
 * The demo scenario as seeded into a database of its own (other test files change the shared
 * test database while this runs), checked with plain SQL on the ids the scenario made.
 */
describe('the seeded demo scenario', () => {
  let db: Client;
  const one = async <T = Record<string, unknown>>(sql: string, params: unknown[] = []): Promise<T> =>
    (await db.query(sql, params)).rows[0] as T;
  const count = async (sql: string, params: unknown[] = []) => Number((await one<{ n: string }>(sql, params)).n);

  const ids: Partial<Record<EntityName, string[]>> = {};
  const of = (e: EntityName) => ids[e] ?? [];

  beforeAll(async () => {
    for (const w of buildDemoScenario()) if (w.kind === 'create') (ids[w.entity] ??= []).push(w.id);
    db = new Client({ connectionString: await isolatedDatabase('seedcheck') });
    await db.connect();
  });
  afterAll(async () => db.end());

  it('when the layout is read, then it has 3 plot and 2 collar treatments, 4 blocks, 12 plots and 48 round 20 cm collars', async () => {
    expect(
      await count(`SELECT count(*) n FROM treatment WHERE level = 'plot' AND site_id = $1 AND id = ANY($2)`, [
        DEMO_SITE_ID,
        of('treatment'),
      ]),
    ).toBe(3);
    expect(
      await count(`SELECT count(*) n FROM treatment WHERE level = 'collar' AND site_id = $1 AND id = ANY($2)`, [
        DEMO_SITE_ID,
        of('treatment'),
      ]),
    ).toBe(2);
    expect(await count(`SELECT count(*) n FROM block WHERE id = ANY($1)`, [of('block')])).toBe(4);
    expect(await count(`SELECT count(*) n FROM plot WHERE outline->>'type' = 'Polygon' AND id = ANY($1)`, [of('plot')])).toBe(12);
    expect(await count(`SELECT count(*) n FROM collar WHERE shape = 'round' AND diameter_cm = 20 AND id = ANY($1)`, [of('collar')])).toBe(
      48,
    );
    // A = π·20²/4 = 314.159… cm², derived by the server.
    expect(Number((await one<{ a: number }>(`SELECT min(area_cm2) a FROM collar WHERE id = ANY($1)`, [of('collar')])).a)).toBeCloseTo(
      314.159,
      2,
    );
    expect(await count(`SELECT count(*) n FROM collar WHERE code ~ '^B[1-4]-P[0-9]{2}-C[1-4]$' AND id = ANY($1)`, [of('collar')])).toBe(48);
    expect(await count(`SELECT count(*) n FROM collar_event WHERE kind = 'installed' AND id = ANY($1)`, [of('collarEvent')])).toBe(48);
  });

  it('when collar treatments are read, then every control plot has 2 trenched and 2 untrenched collars', async () => {
    const rows = (
      await db.query(
        `
      SELECT p.code, count(*) FILTER (WHERE ct.code = 'TRN') trn, count(*) FILTER (WHERE ct.code = 'UTR') utr
        FROM collar c JOIN plot p ON p.id = c.plot_id JOIN treatment pt ON pt.id = p.treatment_id
        LEFT JOIN treatment ct ON ct.id = c.treatment_id
       WHERE pt.code = 'CTL' AND c.id = ANY($1) GROUP BY p.code`,
        [of('collar')],
      )
    ).rows;
    expect(rows).toHaveLength(4);
    for (const r of rows) expect([Number(r.trn), Number(r.utr)]).toEqual([2, 2]);
  });

  it('when routes are read, then two routes of 24 collars cover all 48 collars once', async () => {
    const rows = (await db.query(`SELECT cardinality(collar_ids) n FROM route WHERE id = ANY($1) ORDER BY name`, [of('route')])).rows;
    expect(rows.map((r) => Number(r.n))).toEqual([24, 24]);
    expect(await count(`SELECT count(DISTINCT x) n FROM route, unnest(collar_ids) x WHERE id = ANY($1)`, [of('route')])).toBe(48);
  });

  it('when profiles are read, then a second version starts mid-season with a larger loop', async () => {
    const rows = (
      await db.query(
        `SELECT to_char(valid_from,'YYYY-MM-DD') v, loop_volume_cm3 l FROM chamber_profile
      WHERE id = ANY($1) ORDER BY valid_from`,
        [of('chamberProfile')],
      )
    ).rows;
    expect(rows).toEqual([
      { v: '2026-03-01', l: 150 },
      { v: '2026-07-01', l: 185 },
    ]);
  });

  it('when the past season is read, then seven locked campaigns hold 48 visits each with readings and fluxes', async () => {
    const locked = (await db.query(`SELECT id FROM campaign WHERE locked AND id = ANY($1)`, [of('campaign')])).rows.map((r) => r.id);
    expect(locked).toHaveLength(7);
    expect(await count(`SELECT count(*) n FROM visit WHERE campaign_id = ANY($1) AND id = ANY($2)`, [locked, of('visit')])).toBe(7 * 48);
    // One visit of the season was skipped: no offset set, probe reading or closure there.
    expect(await count(`SELECT count(*) n FROM offset_set WHERE campaign_id = ANY($1) AND id = ANY($2)`, [locked, of('offsetSet')])).toBe(
      7 * 48 - 1,
    );
    expect(
      await count(
        `SELECT count(DISTINCT visit_id) n FROM probe_reading WHERE campaign_id = ANY($1) AND vwc_pct BETWEEN 5 AND 50 AND id = ANY($2)`,
        [locked, of('probeReading')],
      ),
    ).toBe(7 * 48 - 1);
    const flux = await one<{ n: string; lo: number; hi: number; nulls: string }>(
      `
      SELECT count(*) n, min(flux_umol_m2_s) FILTER (WHERE cardinality(flags) = 0) lo,
             max(flux_umol_m2_s) FILTER (WHERE cardinality(flags) = 0) hi, count(*) FILTER (WHERE flux_umol_m2_s IS NULL) nulls
        FROM closure WHERE campaign_id = ANY($1) AND id = ANY($2)`,
      [locked, of('closure')],
    );
    expect(Number(flux.n)).toBeGreaterThan(7 * 48 - 1);
    expect(Number(flux.nulls)).toBe(0);
    // Clean closures span the invented season's 0.5–8 µmol m⁻² s⁻¹.
    expect(flux.lo).toBeGreaterThan(0.3);
    expect(flux.lo).toBeLessThan(1.5);
    expect(flux.hi).toBeGreaterThan(4);
    expect(flux.hi).toBeLessThan(9.5);
  });

  it('when probe readings are read, then every visit has two or three replicates with a spread, and a few read a temperature off the probe depth', async () => {
    const perVisit = (
      await db.query(
        `SELECT visit_id, count(*)::int n, stddev_samp(vwc_pct) sd,
                count(*) FILTER (WHERE (soil_temps->0->>'depthCm')::numeric <> 5)::int off
           FROM probe_reading WHERE id = ANY($1) AND NOT deleted GROUP BY visit_id`,
        [of('probeReading')],
      )
    ).rows as { visit_id: string; n: number; sd: number; off: number }[];
    expect(perVisit.length).toBeGreaterThan(7 * 48 - 1);
    expect(perVisit.filter((v) => v.n < 2 || v.n > 3)).toEqual([]);
    expect(perVisit.some((v) => v.n === 3)).toBe(true);
    // Replicates differ by an invented spot-to-spot spread of about 1.5 % VWC (a few pairs may round alike).
    const meanSd = perVisit.reduce((a, v) => a + Number(v.sd), 0) / perVisit.length;
    expect(meanSd).toBeGreaterThan(0.7);
    expect(meanSd).toBeLessThan(3);
    const off = perVisit.filter((v) => v.off > 0);
    expect(off.length).toBeGreaterThan(0);
    expect(off.length).toBeLessThan(perVisit.length / 4);
    expect(off.filter((v) => v.off > 1)).toEqual([]);
  });

  it('when closures are reviewed, then some are accepted, some rejected with a reason, and most are unreviewed', async () => {
    const r = await one<{ acc: string; rej: string; un: string; noreason: string }>(
      `
      SELECT count(*) FILTER (WHERE review_state = 'accepted') acc, count(*) FILTER (WHERE review_state = 'rejected') rej,
             count(*) FILTER (WHERE review_state = 'unreviewed') un,
             count(*) FILTER (WHERE review_state = 'rejected' AND coalesce(review_reason, '') = '') noreason
        FROM closure WHERE id = ANY($1)`,
      [of('closure')],
    );
    expect(Number(r.acc)).toBeGreaterThan(30);
    expect(Number(r.rej)).toBeGreaterThanOrEqual(4);
    expect(Number(r.noreason)).toBe(0);
    expect(Number(r.un)).toBeGreaterThan(Number(r.acc) + Number(r.rej));
  });

  it('when QC flags are counted, then the odd closures raise spike, negative-flux, start-above-ambient, exp-linear-ratio-high and flat', async () => {
    const absent: string[] = [];
    for (const flag of ['spike', 'negative-flux', 'start-above-ambient', 'exp-linear-ratio-high', 'flat']) {
      if ((await count(`SELECT count(*) n FROM closure WHERE $1 = ANY(flags) AND id = ANY($2)`, [flag, of('closure')])) === 0)
        absent.push(flag);
    }
    expect(absent).toEqual([]);
    expect(await count(`SELECT count(*) n FROM closure WHERE redo_of_id IS NOT NULL AND id = ANY($1)`, [of('closure')])).toBe(5);
  });

  it('when the current campaign is read, then it is open, has 2 rounds for both routes and 7 visits with one skip and one partial', async () => {
    const c = await one<{ locked: boolean; rounds: number; routes: { crewIds: string[] }[] }>(
      `SELECT locked, rounds, routes FROM campaign WHERE id = $1`,
      [CURRENT_CAMPAIGN_ID],
    );
    expect(c.locked).toBe(false);
    expect(c.rounds).toBe(2);
    expect(c.routes.map((r) => r.crewIds)).toEqual([[demoUserId('crew')], [demoUserId('crew')]]);
    const v = await one<{ n: string; skipped: string; closures: string; offsets: string }>(
      `
      SELECT count(*) n, count(*) FILTER (WHERE skipped) skipped,
             (SELECT count(*) FROM closure WHERE campaign_id = $1 AND id = ANY($3)) closures,
             (SELECT count(*) FROM offset_set WHERE campaign_id = $1 AND id = ANY($4)) offsets
        FROM visit WHERE campaign_id = $1 AND id = ANY($2)`,
      [CURRENT_CAMPAIGN_ID, of('visit'), of('closure'), of('offsetSet')],
    );
    expect([Number(v.n), Number(v.skipped), Number(v.closures), Number(v.offsets)]).toEqual([7, 1, 5, 6]);
  });

  it('when temperature logs are read, then each of the 12 plots has an hourly 5 cm series for April–October', async () => {
    const rows = (
      await db.query(
        `SELECT depth_cm d, jsonb_array_length(series->'t') n, series->'t'->>0 first FROM temperature_log
      WHERE id = ANY($1)`,
        [of('temperatureLog')],
      )
    ).rows;
    expect(rows).toHaveLength(12);
    // 1 April–31 October: 214 days × 24 h.
    for (const r of rows) expect([r.d, r.n, r.first]).toEqual([5, 214 * 24, '2026-04-01T00:00:00.000Z']);
  });

  it('when the change log is read, then every seeded record has its creation, written by the person who made it', async () => {
    for (const [entity, list] of Object.entries(ids)) {
      const logged = await count(
        `SELECT count(DISTINCT record_id) n FROM change_log WHERE entity = $1 AND rev = 1 AND record_id = ANY($2)`,
        [entity, list],
      );
      expect([entity, logged]).toEqual([entity, list!.length]);
    }
    const by = async (sql: string, p: unknown[]) => (await one<{ updated_by: string }>(sql, p)).updated_by;
    expect(await by(`SELECT updated_by FROM visit WHERE id = $1`, [of('visit')[0]])).toBe(demoUserId('crew'));
    expect(await by(`SELECT updated_by FROM plot WHERE id = $1`, [of('plot')[0]])).toBe(demoUserId('admin'));
    expect(await by(`SELECT updated_by FROM campaign WHERE id = $1`, [of('campaign')[0]])).toBe(demoUserId('lead'));
    expect(await by(`SELECT updated_by FROM closure WHERE review_state = 'accepted' AND id = ANY($1) LIMIT 1`, [of('closure')])).toBe(
      demoUserId('lab'),
    );
    expect((await one<{ id: string }>(`SELECT id FROM collar WHERE code = 'B1-P03-C2' AND site_id = $1`, [DEMO_SITE_ID])).id).toBe(
      demoId('collar:B1-P03-C2'),
    );
  });

  it('when every entity is counted, then the scenario filled each one', async () => {
    const empty = Object.keys(ENTITY_DEFS).filter((e) => e !== 'site' && !of(e as EntityName).length);
    expect(empty).toEqual([]);
    for (const [entity, list] of Object.entries(ids)) {
      const stored = await count(`SELECT count(*) n FROM ${ENTITY_DEFS[entity as EntityName].table} WHERE id = ANY($1)`, [list]);
      expect([entity, stored]).toEqual([entity, list!.length]);
    }
  });
});
