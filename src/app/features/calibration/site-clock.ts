import { readTimestamp } from '../../../../shared/logger/zoned-time';

/** Local time of the site as YYYY-MM-DD HH:mm, so a check reads as the crew saw it. */
export function siteTime(iso: string, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(new Date(iso));
  const p = Object.fromEntries(parts.map((x) => [x.type, x.value]));
  return `${p['year']}-${p['month']}-${p['day']} ${p['hour']}:${p['minute']}`;
}

/** The value a datetime-local field shows for an instant, in the site's zone. */
export function siteWallTime(iso: string, timeZone: string): string {
  return siteTime(iso, timeZone).replace(' ', 'T');
}

/**
 * A datetime-local value read as the site's wall-clock time → ISO instant in UTC. In the repeated
 * autumn hour the earlier instant is taken; a time the clocks skipped is refused with the reason.
 */
export function fromSiteWallTime(value: string, timeZone: string): { ok: true; iso: string } | { ok: false; message: string } {
  const text = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/.test(value) ? `${value}:00` : value;
  const r = readTimestamp(text, 'YYYY-MM-DDTHH:mm:ss', timeZone);
  return r.ok ? { ok: true, iso: new Date(r.ms).toISOString() } : { ok: false, message: r.message };
}
