/**
 * Benchmark data for the campaign progress query: one site with many collars, past campaigns
 * walked in full, and one measured campaign of 2 rounds in a known mix of states.
 *
 * Written with set-based SQL straight into the tables, not through the record writer: 400 000
 * records one by one would take tens of minutes, and the progress query reads only these tables
 * (no change log, no derived flux). Ids are md5-derived, so two runs build identical data.
 */
import type { DataSource } from 'typeorm';

export interface BenchSize {
  collars: number;
  /** Campaigns in all; the last one is the measured campaign. */
  campaigns: number;
  collarsPerRoute: number;
}

export const DEFAULT_SIZE: BenchSize = { collars: 5000, campaigns: 20, collarsPerRoute: 250 };

export const BENCH_SITE_ID = '5b0e9c41-7a2d-4f63-8e15-0c9d2b7a6f30';
export const MEASURED_ROUNDS = 2;

export type BenchState = 'due' | 'partial' | 'complete' | 'skipped';

/**
 * What collar i looks like in the measured campaign, by i mod 20 (due: offset, 1 closure, probes):
 *  0–9   both rounds complete (every 4th has an extra rejected closure, redone)  → complete
 *  10–12 round 1 complete, round 2 not yet walked                                 → partial
 *  13    round 1 with offset and probes, its only closure rejected                 → partial
 *  14    skipped in both rounds                                                    → skipped
 *  15–19 not visited                                                               → due
 */
export function plannedState(i: number): BenchState {
  const g = i % 20;
  if (g < 10) return 'complete';
  if (g < 14) return 'partial';
  return g === 14 ? 'skipped' : 'due';
}

export function expectedTotals(collars: number): Record<BenchState, number> {
  const t: Record<BenchState, number> = { due: 0, partial: 0, complete: 0, skipped: 0 };
  for (let i = 0; i < collars; i++) t[plannedState(i)]++;
  return t;
}

/** SQL for a deterministic UUID from a text key (md5 gives 32 hex digits, which cast to uuid). */
const idOf = (expr: string) => `md5(${expr})::uuid`;
export const campaignIdSql = (c: number) => `md5('campaign:${c}')::uuid`;

/** Fills an empty, migrated database; returns the measured campaign's id. */
export async function generateBenchData(ds: DataSource, size: BenchSize = DEFAULT_SIZE): Promise<string> {
  const { collars: n, campaigns, collarsPerRoute } = size;
  const last = campaigns - 1;
  // One connection throughout: the staging table is a temporary table of this session.
  const runner = ds.createQueryRunner();
  await runner.connect();
  try {
    return await fill(runner.query.bind(runner), n, last, collarsPerRoute);
  } finally {
    await runner.release();
  }
}

type Query = (sql: string, params?: unknown[]) => Promise<any>;

async function fill(q: Query, n: number, last: number, collarsPerRoute: number): Promise<string> {
  await q(`INSERT INTO site (id, name, timezone, elevation_m) VALUES ($1, 'Benchmark site', 'Europe/Berlin', 420)`, [BENCH_SITE_ID]);
  await q(
    `INSERT INTO treatment (id, site_id, code, level)
           SELECT ${idOf(`'treatment:' || t`)}, $1, 'T' || t, 'plot' FROM generate_series(0, 1) t`,
    [BENCH_SITE_ID],
  );
  await q(`INSERT INTO block (id, site_id, code) SELECT ${idOf(`'block:' || b`)}, $1, 'B' || b FROM generate_series(0, 9) b`, [
    BENCH_SITE_ID,
  ]);
  await q(
    `INSERT INTO plot (id, site_id, code, block_id, treatment_id)
           SELECT ${idOf(`'plot:' || p`)}, $1, 'P' || p, ${idOf(`'block:' || (p % 10)`)}, ${idOf(`'treatment:' || (p % 2)`)}
             FROM generate_series(0, $2::int / 4) p`,
    [BENCH_SITE_ID, n],
  );
  await q(
    `INSERT INTO collar (id, site_id, code, plot_id, diameter_cm, area_cm2, height_cm, insertion_cm, installed_on)
           SELECT ${idOf(`'collar:' || i`)}, $1, 'K' || lpad(i::text, 5, '0'), ${idOf(`'plot:' || (i / 4)`)}, 20, 314.159, 8, 5.5, '2026-03-20'
             FROM generate_series(0, $2::int - 1) i`,
    [BENCH_SITE_ID, n],
  );
  await q(
    `INSERT INTO route (id, site_id, name, collar_ids)
           SELECT ${idOf(`'route:' || (i / $3::int)`)}, $1, 'Route ' || (i / $3::int), array_agg(${idOf(`'collar:' || i`)} ORDER BY i)
             FROM generate_series(0, $2::int - 1) i GROUP BY i / $3::int`,
    [BENCH_SITE_ID, n, collarsPerRoute],
  );
  await q(
    `INSERT INTO campaign (id, site_id, name, starts_on, ends_on, rounds, due_offset, due_closures, due_probes, routes, locked)
           SELECT md5('campaign:' || c)::uuid, $1, 'Campaign ' || c, d::date, d::date + 1, CASE WHEN c = $2 THEN $3 ELSE 1 END,
                  true, 1, true, (SELECT jsonb_agg(jsonb_build_object('routeId', id, 'crewIds', '[]'::jsonb, 'direction', 'forward')) FROM route),
                  c <> $2
             FROM generate_series(0, $2) c, LATERAL (SELECT date '2026-01-05' + 14 * c AS d) x`,
    [BENCH_SITE_ID, last, MEASURED_ROUNDS],
  );

  // One row per visit with what was recorded there (see plannedState for the measured campaign).
  await q(
    `CREATE TEMP TABLE bench_visit ON COMMIT PRESERVE ROWS AS
    SELECT ${idOf(`'visit:' || c || ':' || r || ':' || i`)} AS id, c, r, i, ${idOf(`'collar:' || i`)} AS collar_id,
           md5('campaign:' || c)::uuid AS campaign_id,
           timestamptz '2026-01-05 08:00+00' + (14 * c + r - 1) * interval '1 day' + i * interval '3 seconds' AS at,
           (c = $2 AND i % 20 = 14) AS skipped,
           CASE WHEN c = $2 AND i % 20 = 13 THEN 'rejected' WHEN c % 3 = 0 THEN 'accepted' ELSE 'unreviewed' END AS review,
           (i % 80 = 0) AS redo
      FROM generate_series(0, $2) c
      CROSS JOIN generate_series(0, $1::int - 1) i
      CROSS JOIN LATERAL generate_series(1, CASE WHEN c = $2 THEN $3 ELSE 1 END) r
     WHERE c < $2 OR i % 20 < 10 OR i % 20 = 14 OR (i % 20 IN (10, 11, 12, 13) AND r = 1)`,
    [n, last, MEASURED_ROUNDS],
  );
  await q(
    `INSERT INTO visit (id, site_id, campaign_id, round, collar_id, arrived_at, conditions, skipped, skip_reason)
           SELECT id, $1, campaign_id, r, collar_id, at, '{}'::jsonb, skipped, CASE WHEN skipped THEN 'Flooded' END FROM bench_visit`,
    [BENCH_SITE_ID],
  );
  const reading = `$1, id, collar_id, campaign_id, at + interval '1 minute'`;
  await q(
    `INSERT INTO offset_set (id, site_id, visit_id, collar_id, campaign_id, taken_at, readings_cm, mean_cm, sd_cm)
           SELECT ${idOf(`'offset:' || id`)}, ${reading}, '{2.1,2.3,2.0,2.2}', 2.15, 0.129 FROM bench_visit WHERE NOT skipped`,
    [BENCH_SITE_ID],
  );
  await q(
    `INSERT INTO probe_reading (id, site_id, visit_id, collar_id, campaign_id, taken_at, soil_temps, moisture_raw, moisture_kind, vwc_pct)
           SELECT ${idOf(`'probe:' || id`)}, ${reading}, '[{"depthCm":5,"tempC":11.2}]', 24.5, 'vwc', 24.5 FROM bench_visit WHERE NOT skipped`,
    [BENCH_SITE_ID],
  );
  // Short series: the progress query never reads them, and 100 000 full series would only fill the disk.
  const closure = (key: string, state: string, redoOf: string) => `
    INSERT INTO closure (id, site_id, visit_id, collar_id, campaign_id, started_at, settle_s, series, review_state, review_reason, redo_of_id, flux_umol_m2_s)
    SELECT ${idOf(`'${key}:' || id`)}, $1, id, collar_id, campaign_id, at + interval '3 minutes', 20,
           '{"tS":[0,60,120],"co2Ppm":[421,452,480]}'::jsonb, ${state}, CASE WHEN ${state} = 'rejected' THEN 'Benchmark rejection' END,
           ${redoOf}, 2.4
      FROM bench_visit WHERE NOT skipped`;
  await q(`${closure('closure-bad', `'rejected'`, 'NULL')} AND redo AND review <> 'rejected'`, [BENCH_SITE_ID]);
  await q(`${closure('closure', 'review', `CASE WHEN redo AND review <> 'rejected' THEN ${idOf(`'closure-bad:' || id`)} END`)}`, [
    BENCH_SITE_ID,
  ]);
  await q(`DROP TABLE bench_visit`);
  // VACUUM as autovacuum would soon after a bulk load: visibility marks let index-only scans skip the table.
  await q(`VACUUM ANALYZE`);
  return (await q(`SELECT ${campaignIdSql(last)} AS id`))[0].id as string;
}

/** Rows per table, to print beside the timings. */
export async function benchCounts(ds: DataSource): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of ['collar', 'route', 'campaign', 'visit', 'offset_set', 'probe_reading', 'closure']) {
    out[t] = Number((await ds.query(`SELECT count(*) AS n FROM ${t}`))[0].n);
  }
  return out;
}
