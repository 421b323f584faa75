import type { DataSource } from 'typeorm';
import { defineJob } from '../jobs/job-registry';

export const AUTH_PURGE_JOB = 'purge-auth-rows';
/** Every 15 minutes (cron, UTC); pg-boss starts a scheduled job once across all server processes. */
export const AUTH_PURGE_SCHEDULE = '*/15 * * * *';

/**
 * Deletes rows nothing will read again: sign-in and reset counters whose window has passed (the
 * store restarts an expired window itself, so they only pile up), sessions past their expiry,
 * and sessions without a signed-in user (sessions are stored only once someone signs in).
 */
export async function purgeAuthRows(ds: DataSource): Promise<{ rateLimitRows: number; sessionRows: number }> {
  const [, rateLimitRows] = (await ds.query(`DELETE FROM rate_limit_hit WHERE reset_at <= now()`)) as [unknown, number];
  const [, sessionRows] = (await ds.query(`DELETE FROM session WHERE expire <= now() OR (sess->'passport'->>'user') IS NULL`)) as [
    unknown,
    number,
  ];
  return { rateLimitRows, sessionRows };
}

export function defineAuthPurgeJob(): void {
  defineJob({ name: AUTH_PURGE_JOB, schedule: AUTH_PURGE_SCHEDULE, handler: (_data, ctx) => purgeAuthRows(ctx.ds) });
}
