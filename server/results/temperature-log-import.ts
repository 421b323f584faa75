/**
 * Soil-temperature logger files into temperature logs (one plot, one depth). Minimal parsing of
 * delimited text: a time column (ISO-8601 with an offset, or a local "YYYY-MM-DD hh:mm[:ss]" read
 * in the given IANA zone) and a temperature column in °C, picked by header name. The closure-file
 * column mapping in shared/logger is being written alongside; the two should share one parser.
 */
import { randomUUID } from 'node:crypto';
import Papa from 'papaparse';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { SessionUser } from '../../shared/auth/roles';
import { AppError, badRequest } from '../core/errors';
import { ChangeBuffer, writeRecord } from '../records/record-writer';

export const temperatureLogImportSchema = z.object({
  siteId: z.string().uuid(),
  plotId: z.string().uuid(),
  depthCm: z.number().min(0).max(200),
  source: z.string().max(255).default(''),
  text: z.string().min(1).max(900_000),
  timeColumn: z.string().min(1),
  tempColumn: z.string().min(1),
  timeZone: z.string().min(1).default('UTC'),
});
export type TemperatureLogImport = z.infer<typeof temperatureLogImportSchema>;

const LOCAL = /^(\d{4})-(\d{2})-(\d{2})[ T](\d{2}):(\d{2})(?::(\d{2}))?$/;

/** Offset of a zone from UTC at an instant, in ms, read back through Intl (no zone database of our own). */
function zoneOffsetMs(ms: number, timeZone: string): number {
  const parts = Object.fromEntries(new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit',
    hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(new Date(ms)).map((p) => [p.type, p.value]));
  return Date.UTC(+parts['year'], +parts['month'] - 1, +parts['day'], +parts['hour'], +parts['minute'], +parts['second']) - Math.floor(ms / 1000) * 1000;
}

export function parseLoggerTime(value: string, timeZone: string): number | null {
  const v = value.trim();
  const m = LOCAL.exec(v);
  if (!m) {
    const t = /[zZ]|[+-]\d{2}:?\d{2}$/.test(v) ? Date.parse(v) : NaN;
    return Number.isFinite(t) ? t : null;
  }
  const wall = Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5], +(m[6] ?? 0));
  // Two passes settle the offset on either side of a daylight-saving change.
  let t = wall - zoneOffsetMs(wall, timeZone);
  t = wall - zoneOffsetMs(t, timeZone);
  return t;
}

export function parseTemperatureText(body: Pick<TemperatureLogImport, 'text' | 'timeColumn' | 'tempColumn' | 'timeZone'>): { t: string[]; tempC: number[] } {
  const parsed = Papa.parse<Record<string, string>>(body.text.trim(), { header: true, skipEmptyLines: true, transformHeader: (h) => h.trim() });
  const fields = parsed.meta.fields ?? [];
  for (const [key, col] of [['timeColumn', body.timeColumn], ['tempColumn', body.tempColumn]] as const) {
    if (!fields.includes(col)) throw badRequest(`The file has no column "${col}"`, [{ path: key, message: `Columns: ${fields.join(', ')}` }]);
  }
  const t: string[] = [];
  const tempC: number[] = [];
  parsed.data.forEach((row, i) => {
    const at = parseLoggerTime(row[body.timeColumn] ?? '', body.timeZone);
    const temp = Number(String(row[body.tempColumn] ?? '').replace(',', '.'));
    if (at === null || !Number.isFinite(temp)) throw badRequest(`Row ${i + 2} has no readable time or temperature`, [{ path: 'text', message: `row ${i + 2}` }]);
    t.push(new Date(at).toISOString());
    tempC.push(temp);
  });
  return { t, tempC };
}

export async function importTemperatureLog(ds: DataSource, user: SessionUser, body: TemperatureLogImport) {
  const series = parseTemperatureText(body);
  const id = randomUUID();
  const outcome = await ds.transaction(async (em) => {
    const changes = new ChangeBuffer();
    const o = await writeRecord(em, user, { entity: 'temperatureLog', id, baseRev: null, op: 'upsert',
      fields: { siteId: body.siteId, plotId: body.plotId, depthCm: body.depthCm, source: body.source, series } }, changes);
    if (o.status === 'applied') await changes.flush(em);
    return o;
  });
  if (outcome.status !== 'applied') throw new AppError(outcome.httpStatus ?? 400, outcome.error?.message ?? 'The log was not saved', outcome.error?.fields);
  return { id, samples: series.t.length, from: series.t[0] ?? null, to: series.t.at(-1) ?? null };
}
