import { siteTimeParts } from '../../shared/time/site-time';

/** The wall-clock date and minute of the day at `at` in an IANA time zone (DST included): shared/time is the home of the rule. */
export function localClock(at: Date, timeZone: string): { date: string; minutes: number } {
  const p = siteTimeParts(at, timeZone);
  return { date: p.day, minutes: Number(p.time.slice(0, 2)) * 60 + Number(p.time.slice(3, 5)) };
}

export const hhmmToMinutes = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

/**
 * A digest is due from its local time until `catchUpMinutes` later, so a server that was down
 * at the minute still sends it, but nobody gets yesterday's news in the middle of the night.
 */
export function digestDue(nowMinutes: number, digestLocalTime: string, catchUpMinutes: number): boolean {
  const at = hhmmToMinutes(digestLocalTime);
  return nowMinutes >= at && nowMinutes < at + catchUpMinutes;
}
