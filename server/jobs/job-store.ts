import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';

type Queryable = Pick<EntityManager, 'query'> | Pick<DataSource, 'query'>;

export interface EnqueueOptions {
  /** Jobs with the same key still waiting in the outbox are one job (a burst of writes asks once; the latest data wins). */
  dedupeKey?: string;
  siteId?: string | null;
  createdBy?: string | null;
}

/**
 * Asks for a job inside the caller's transaction (transactional outbox): the job exists only if
 * the write that asked for it commits, and it cannot start before that write is visible. A
 * running queue moves outbox rows into pg-boss. Returns the job id, readable at GET /api/jobs/:id.
 */
export async function enqueueJob(em: Queryable, name: string, data: Record<string, unknown>, opts: EnqueueOptions = {}): Promise<string> {
  const id = randomUUID();
  const [row]: { id: string }[] = await em.query(
    `INSERT INTO job_outbox (id, name, data, dedupe_key) VALUES ($1, $2, $3, $4)
     ON CONFLICT (dedupe_key) DO UPDATE SET data = EXCLUDED.data
     RETURNING id`,
    [id, name, JSON.stringify(data), opts.dedupeKey ?? null],
  );
  if (row.id === id) {
    await em.query(`INSERT INTO job_progress (id, name, site_id, created_by) VALUES ($1, $2, $3, $4)`, [
      id,
      name,
      opts.siteId ?? null,
      opts.createdBy ?? null,
    ]);
  }
  return row.id;
}

export interface JobProgress {
  id: string;
  name: string;
  siteId: string | null;
  state: 'queued' | 'active' | 'completed' | 'failed';
  done: number;
  total: number | null;
  attempts: number;
  result: unknown;
  error: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

const COLUMNS = `id, name, site_id, state, done, total, attempts, result, error, created_at, started_at, finished_at`;

/** A job_progress row as the pg driver reads it (integer columns arrive as numbers, timestamptz as Date). */
interface JobProgressRow {
  id: string;
  name: string;
  site_id: string | null;
  state: JobProgress['state'];
  done: number;
  total: number | null;
  attempts: number;
  result: unknown;
  error: string | null;
  created_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
}

function toProgress(r: JobProgressRow): JobProgress {
  return {
    id: r.id,
    name: r.name,
    siteId: r.site_id,
    state: r.state,
    done: r.done,
    total: r.total,
    attempts: r.attempts,
    result: r.result,
    error: r.error,
    createdAt: r.created_at.toISOString(),
    startedAt: r.started_at?.toISOString() ?? null,
    finishedAt: r.finished_at?.toISOString() ?? null,
  };
}

export async function jobProgress(db: Queryable, id: string): Promise<JobProgress | null> {
  const [row]: JobProgressRow[] = await db.query(`SELECT ${COLUMNS} FROM job_progress WHERE id = $1`, [id]);
  return row ? toProgress(row) : null;
}

/** Recent jobs of one kind, newest first; `siteIds` null means every site. */
export async function recentJobs(db: Queryable, name: string | null, siteIds: string[] | null, limit: number): Promise<JobProgress[]> {
  const rows: JobProgressRow[] = await db.query(
    `SELECT ${COLUMNS} FROM job_progress
      WHERE ($1::text IS NULL OR name = $1) AND ($2::uuid[] IS NULL OR site_id = ANY($2) OR site_id IS NULL)
      ORDER BY created_at DESC LIMIT $3`,
    [name, siteIds, limit],
  );
  return rows.map(toProgress);
}

export async function markStarted(db: Queryable, id: string): Promise<void> {
  await db.query(`UPDATE job_progress SET state = 'active', started_at = now(), attempts = attempts + 1, error = NULL WHERE id = $1`, [id]);
}

export async function reportProgress(db: Queryable, id: string, done: number, total: number | null): Promise<void> {
  await db.query(`UPDATE job_progress SET done = $2, total = $3 WHERE id = $1`, [id, done, total]);
}

export async function markFinished(db: Queryable, id: string, result: unknown, error: string | null): Promise<void> {
  await db.query(`UPDATE job_progress SET state = $2, result = $3, error = $4, finished_at = now() WHERE id = $1`, [
    id,
    error ? 'failed' : 'completed',
    result === undefined ? null : JSON.stringify(result),
    error,
  ]);
}
