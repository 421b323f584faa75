import type { z } from 'zod';
import { siteToday } from '../time/site-time';
import type { COLLAR_EVENT_KINDS } from './field-records';
import { siteFields } from './site-layout';

/**
 * Settling after a collar disturbs the soil. Inserting or reseating a collar cuts roots and opens the
 * soil, so closures right after read high: within the site's hard limit closures should wait, within
 * the warning limit they are flagged (common practice, from memory: wait at least a day, better a
 * week). The one home of this rule: every surface that says "still settling" calls it.
 */

/** A site's settling limits in days; the schema's defaults fill what a record lacks (or a missing site). */
export const siteSettlingLimits = siteFields.pick({ settlingDaysHard: true, settlingDaysWarn: true });
export type SettlingLimits = z.infer<typeof siteSettlingLimits>;

/** Collar events that disturb the soil under the collar. */
export const DISTURBING_EVENT_KINDS = ['installed', 'reseated'] as const satisfies readonly (typeof COLLAR_EVENT_KINDS)[number][];

/** The newest disturbance of a collar: its site day (YYYY-MM-DD) and what it was. */
export interface Disturbance {
  date: string;
  what: string;
}

export interface SettlingNote {
  level: 'hard' | 'warn';
  /** Whole site days since the disturbance's site day (0 on that day). */
  days: number;
  since: string;
  what: string;
}

const DAY_MS = 86_400_000;

/**
 * Whole calendar days at the site from a site day (YYYY-MM-DD) to the site's today at `now`: the
 * day of the event is 0 and the count steps at the site's midnight, whatever the device's zone.
 */
export function siteDaysSince(day: string, timeZone: string, now: Date | number = Date.now()): number {
  const today = siteToday(timeZone, now);
  return Math.round((Date.parse(`${today}T00:00:00Z`) - Date.parse(`${day.slice(0, 10)}T00:00:00Z`)) / DAY_MS);
}

/** The newest live disturbing event of a collar, or its install date when that is newer or the only one. */
export function newestDisturbance(
  events: readonly { kind: string; date: string; deleted?: boolean }[],
  installedOn: string | null,
): Disturbance | null {
  const kinds: readonly string[] = DISTURBING_EVENT_KINDS;
  const all = events.filter((e) => kinds.includes(e.kind) && !e.deleted).map((e) => ({ date: e.date, what: e.kind }));
  if (installedOn) all.push({ date: installedOn, what: 'installed' });
  return all.sort((a, b) => b.date.localeCompare(a.date))[0] ?? null;
}

/** Whether a collar disturbed at `latest` still settles at `now`: days are counted at the site, limits are the site's. */
export function collarSettling(
  latest: Disturbance | null,
  limits: SettlingLimits,
  timeZone: string,
  now: Date | number = Date.now(),
): SettlingNote | null {
  if (!latest) return null;
  const days = siteDaysSince(latest.date, timeZone, now);
  if (days < limits.settlingDaysHard) return { level: 'hard', days, since: latest.date, what: latest.what };
  if (days < limits.settlingDaysWarn) return { level: 'warn', days, since: latest.date, what: latest.what };
  return null;
}
