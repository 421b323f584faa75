/**
 * Logger timestamps: a wall-clock text in a chosen format, read in an IANA time zone.
 *
 * Loggers usually write local wall time without an offset. Around a daylight-saving change that
 * text is ambiguous (the autumn hour happens twice) or impossible (the spring hour never
 * happens). Both are resolved here through the zone's rules (Intl, so no zone table is copied):
 * an ambiguous wall time takes the reading that keeps the file in order after the previous row,
 * and an impossible one is reported so the row is never silently moved by an hour.
 */
import { wallClock, wallClockAsUtcMs, wallClockFormat } from '../time/wall-clock';

export const TIMESTAMP_FORMATS = [
  'YYYY-MM-DD HH:mm:ss',
  'YYYY-MM-DDTHH:mm:ss',
  'DD.MM.YYYY HH:mm:ss',
  'DD/MM/YYYY HH:mm:ss',
  'MM/DD/YYYY HH:mm:ss',
  'YYYY/MM/DD HH:mm:ss',
  'ISO-8601 with offset',
  'Unix seconds',
] as const;
export type TimestampFormat = (typeof TIMESTAMP_FORMATS)[number];

export function isTimeZone(timeZone: string): boolean {
  try {
    wallClockFormat(timeZone);
    return true;
  } catch {
    return false;
  }
}

const offsetCache = new Map<string, number>();
const QUARTER_HOUR_MS = 900_000;

/** The zone's offset from UTC (ms, local − UTC) at an instant. Zone changes fall on whole quarter hours. */
export function zoneOffsetMs(utcMs: number, timeZone: string): number {
  const bucket = Math.floor(utcMs / QUARTER_HOUR_MS);
  const key = `${timeZone}|${bucket}`;
  const hit = offsetCache.get(key);
  if (hit !== undefined) return hit;
  const at = bucket * QUARTER_HOUR_MS;
  const offset = wallClockAsUtcMs(wallClock(at, timeZone)) - at;
  if (offsetCache.size > 50_000) offsetCache.clear();
  offsetCache.set(key, offset);
  return offset;
}

/**
 * Every instant whose wall time in the zone is `wallMs` (wall fields written as if UTC):
 * one normally, two in the repeated autumn hour (earlier first), none in the skipped spring hour.
 */
export function instantsForWallTime(wallMs: number, timeZone: string): number[] {
  const offsets = new Set([
    zoneOffsetMs(wallMs - 86_400_000, timeZone),
    zoneOffsetMs(wallMs, timeZone),
    zoneOffsetMs(wallMs + 86_400_000, timeZone),
  ]);
  const out: number[] = [];
  for (const o of offsets) {
    const utc = wallMs - o;
    if (zoneOffsetMs(utc, timeZone) === o && !out.includes(utc)) out.push(utc);
  }
  return out.sort((a, b) => a - b);
}

export type TimestampRead = { ok: true; ms: number } | { ok: false; message: string };

/** The fields of a timestamp format, as written in TIMESTAMP_FORMATS. */
type WallToken = 'YYYY' | 'MM' | 'DD' | 'HH' | 'mm' | 'ss';

const FIELD_PATTERNS: Record<WallToken, string> = {
  YYYY: '(\\d{4})',
  MM: '(\\d{1,2})',
  DD: '(\\d{1,2})',
  HH: '(\\d{1,2})',
  mm: '(\\d{2})',
  ss: '(\\d{2}(?:[.,]\\d+)?)',
};
const isWallToken = (tok: string): tok is WallToken => Object.hasOwn(FIELD_PATTERNS, tok);
const compiled = new Map<string, { re: RegExp; order: WallToken[] }>();

function wallPattern(format: string): { re: RegExp; order: WallToken[] } {
  let hit = compiled.get(format);
  if (hit) return hit;
  const order: WallToken[] = [];
  // Many loggers drop the seconds when they are zero ("2026-07-01 00:00"): ":ss" is optional.
  const src = format.replace(/:ss|YYYY|MM|DD|HH|mm|ss|[.*+?^${}()|[\]\\/]/g, (tok) => {
    if (tok === ':ss') {
      order.push('ss');
      return `(?::${FIELD_PATTERNS.ss})?`;
    }
    if (isWallToken(tok)) {
      order.push(tok);
      return FIELD_PATTERNS[tok];
    }
    return `\\${tok}`;
  });
  hit = { re: new RegExp(`^\\s*${src}\\s*$`), order };
  compiled.set(format, hit);
  return hit;
}

/** Wall-clock fields of a text in a fixed format, as ms "as if UTC" (null when it does not fit or is no real date). */
export function wallTimeMs(text: string, format: string): number | null {
  const { re, order } = wallPattern(format);
  const m = re.exec(text);
  if (!m) return null;
  // A field the format does not hold stays NaN, so the text reads as no date at all.
  const f: Record<WallToken, number> = { YYYY: NaN, MM: NaN, DD: NaN, HH: NaN, mm: NaN, ss: NaN };
  order.forEach((tok, i) => (f[tok] = Number((m[i + 1] ?? '0').replace(',', '.'))));
  const sec = Math.floor(f.ss);
  const ms = Math.round((f.ss - sec) * 1000);
  const t = Date.UTC(f.YYYY, f.MM - 1, f.DD, f.HH, f.mm, sec, ms);
  const d = new Date(t);
  // Date.UTC rolls 31.02 over into March; a logger never means that.
  if (d.getUTCMonth() !== f.MM - 1 || d.getUTCDate() !== f.DD || f.HH > 23 || f.mm > 59 || sec > 59) return null;
  return t;
}

const ISO_WITH_OFFSET = /^\s*\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})\s*$/;

/**
 * One timestamp cell → UTC ms. `previousMs` (the last good row) settles the repeated autumn hour:
 * the reading at or after it wins, so a file stays in the order it was written.
 */
export function readTimestamp(text: string, format: TimestampFormat, timeZone: string, previousMs: number | null = null): TimestampRead {
  if (format === 'Unix seconds') {
    const v = Number(text.trim().replace(',', '.'));
    return text.trim() !== '' && Number.isFinite(v)
      ? { ok: true, ms: Math.round(v * 1000) }
      : { ok: false, message: `"${text}" is not a number of seconds` };
  }
  if (format === 'ISO-8601 with offset') {
    const ms = ISO_WITH_OFFSET.test(text) ? Date.parse(text.trim().replace(' ', 'T')) : NaN;
    return Number.isFinite(ms)
      ? { ok: true, ms }
      : { ok: false, message: `"${text}" is not an ISO-8601 time with an offset (Z or ±hh:mm)` };
  }
  const wall = wallTimeMs(text, format);
  if (wall === null) return { ok: false, message: `"${text}" does not fit the time format ${format}` };
  const instants = instantsForWallTime(wall, timeZone);
  if (!instants.length) {
    return {
      ok: false,
      message: `"${text}" does not exist in ${timeZone} (the clocks skipped that hour): is the logger on standard time?`,
    };
  }
  if (instants.length === 1 || previousMs === null) return { ok: true, ms: instants[0] };
  const after = instants.find((t) => t >= previousMs);
  return { ok: true, ms: after ?? instants[0] };
}
