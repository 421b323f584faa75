/**
 * Soil-temperature logger files into temperature logs (one plot, one depth). The file goes through
 * the same reader as closure files (shared/logger: delimiter and decimal comma detected, header row
 * found, times read in the site's IANA zone with daylight-saving changes handled); here only the
 * time and temperature columns are picked, by header name.
 */
import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { SessionUser } from '../../shared/auth/roles';
import { guessLayout, readTimestamp, splitRows, TIMESTAMP_FORMATS, type TimestampFormat } from '../../shared/logger';
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
  /** Local wall time as the logger writes it, or ISO-8601 with an offset. */
  timeFormat: z.enum(TIMESTAMP_FORMATS).optional(),
});
export type TemperatureLogImport = z.infer<typeof temperatureLogImportSchema>;

/** The first format that reads the first data cell: ISO with an offset wins, then local wall times. */
function pickFormat(sample: string, timeZone: string): TimestampFormat {
  const order: TimestampFormat[] = ['ISO-8601 with offset', ...TIMESTAMP_FORMATS.filter((f) => f !== 'ISO-8601 with offset' && f !== 'Unix seconds')];
  return order.find((f) => readTimestamp(sample, f, timeZone).ok) ?? 'ISO-8601 with offset';
}

/** User text quoted back in a refusal, shortened: a hostile 900 kB cell must not come back whole. */
const clip = (s: string, max = 120) => (s.length > max ? `${s.slice(0, max)}… (${s.length} characters)` : s);

export function parseTemperatureText(body: Pick<TemperatureLogImport, 'text' | 'timeColumn' | 'tempColumn' | 'timeZone' | 'timeFormat'>): { t: string[]; tempC: number[] } {
  const layout = guessLayout(body.text);
  const rows = splitRows(body.text, layout.delimiter);
  const col = (name: string, path: string) => {
    const i = layout.headers.indexOf(name);
    if (i < 0) throw badRequest(`The file has no column "${clip(name)}"`, [{ path, message: clip(`Columns: ${layout.headers.map((h) => clip(h, 40)).join(', ')}`, 600) }]);
    return i;
  };
  const ti = col(body.timeColumn, 'timeColumn');
  const ci = col(body.tempColumn, 'tempColumn');
  const data = rows.map((cells, i) => ({ cells, line: i + 1 })).slice(layout.headerRow + 1).filter((r) => r.cells.some((c) => c.trim()));
  const format = body.timeFormat ?? pickFormat(data[0]?.cells[ti] ?? '', body.timeZone);
  const t: string[] = [];
  const tempC: number[] = [];
  const problems: { path: string; message: string }[] = [];
  let previous: number | null = null;
  for (const { cells, line } of data) {
    const at = readTimestamp(cells[ti] ?? '', format, body.timeZone, previous);
    const raw = (cells[ci] ?? '').trim();
    const temp = Number(layout.decimalComma ? raw.replace(',', '.') : raw);
    if (!at.ok) problems.push({ path: 'text', message: `Line ${line}: ${clip(at.message, 300)}` });
    else if (raw === '' || !Number.isFinite(temp)) problems.push({ path: 'text', message: `Line ${line}: "${clip(raw)}" is not a temperature` });
    else {
      previous = at.ms;
      t.push(new Date(at.ms).toISOString());
      tempC.push(temp);
    }
  }
  // A temperature log feeds seasonal totals: all of it or nothing, with every bad line named.
  if (problems.length) throw badRequest(`${problems.length} line(s) could not be read; nothing was imported`, problems.slice(0, 50));
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
