/**
 * The one home for "what time and day is it at the site": every screen and export that shows a time
 * or means "today" goes through here, so all of them use the site's IANA zone (never UTC, never the
 * device's zone). The zone rules come from the runtime's IANA tz database through Intl.
 */
import { wallClock } from './wall-clock';

// Building an Intl.DateTimeFormat costs far more than formatting with one: keep one per zone.
const dayFormats = new Map<string, Intl.DateTimeFormat>();

function cached(map: Map<string, Intl.DateTimeFormat>, timeZone: string, make: () => Intl.DateTimeFormat): Intl.DateTimeFormat {
  let f = map.get(timeZone);
  if (!f) {
    f = make();
    map.set(timeZone, f);
  }
  return f;
}

/** The site's calendar day (YYYY-MM-DD) of an instant. */
export function localDay(instant: string | number | Date, timeZone: string): string {
  const f = cached(
    dayFormats,
    timeZone,
    () => new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }),
  );
  return f.format(new Date(instant));
}

/** "Today" at the site: the site's calendar day at `now`. */
export function siteToday(timeZone: string, now: Date | number = Date.now()): string {
  return localDay(now, timeZone);
}

/**
 * The first instant of a site day (YYYY-MM-DD) as an ISO string: the site's midnight. Where the
 * clocks skip midnight it is the first instant on that day; where midnight repeats, the earlier one.
 */
export function siteDayStartOf(day: string, timeZone: string): string {
  const [y, m, d] = day.split('-').map(Number);
  const wall = Date.UTC(y, m - 1, d);
  let t = wall - offsetMs(wall, timeZone);
  t = wall - offsetMs(t, timeZone);
  // Zone changes fall on whole quarter hours: step to the day's first quarter hour, then back while still on it.
  for (let i = 0; i < 16 && localDay(t, timeZone) < day; i++) t += QUARTER_HOUR_MS;
  for (let i = 0; i < 16 && localDay(t - QUARTER_HOUR_MS, timeZone) === day; i++) t -= QUARTER_HOUR_MS;
  return new Date(t).toISOString();
}

/** The start of "today" at the site (its midnight), as an ISO instant: what "made today" means. */
export function siteDayStart(timeZone: string, now: Date | number = Date.now()): string {
  return siteDayStartOf(siteToday(timeZone, now), timeZone);
}

const QUARTER_HOUR_MS = 900_000;

/** The zone's offset from UTC (ms, local − UTC) at an instant. */
function offsetMs(instant: number, timeZone: string): number {
  const p = siteTimeParts(instant, timeZone, true);
  const [y, mo, da] = p.day.split('-').map(Number);
  const [h, mi, s] = p.time.split(':').map(Number);
  return Date.UTC(y, mo - 1, da, h, mi, s) - Math.floor(instant / 1000) * 1000;
}

// The short zone name differs by locale: CET/CEST only in en-GB, AKDT in en-US, NZDT/AEDT in en-AU,
// IST in en-IN. The first locale that has letters for the zone wins; else the GMT±h offset stays.
const NAME_LOCALES = ['en-US', 'en-GB', 'en-AU', 'en-IN'];
const nameFormats = new Map<string, Intl.DateTimeFormat[]>();

/** The zone's short name at an instant: CEST, AKDT, NZDT, UTC, or GMT+5:30 where no locale has letters for it. */
export function zoneAbbreviation(instant: string | number | Date, timeZone: string): string {
  let fs = nameFormats.get(timeZone);
  if (!fs) {
    fs = NAME_LOCALES.map((l) => new Intl.DateTimeFormat(l, { timeZone, timeZoneName: 'short' }));
    nameFormats.set(timeZone, fs);
  }
  const d = new Date(instant);
  let fallback = timeZone;
  for (const f of fs) {
    const name = f.formatToParts(d).find((p) => p.type === 'timeZoneName')?.value ?? '';
    if (name && !/^GMT[+-]/.test(name)) return name;
    if (name && fallback === timeZone) fallback = name;
  }
  return fallback;
}

export interface SiteTimeParts {
  day: string;
  /** HH:mm or HH:mm:ss, 24-hour. */
  time: string;
  /** The zone's short name at that instant (CEST, AKDT, NZDT, or GMT+x where the zone has no letters). */
  zone: string;
}

/** The wall-clock parts of an instant in the site's zone. */
export function siteTimeParts(instant: string | number | Date, timeZone: string, seconds = false): SiteTimeParts {
  const w = wallClock(instant, timeZone);
  const two = (n: number) => String(n).padStart(2, '0');
  const hhmm = `${two(w.hour)}:${two(w.minute)}`;
  return {
    day: `${w.year}-${two(w.month)}-${two(w.day)}`,
    time: seconds ? `${hhmm}:${two(w.second)}` : hhmm,
    zone: zoneAbbreviation(instant, timeZone),
  };
}

export interface SiteTimeOptions {
  /** Leave out the day (for lists already grouped by day). */
  timeOnly?: boolean;
  /** Only the site's calendar day (YYYY-MM-DD). */
  dayOnly?: boolean;
  seconds?: boolean;
}

/** "2026-03-29 03:15 CEST": the time a person reads, in the site's zone and naming it. Empty for no time. */
export function formatSiteTime(instant: string | number | Date | null | undefined, timeZone: string, opts: SiteTimeOptions = {}): string {
  if (instant === null || instant === undefined || instant === '') return '';
  const d = new Date(instant);
  if (Number.isNaN(d.getTime())) return '';
  if (opts.dayOnly) return localDay(d, timeZone);
  const p = siteTimeParts(d, timeZone, opts.seconds);
  return opts.timeOnly ? `${p.time} ${p.zone}` : `${p.day} ${p.time} ${p.zone}`;
}

/** ISO-8601 local time with the zone's offset ("2026-03-29T03:15:00+02:00") for export columns beside the UTC one. */
export function siteIsoLocal(instant: string | number | Date | null | undefined, timeZone: string): string {
  if (instant === null || instant === undefined || instant === '') return '';
  const d = new Date(instant);
  if (Number.isNaN(d.getTime())) return '';
  const p = siteTimeParts(d, timeZone, true);
  const [y, mo, da] = p.day.split('-').map(Number);
  const [h, mi, s] = p.time.split(':').map(Number);
  const offsetMin = Math.round((Date.UTC(y, mo - 1, da, h, mi, s) - Math.floor(d.getTime() / 1000) * 1000) / 60_000);
  const sign = offsetMin < 0 ? '-' : '+';
  const abs = Math.abs(offsetMin);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${p.day}T${p.time}${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`;
}
