import PgBoss from 'pg-boss';
import type { DataSource } from 'typeorm';
import { jobDefinitions, type JobDefinition } from './job-registry';
import { markFinished, markStarted, reportProgress } from './job-store';
import { retireNewerQueueSchema } from './queue-schema';

type Boss = PgBoss;

/** The schema pg-boss keeps its tables in. */
export const QUEUE_SCHEMA = 'pgboss';

/** How often each process moves committed outbox rows into pg-boss and polls for work. */
const RELAY_MS = 500;
const RELAY_BATCH = 100;

export interface JobQueue {
  stop(): Promise<void>;
  /** Moves waiting outbox rows into pg-boss now (tests and shutdown; the timer does it otherwise). */
  relay(): Promise<number>;
}

/**
 * The PostgreSQL-backed job queue of one server process (pg-boss 10, the line that supports the
 * Node 20 the project runs on). Every process that starts it works every defined job; pg-boss
 * hands each job to exactly one of them (row locks with SKIP LOCKED), so a job runs once across
 * processes. Jobs enter through the transactional outbox (job-store.ts) and are relayed here.
 */
export async function startJobQueue(ds: DataSource, databaseUrl: string, opts: { pollSeconds?: number } = {}): Promise<JobQueue> {
  await retireNewerQueueSchema(ds, QUEUE_SCHEMA);
  const boss: Boss = new PgBoss({ connectionString: databaseUrl, schema: QUEUE_SCHEMA, max: 4 });
  boss.on('error', (err: Error) => console.error('[jobs] queue error:', err.message));
  await boss.start();
  const defs = jobDefinitions();
  for (const def of defs) {
    if (!(await boss.getQueue(def.name)))
      await boss.createQueue(def.name, { name: def.name, retryLimit: def.retryLimit ?? 2, expireInSeconds: 3600 });
    await boss.work(def.name, { batchSize: 1, pollingIntervalSeconds: opts.pollSeconds ?? 0.5 }, async ([job]) =>
      run(ds, def, job.id, job.data as Record<string, unknown>),
    );
    if (def.schedule) await boss.schedule(def.name, def.schedule);
  }
  const names = new Set(defs.map((d) => d.name));
  let stopping = false;
  let relaying: Promise<number> | null = null;
  const relay = () =>
    (relaying ??= relayOutbox(ds, boss, names).finally(() => {
      relaying = null;
    }));
  const timer = setInterval(() => {
    if (!stopping) relay().catch((e: Error) => console.error('[jobs] relay failed:', e.message));
  }, RELAY_MS);
  timer.unref();
  return {
    relay,
    async stop() {
      stopping = true;
      clearInterval(timer);
      await relaying?.catch(() => 0);
      await boss.stop({ graceful: true, timeout: 10000, close: true });
    },
  };
}

/**
 * Sends committed outbox rows to pg-boss under the outbox id, then deletes them, in one
 * transaction holding the rows (SKIP LOCKED lets several processes relay side by side). A crash
 * after sending and before deleting sends again with the same id, which pg-boss ignores.
 */
async function relayOutbox(ds: DataSource, boss: Boss, names: Set<string>): Promise<number> {
  return ds.transaction(async (em) => {
    const rows: { id: string; name: string; data: Record<string, unknown> }[] = await em.query(
      `SELECT id, name, data FROM job_outbox WHERE name = ANY($1) ORDER BY created_at
        FOR UPDATE SKIP LOCKED LIMIT ${RELAY_BATCH}`,
      [[...names]],
    );
    for (const r of rows) await boss.send(r.name, r.data, { id: r.id });
    if (rows.length) await em.query(`DELETE FROM job_outbox WHERE id = ANY($1)`, [rows.map((r) => r.id)]);
    return rows.length;
  });
}

async function run(ds: DataSource, def: JobDefinition, jobId: string, data: Record<string, unknown>): Promise<unknown> {
  await markStarted(ds, jobId);
  try {
    const result = await def.handler(data, { ds, jobId, progress: (done, total) => reportProgress(ds, jobId, done, total) });
    await markFinished(ds, jobId, result ?? null, null);
    return result;
  } catch (err) {
    await markFinished(ds, jobId, null, (err as Error).message ?? String(err));
    throw err; // pg-boss retries up to retryLimit; every handler is idempotent
  }
}
