/**
 * Campaign progress benchmark: builds 5 000 collars and 20 campaigns with readings in an empty
 * database, then times GET /api/campaigns/:id/progress's work (campaignProgress: its SQL round
 * trip and the shaping in Node) against a plain count(*) over the same campaign's readings in
 * the same run. Target: median ≤ 50 ms for one 5 000-collar campaign.
 * Usage: DATABASE_URL=postgres://…/<name>_bench node bench-progress.js [collars] [campaigns] [repetitions]
 */
import 'reflect-metadata';
import { Client } from 'pg';
import type { SessionUser } from '../../shared/auth/roles';
import { campaignProgress } from '../../server/campaigns/campaign-progress';
import { createDataSource, runMigrations } from '../../server/core/data-source';
import { benchCounts, DEFAULT_SIZE, expectedTotals, generateBenchData, type BenchState } from './bench-data';
import { median } from '../lib/bench-stats';

const COUNT_SQL = `
  SELECT (SELECT count(*) FROM visit WHERE campaign_id = $1 AND NOT deleted)
       + (SELECT count(*) FROM offset_set WHERE campaign_id = $1 AND NOT deleted)
       + (SELECT count(*) FROM probe_reading WHERE campaign_id = $1 AND NOT deleted)
       + (SELECT count(*) FROM closure WHERE campaign_id = $1 AND NOT deleted) AS n`;

const ms = (t0: bigint) => Number(process.hrtime.bigint() - t0) / 1e6;

async function timeIt(reps: number, fn: () => Promise<unknown>): Promise<number[]> {
  for (let i = 0; i < 3; i++) await fn(); // warm the plan cache and the buffers
  const out: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = process.hrtime.bigint();
    await fn();
    out.push(ms(t0));
  }
  return out;
}

async function resetSchema(url: string): Promise<void> {
  const name = decodeURIComponent(new URL(url).pathname.slice(1));
  if (!name.endsWith('_bench')) throw new Error(`refusing to empty "${name}": benchmark databases end in _bench`);
  const c = new Client({ connectionString: url });
  await c.connect();
  try {
    await c.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  } finally {
    await c.end();
  }
  await runMigrations(url);
}

export async function main(argv: string[]): Promise<void> {
  const url = process.env['DATABASE_URL'];
  if (!url) throw new Error('DATABASE_URL is not set');
  const size = { ...DEFAULT_SIZE, collars: Number(argv[2] ?? DEFAULT_SIZE.collars), campaigns: Number(argv[3] ?? DEFAULT_SIZE.campaigns) };
  const reps = Number(argv[4] ?? 25);
  await resetSchema(url);
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    let t0 = process.hrtime.bigint();
    const campaignId = await generateBenchData(ds, size);
    console.log(`data: ${JSON.stringify(await benchCounts(ds))} built in ${(ms(t0) / 1000).toFixed(1)} s`);

    const lab: SessionUser = {
      id: '00000000-0000-4000-8000-000000000001',
      email: 'bench@fluxwalk.example',
      displayName: 'Bench',
      roles: ['lab'],
      siteIds: [],
    };
    const progress = await campaignProgress(ds, lab, campaignId, null);
    checkTotals(progress.totals.byRoute, size.collars);
    t0 = process.hrtime.bigint();
    const progressTimes = await timeIt(reps, () => campaignProgress(ds, lab, campaignId, null));
    const roundTimes = await timeIt(reps, () => campaignProgress(ds, lab, campaignId, 1));
    const readings = Number((await ds.query(COUNT_SQL, [campaignId]))[0].n);
    const countTimes = await timeIt(reps, () => ds.query(COUNT_SQL, [campaignId]));
    const p = median(progressTimes);
    const c = median(countTimes);
    console.log(
      `progress, all rounds, ${progress.collars.length} collars: median ${p.toFixed(1)} ms (min ${Math.min(...progressTimes).toFixed(1)}, max ${Math.max(...progressTimes).toFixed(1)}, n=${reps})`,
    );
    console.log(`progress, round 1: median ${median(roundTimes).toFixed(1)} ms`);
    console.log(`plain count(*) over the campaign's ${readings} visits and readings: median ${c.toFixed(1)} ms`);
    console.log(`ratio progress / count: ${(p / c).toFixed(1)}x   target ≤ 50 ms: ${p <= 50 ? 'met' : 'NOT met'}`);
  } finally {
    await ds.destroy();
  }
}

/** The answer must match the planted states before its speed means anything. */
function checkTotals(byRoute: Record<string, Record<BenchState, number>>, collars: number): void {
  const got: Record<BenchState, number> = { due: 0, partial: 0, complete: 0, skipped: 0 };
  for (const t of Object.values(byRoute)) for (const k of Object.keys(got) as BenchState[]) got[k] += t[k];
  const want = expectedTotals(collars);
  if (JSON.stringify(got) !== JSON.stringify(want))
    throw new Error(`progress totals ${JSON.stringify(got)} differ from the planted ${JSON.stringify(want)}`);
  console.log(`progress totals match the planted states: ${JSON.stringify(got)}`);
}

if (require.main === module) {
  main(process.argv).catch((err) => {
    console.error(`bench-progress: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });
}
