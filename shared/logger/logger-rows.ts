/**
 * Rows of a logger file → samples in SI-ish units of the closure series (ppm, mmol/mol, kPa, °C).
 * A row that cannot be read is reported with its line number and left out; every other row is kept.
 */
import { CO2_UNITS, ELAPSED_UNITS, H2O_UNITS, PRESSURE_UNITS, tempToC, type LoggerMapping } from './logger-mapping';
import { readTimestamp } from './zoned-time';

export interface LoggerSample {
  /** 1-based line of the file. */
  line: number;
  /** Absolute time (UTC ms by the logger's clock) for timestamp files; null for elapsed-time files. */
  atMs: number | null;
  /** Elapsed seconds as written, for elapsed-time files; null for timestamp files. */
  elapsedS: number | null;
  co2Ppm: number;
  h2oMmolMol: number | null;
  pressureKpa: number | null;
  tempC: number | null;
  closureId: string | null;
}

export interface LineProblem {
  line: number;
  message: string;
}

export interface LoggerRead {
  samples: LoggerSample[];
  problems: LineProblem[];
  headers: string[];
}

export function readNumber(cell: string | undefined, decimalComma: boolean): number | null {
  if (cell === undefined) return null;
  let v = cell.trim();
  if (!v) return null;
  if (decimalComma) v = v.replace(',', '.');
  // One way to match each digit (\d+\.?\d* splits a digit run in n ways and backtracks quadratically).
  if (!/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(v)) return NaN;
  return Number(v);
}

class RowError extends Error {}

/**
 * Reads data rows after the header. `rows` are the file's lines split into cells, one per line
 * (`firstLine` is the line number of rows[0]); blank lines are skipped without a report.
 */
export function readLoggerRows(rows: readonly string[][], m: LoggerMapping, firstLine = 1): LoggerRead {
  const headers = (rows[m.headerRow] ?? []).map((h) => h.trim());
  const samples: LoggerSample[] = [];
  const problems: LineProblem[] = [];
  const width = headers.length;
  let previousMs: number | null = null;
  const num = (row: readonly string[], col: number, what: string, required: boolean): number | null => {
    const v = readNumber(row[col], m.decimalComma);
    if (v === null) {
      if (required) throw new RowError(`${what} is empty`);
      return null;
    }
    if (Number.isNaN(v)) throw new RowError(`${what} "${row[col]}" is not a number`);
    return v;
  };
  for (let i = m.headerRow + 1; i < rows.length; i++) {
    const row = rows[i];
    const line = firstLine + i;
    if (row.every((c) => !c.trim())) continue;
    try {
      if (row.length < width) throw new RowError(`has ${row.length} cells, the header has ${width}`);
      let atMs: number | null = null;
      let elapsedS: number | null = null;
      if (m.time.kind === 'timestamp') {
        const t = readTimestamp(row[m.time.column] ?? '', m.time.format, m.time.timeZone, previousMs);
        if (!t.ok) throw new RowError(t.message);
        atMs = t.ms;
      } else {
        elapsedS = num(row, m.time.column, 'Time', true)! * ELAPSED_UNITS[m.time.unit];
      }
      const co2 = num(row, m.co2.column, 'CO2', true)! * CO2_UNITS[m.co2.unit];
      const h2o = m.h2o ? num(row, m.h2o.column, 'H2O', false) : null;
      const p = m.pressure ? num(row, m.pressure.column, 'Pressure', false) : null;
      const t = m.temp ? num(row, m.temp.column, 'Temperature', false) : null;
      const id = m.closureId ? (row[m.closureId.column] ?? '').trim() : '';
      samples.push({
        line,
        atMs,
        elapsedS,
        co2Ppm: co2,
        h2oMmolMol: h2o === null || !m.h2o ? null : h2o * H2O_UNITS[m.h2o.unit],
        pressureKpa: p === null || !m.pressure ? null : p * PRESSURE_UNITS[m.pressure.unit],
        tempC: t === null || !m.temp ? null : tempToC(t, m.temp.unit),
        closureId: id || null,
      });
      if (atMs !== null) previousMs = atMs;
    } catch (err) {
      if (!(err instanceof RowError)) throw err;
      problems.push({ line, message: `Line ${line}: ${err.message}` });
    }
  }
  return { samples, problems, headers };
}
