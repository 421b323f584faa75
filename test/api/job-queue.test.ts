import { defineJob } from '../../server/jobs/job-registry';
import { startJobQueue, type JobQueue } from '../../server/jobs/job-queue';
import { enqueueJob } from '../../server/jobs/job-store';
import { retireNewerQueueSchema, SUPPORTED_QUEUE_VERSION } from '../../server/jobs/queue-schema';
import { isolatedDatabase } from '../support/isolated-database';
import { startTestApp, type TestApp } from '../support/test-app';

jest.setTimeout(120_000);

async function until(check: () => Promise<boolean>, ms = 60_000): Promise<void> {
  const end = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > end) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe('job queue (pg-boss on PostgreSQL)', () => {
  let t: TestApp;
  let databaseUrl: string;

  beforeAll(async () => {
    databaseUrl = await isolatedDatabase('jobs');
    t = await startTestApp({ databaseUrl });
    await t.ds.query(`CREATE TABLE IF NOT EXISTS job_run_probe (job_id uuid NOT NULL, worker text NOT NULL)`);
  });
  afterAll(async () => {
    await t.ds.query(`DROP TABLE IF EXISTS job_run_probe`);
    await t.close();
  });

  it('when two queues on one database work the same outbox, then every job runs exactly once and ends completed', async () => {
    defineJob({
      name: 'probe-run',
      handler: async (data, ctx) => {
        await ctx.ds.query(`INSERT INTO job_run_probe (job_id, worker) VALUES ($1, $2)`, [ctx.jobId, String(data['n'])]);
        return { ok: true };
      },
    });
    const queues: JobQueue[] = [await startJobQueue(t.ds, databaseUrl), await startJobQueue(t.ds, databaseUrl)];
    try {
      const ids = await t.ds.transaction(async (em) => {
        const out: string[] = [];
        for (let n = 0; n < 40; n++) out.push(await enqueueJob(em, 'probe-run', { n }));
        return out;
      });
      // Both relay at once, as two server processes do.
      await Promise.all(queues.map((q) => q.relay()));
      await until(async () => {
        const [row] = await t.ds.query(`SELECT count(*)::int AS n FROM job_progress WHERE id = ANY($1) AND state = 'completed'`, [ids]);
        return row.n === ids.length;
      });
      const runs: { job_id: string; n: number }[] = await t.ds.query(
        `SELECT job_id, count(*)::int AS n FROM job_run_probe GROUP BY job_id`,
      );
      expect(runs.map((r) => r.job_id).sort()).toEqual([...ids].sort());
      expect(runs.every((r) => r.n === 1)).toBe(true);
      const [left] = await t.ds.query(`SELECT count(*)::int AS n FROM job_outbox WHERE id = ANY($1)`, [ids]);
      expect(left.n).toBe(0);
    } finally {
      await Promise.all(queues.map((q) => q.stop()));
    }
  });

  it('when the queue schema was written by a newer pg-boss, then its unfinished jobs are queued again and the schema is kept under another name', async () => {
    const schema = 'queue_probe';
    await t.ds.query(`DROP SCHEMA IF EXISTS ${schema} CASCADE`);
    await t.ds.query(`CREATE SCHEMA ${schema}`);
    await t.ds.query(`CREATE TABLE ${schema}.version (version int)`);
    await t.ds.query(`INSERT INTO ${schema}.version VALUES ($1)`, [SUPPORTED_QUEUE_VERSION + 2]);
    await t.ds.query(`CREATE TABLE ${schema}.job (id uuid, name text, data jsonb, state text)`);
    await t.ds.query(`INSERT INTO ${schema}.job VALUES
      ('0f6c1c5e-1d1a-4c52-9d7e-000000000001', 'probe-run', '{"n": 1}', 'created'),
      ('0f6c1c5e-1d1a-4c52-9d7e-000000000002', 'probe-run', '{"n": 2}', 'completed'),
      ('0f6c1c5e-1d1a-4c52-9d7e-000000000003', '__pgboss__send-it', '{}', 'created')`);

    expect(await retireNewerQueueSchema(t.ds, schema)).toBe(1);
    const outbox = await t.ds.query(`SELECT id, data FROM job_outbox WHERE name = 'probe-run' AND id::text LIKE '0f6c1c5e%'`);
    expect(outbox).toEqual([{ id: '0f6c1c5e-1d1a-4c52-9d7e-000000000001', data: { n: 1 } }]);
    const kept = await t.ds.query(`SELECT nspname FROM pg_namespace WHERE nspname LIKE $1`, [`${schema}_v%_retired_%`]);
    expect(kept).toHaveLength(1);
    // A current or absent schema is left alone.
    expect(await retireNewerQueueSchema(t.ds, schema)).toBe(0);
    await t.ds.query(`DROP SCHEMA "${kept[0].nspname}" CASCADE`);
    await t.ds.query(`DELETE FROM job_outbox WHERE id::text LIKE '0f6c1c5e%'`);
  });
});
