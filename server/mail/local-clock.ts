/** The wall-clock date and minute of the day at `at` in an IANA time zone (DST included, via Intl). */
export function localClock(at: Date, timeZone: string): { date: string; minutes: number } {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '00';
  return { date: `${get('year')}-${get('month')}-${get('day')}`, minutes: Number(get('hour')) * 60 + Number(get('minute')) };
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
