import type { DataSource } from 'typeorm';
import { askForDigest } from './digest-job';
import { digestDue, localClock } from './local-clock';
import { serverEnv } from '../core/server-env';

/** How long after its time a missed digest is still sent (a server restarted at 19:30 sends the 18:00 one). */
export const DIGEST_CATCH_UP_MINUTES = 180;

/**
 * Looks at every site's digest time in its own time zone and asks for the runs that are due.
 * Safe to call from every process at once: the unique run per site and local date decides.
 */
export async function scheduleDueDigests(ds: DataSource, now = new Date()): Promise<string[]> {
  const sites: { id: string; timezone: string; digest_local_time: string }[] = await ds.query(
    `SELECT s.id, s.timezone, s.digest_local_time FROM site s WHERE NOT s.deleted`,
  );
  const asked: string[] = [];
  for (const s of sites) {
    const clock = localClock(now, s.timezone);
    if (!digestDue(clock.minutes, s.digest_local_time, DIGEST_CATCH_UP_MINUTES)) continue;
    const run = await ds.transaction((em) => askForDigest(em, s.id, clock.date, null));
    if (run) asked.push(run.runId);
  }
  return asked;
}

/**
 * Started next to the job queue in every server process (DIGEST_TICK_SECONDS, default 30):
 * each tick asks for due digests; the job queue then runs each one once.
 */
export function startDigestScheduler(ds: DataSource, tickSeconds = serverEnv().DIGEST_TICK_SECONDS): { stop(): void } {
  let running = false;
  const tick = () => {
    if (running) return;
    running = true;
    scheduleDueDigests(ds)
      .catch((e: Error) => console.error('[digest] scheduling failed:', e.message))
      .finally(() => {
        running = false;
      });
  };
  const timer = setInterval(tick, tickSeconds * 1000);
  timer.unref();
  tick();
  return { stop: () => clearInterval(timer) };
}
