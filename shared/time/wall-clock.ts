/**
 * The wall clock of an instant in an IANA zone, read once through Intl: year to second as numbers.
 * Site times, logger time zones and the season's local days all read it here (one formatter per
 * zone: building an Intl.DateTimeFormat costs far more than formatting with one).
 */

export interface WallClock {
  year: number;
  month: number;
  day: number;
  /** 0–23 (some engines write midnight as 24 even with hourCycle h23: read as 0). */
  hour: number;
  minute: number;
  second: number;
}

const formats = new Map<string, Intl.DateTimeFormat>();

/** The zone's year…second formatter (throws a RangeError for a zone the runtime does not know). */
export function wallClockFormat(timeZone: string): Intl.DateTimeFormat {
  let f = formats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    formats.set(timeZone, f);
  }
  return f;
}

const FIELDS: Partial<Record<Intl.DateTimeFormatPartTypes, keyof WallClock>> = {
  year: 'year',
  month: 'month',
  day: 'day',
  hour: 'hour',
  minute: 'minute',
  second: 'second',
};

/** The wall clock of an instant in the zone. */
export function wallClock(instant: string | number | Date, timeZone: string): WallClock {
  const w: WallClock = { year: NaN, month: NaN, day: NaN, hour: NaN, minute: NaN, second: NaN };
  for (const part of wallClockFormat(timeZone).formatToParts(new Date(instant))) {
    const field = FIELDS[part.type];
    if (field) w[field] = Number(part.value);
  }
  w.hour %= 24;
  return w;
}

/** The wall clock read back as if it were UTC, in ms (that − the instant = the zone's offset then). */
export function wallClockAsUtcMs(w: WallClock): number {
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
}
