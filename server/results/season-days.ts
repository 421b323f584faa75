/**
 * Calendar days of a season in the site's time zone: day numbers for loops, the local day of an
 * instant, the instant of local noon (the time a day's interpolated flux stands for) and the local
 * hour of a visit (to tell daytime-only surveys, whose means overstate a daily mean).
 */
import { wallClock, wallClockAsUtcMs } from '../../shared/time/wall-clock';

const DAY_MS = 86_400_000;
export const dayNumber = (day: string) => Date.parse(`${day}T00:00:00Z`) / DAY_MS;
export const dayString = (n: number) => new Date(n * DAY_MS).toISOString().slice(0, 10);
export const MS_PER_DAY = DAY_MS;

/** Local day of each instant, with one formatter per time zone (Intl formatters are costly to build). */
export function localDayFormatter(timeZone: string): (t: string | number) => string {
  const f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
  return (t) => f.format(new Date(t));
}

/** Wall-clock fields of an instant in a zone, read back as if they were UTC (offset = that − instant). */
const wallMs = (ms: number, timeZone: string) => wallClockAsUtcMs(wallClock(ms, timeZone));

/** The instant of 12:00 local time on each day, in ms since the epoch (DST-safe: the offset is read at noon itself). */
export function localNoonFormatter(timeZone: string): (day: string) => number {
  return (day) => {
    const guess = Date.parse(`${day}T12:00:00Z`);
    const first = guess - (wallMs(guess, timeZone) - guess);
    return guess - (wallMs(first, timeZone) - first);
  };
}

/** Local hour of day (0–23, fractional) of each instant. */
export function localHourFormatter(timeZone: string): (iso: string) => number {
  return (iso) => {
    const ms = Date.parse(iso);
    return (((wallMs(ms, timeZone) % DAY_MS) + DAY_MS) % DAY_MS) / 3_600_000;
  };
}
