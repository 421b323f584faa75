import { readTimestamp } from '../../../../shared/logger/zoned-time';
import { formatSiteTime, siteTimeParts } from '../../../../shared/time/site-time';

/** Local time of the site as "YYYY-MM-DD HH:mm CEST", so a check reads as the crew saw it and says in which zone. */
export function siteTime(iso: string, timeZone: string): string {
  return formatSiteTime(iso, timeZone);
}

/** The value a datetime-local field shows for an instant, in the site's zone. */
export function siteWallTime(iso: string, timeZone: string): string {
  const p = siteTimeParts(iso, timeZone);
  return `${p.day}T${p.time}`;
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
