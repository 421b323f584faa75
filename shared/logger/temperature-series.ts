/**
 * Soil-temperature logger text → a UTC series, with every unreadable line named. The same reader as
 * closure files (delimiter and decimal comma detected, header row found, wall times read in the
 * site's IANA zone with daylight-saving changes handled): the Bench previews with it and the
 * server imports with it, so what the lab sees before sending is what gets stored.
 */
import { guessLayout, splitRows } from './logger-text';
import { readTimestamp, TIMESTAMP_FORMATS, type TimestampFormat } from './zoned-time';

export interface TemperatureSeriesRequest {
  text: string;
  timeColumn: string;
  tempColumn: string;
  timeZone: string;
  timeFormat?: TimestampFormat;
}

export interface TemperatureLineProblem {
  line: number;
  message: string;
}

export interface TemperatureSeriesRead {
  t: string[];
  tempC: number[];
  format: TimestampFormat;
  problems: TemperatureLineProblem[];
  /** A named column the file does not have ('timeColumn' / 'tempColumn'), with the columns it has. */
  missingColumn: { path: 'timeColumn' | 'tempColumn'; name: string; headers: string[] } | null;
}

/** User text quoted back in a message, shortened: a hostile 900 kB cell must not come back whole. */
export const clipText = (s: string, max = 120) => (s.length > max ? `${s.slice(0, max)}… (${s.length} characters)` : s);

/** The first format that reads the first data cell: ISO with an offset wins, then local wall times. */
export function pickTimestampFormat(sample: string, timeZone: string): TimestampFormat {
  const order: TimestampFormat[] = [
    'ISO-8601 with offset',
    ...TIMESTAMP_FORMATS.filter((f) => f !== 'ISO-8601 with offset' && f !== 'Unix seconds'),
  ];
  return order.find((f) => readTimestamp(sample, f, timeZone).ok) ?? 'ISO-8601 with offset';
}

export function readTemperatureSeries(req: TemperatureSeriesRequest): TemperatureSeriesRead {
  const layout = guessLayout(req.text);
  const rows = splitRows(req.text, layout.delimiter);
  const ti = layout.headers.indexOf(req.timeColumn);
  const ci = layout.headers.indexOf(req.tempColumn);
  const empty = { t: [], tempC: [], format: req.timeFormat ?? ('ISO-8601 with offset' as TimestampFormat), problems: [] };
  if (ti < 0) return { ...empty, missingColumn: { path: 'timeColumn', name: req.timeColumn, headers: layout.headers } };
  if (ci < 0) return { ...empty, missingColumn: { path: 'tempColumn', name: req.tempColumn, headers: layout.headers } };
  const data = rows
    .map((cells, i) => ({ cells, line: i + 1 }))
    .slice(layout.headerRow + 1)
    .filter((r) => r.cells.some((c) => c.trim()));
  const format = req.timeFormat ?? pickTimestampFormat(data[0]?.cells[ti] ?? '', req.timeZone);
  const t: string[] = [];
  const tempC: number[] = [];
  const problems: TemperatureLineProblem[] = [];
  let previous: number | null = null;
  for (const { cells, line } of data) {
    const at = readTimestamp(cells[ti] ?? '', format, req.timeZone, previous);
    const raw = (cells[ci] ?? '').trim();
    const temp = Number(layout.decimalComma ? raw.replace(',', '.') : raw);
    if (!at.ok) problems.push({ line, message: clipText(at.message, 300) });
    else if (raw === '' || !Number.isFinite(temp)) problems.push({ line, message: `"${clipText(raw)}" is not a temperature` });
    else {
      previous = at.ms;
      t.push(new Date(at.ms).toISOString());
      tempC.push(temp);
    }
  }
  return { t, tempC, format, problems, missingColumn: null };
}
