import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { enqueueJob } from '../jobs/job-store';
import { defineJob, type JobContext } from '../jobs/job-registry';
import { buildDigest } from './digest-content';
import { digestMail } from './digest-mail';
import type { Mailer } from './mailer';
import { z } from 'zod';

export const DIGEST_JOB = 'daily-digest';

interface Recipient {
  id: string;
  email: string;
  display_name: string;
}

/**
 * Asks for one digest run inside the caller's transaction: the run row and the job commit
 * together (transactional outbox). Scheduled runs are unique per site and local date, so when
 * several processes ask at once only one gets a row back and only that one asks for a job.
 */
export async function askForDigest(
  em: EntityManager,
  siteId: string,
  localDate: string,
  requestedBy: string | null,
): Promise<{ runId: string; jobId: string } | null> {
  const runId = randomUUID();
  const inserted = await em.query(
    `INSERT INTO digest_run (id, site_id, local_date, kind, requested_by) VALUES ($1, $2, $3, $4, $5)
     ON CONFLICT (site_id, local_date) WHERE kind = 'scheduled' DO NOTHING RETURNING id`,
    [runId, siteId, localDate, requestedBy ? 'manual' : 'scheduled', requestedBy],
  );
  if (!inserted.length) return null;
  const jobId = await enqueueJob(em, DIGEST_JOB, { runId }, { siteId, createdBy: requestedBy });
  await em.query(`UPDATE digest_run SET job_id = $2 WHERE id = $1`, [runId, jobId]);
  return { runId, jobId };
}

/** Scheduled: every enabled lead who is a member of the site. "Send now": the person who asked. */
async function recipients(ds: DataSource, run: { site_id: string; requested_by: string | null }): Promise<Recipient[]> {
  return run.requested_by
    ? ds.query(`SELECT id, email, display_name FROM app_user WHERE id = $1 AND NOT disabled`, [run.requested_by])
    : ds.query(
        `SELECT u.id, u.email, u.display_name FROM app_user u JOIN site_member m ON m.user_id = u.id
                 WHERE m.site_id = $1 AND 'lead' = ANY(u.roles) AND NOT u.disabled ORDER BY u.email`,
        [run.site_id],
      );
}

/**
 * Sends one run's digest. A retry after a failure skips recipients already marked delivered,
 * so a lead gets it twice only if the process dies between the SMTP answer and the mark.
 */
export async function runDigest(ds: DataSource, mailer: Mailer, runId: string, ctx?: Pick<JobContext, 'progress'>) {
  const [run] = await ds.query(`SELECT id, site_id, requested_by FROM digest_run WHERE id = $1`, [runId]);
  if (!run) return { sent: 0, reason: 'no such run' };
  const digest = await buildDigest(ds, run.site_id);
  if (!digest) return { sent: 0, reason: 'site deleted' };
  const people = await recipients(ds, run);
  const board = `${mailer.config.appOrigin}/board`;
  let sent = 0;
  for (const [i, p] of people.entries()) {
    const [done] = await ds.query(`SELECT 1 FROM digest_delivery WHERE run_id = $1 AND user_id = $2`, [runId, p.id]);
    if (!done) {
      await mailer.send(digestMail(digest, p.email, p.display_name, board));
      await ds.query(`INSERT INTO digest_delivery (run_id, user_id, email) VALUES ($1, $2, $3) ON CONFLICT DO NOTHING`, [
        runId,
        p.id,
        p.email,
      ]);
      sent++;
    }
    await ctx?.progress(i + 1, people.length);
  }
  const due = digest.campaigns.reduce((n, c) => n + c.routes.reduce((m, r) => m + r.due.length, 0), 0);
  return { sent, recipients: people.length, due, anomalies: digest.anomalies.total, silentDevices: digest.silentDevices.length };
}

/** What requestDigest enqueues: the run whose digest to send. */
const digestJobData = z.object({ runId: z.string() });

export function defineDigestJob(mailer: Mailer): void {
  defineJob({ name: DIGEST_JOB, retryLimit: 3, handler: (data, ctx) => runDigest(ctx.ds, mailer, digestJobData.parse(data).runId, ctx) });
}
