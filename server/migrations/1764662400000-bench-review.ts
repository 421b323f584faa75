import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Bench review and the job queue: the history of every review decision and recompute of a
 * closure, the transactional job outbox (a job exists only when the write that asked for it
 * commits), job progress readable by the API, and indexes for the review queue.
 */
export class BenchReview1764662400000 implements MigrationInterface {
  name = 'BenchReview1764662400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE closure_review_history (
      id bigserial PRIMARY KEY,
      closure_id uuid NOT NULL REFERENCES closure(id),
      site_id uuid NOT NULL REFERENCES site(id),
      user_id uuid NULL,
      at timestamptz NOT NULL DEFAULT now(),
      kind text NOT NULL CHECK (kind IN ('decision', 'recompute')),
      field text NOT NULL,
      old_value jsonb NULL,
      new_value jsonb NULL,
      old_flux_umol_m2_s double precision NULL,
      new_flux_umol_m2_s double precision NULL,
      job_id uuid NULL)`);
    await q.query(`CREATE INDEX closure_review_history_closure_idx ON closure_review_history (closure_id, at, id)`);
    await q.query(`CREATE TABLE job_outbox (
      id uuid PRIMARY KEY,
      name text NOT NULL,
      data jsonb NOT NULL,
      dedupe_key text NULL,
      created_at timestamptz NOT NULL DEFAULT now())`);
    // One waiting request per scope: a burst of writes to one collar asks for one recompute.
    await q.query(`CREATE UNIQUE INDEX job_outbox_dedupe_idx ON job_outbox (dedupe_key)`);
    await q.query(`CREATE TABLE job_progress (
      id uuid PRIMARY KEY,
      name text NOT NULL,
      site_id uuid NULL,
      state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'active', 'completed', 'failed')),
      done integer NOT NULL DEFAULT 0,
      total integer NULL,
      attempts integer NOT NULL DEFAULT 0,
      result jsonb NULL,
      error text NULL,
      created_by uuid NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      started_at timestamptz NULL,
      finished_at timestamptz NULL)`);
    await q.query(`CREATE INDEX job_progress_recent_idx ON job_progress (name, created_at DESC)`);
    await q.query(`CREATE INDEX closure_site_started_idx ON closure (site_id, started_at) WHERE NOT deleted`);
    await q.query(`CREATE INDEX closure_flags_idx ON closure USING gin (flags) WHERE NOT deleted`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX closure_flags_idx, closure_site_started_idx`);
    await q.query(`DROP TABLE job_progress, job_outbox, closure_review_history`);
  }
}
