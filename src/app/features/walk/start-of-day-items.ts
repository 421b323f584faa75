import { siteTimeParts } from '../../../../shared/time/site-time';

/** The start-of-day checklist, in the order a crew does it at the car. */
export const CHECK_ITEMS = [
  { kind: 'safety-ack', title: 'Field safety note' },
  { kind: 'warm-up', title: 'Analyzer warm-up' },
  { kind: 'ambient', title: 'Ambient CO2' },
  { kind: 'leak', title: 'Leak check' },
  { kind: 'clock', title: 'Clock offset' },
] as const;

export type CheckKind = (typeof CHECK_ITEMS)[number]['kind'];

/**
 * Seconds the analyzer's clock is ahead of the phone's (negative = behind), from the analyzer's
 * time of day as read off its display. The analyzer keeps the site's wall time (its files are read
 * in the site's zone), so the phone's instant is taken as the site's wall time too, whatever zone
 * the phone is set to. The wrap at midnight is taken the short way round.
 */
export function clockOffsetS(analyzerTime: string, phone: Date, timeZone: string): number | null {
  const m = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(analyzerTime.trim());
  if (!m) return null;
  const a = Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3] ?? 0);
  const [hh, mm, ss] = siteTimeParts(phone, timeZone, true).time.split(':').map(Number);
  const p = hh * 3600 + mm * 60 + ss + phone.getMilliseconds() / 1000;
  let d = a - p;
  if (d > 43200) d -= 86400;
  if (d < -43200) d += 86400;
  return Math.round(d * 10) / 10;
}

/** A leak check passes when the CO2 slope on the sealed plate stays within the site's limit (either sign). */
export function leakPassed(slopeUmolMolS: number, limit: number): boolean {
  return Math.abs(slopeUmolMolS) <= limit;
}
