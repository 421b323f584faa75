/**
 * How the columns of a logger's text export map onto a closure series, with the unit of each
 * column. Any logger that writes delimited text works: the crew maps its columns once and the
 * mapping is kept as a preset per analyzer.
 *
 * Fluxwalk's own plain export (documented in shared/logger/README.md) uses these column names,
 * which `suggestMapping` recognises without any choice:
 *   timestamp | time_s, co2_ppm, h2o_mmol_mol, pressure_kpa, temp_c, closure_id
 */
import { temperatureKind } from './temperature-columns';
import type { TimestampFormat } from './zoned-time';

export const CO2_UNITS = { 'µmol/mol (ppm)': 1, 'mmol/mol': 1000, 'ppb (nmol/mol)': 0.001 } as const;
export const H2O_UNITS = { 'mmol/mol': 1, '% (mol/mol)': 10, 'ppm (µmol/mol)': 0.001 } as const;
export const PRESSURE_UNITS = { kPa: 1, hPa: 0.1, mbar: 0.1, Pa: 0.001, mmHg: 0.133322387415 } as const;
export const TEMP_UNITS = ['°C', 'K', '°F'] as const;
export const ELAPSED_UNITS = { s: 1, ms: 0.001, min: 60 } as const;

export type Co2Unit = keyof typeof CO2_UNITS;
export type H2oUnit = keyof typeof H2O_UNITS;
export type PressureUnit = keyof typeof PRESSURE_UNITS;
export type TempUnit = (typeof TEMP_UNITS)[number];
export type ElapsedUnit = keyof typeof ELAPSED_UNITS;

export type TimeColumn =
  { kind: 'elapsed'; column: number; unit: ElapsedUnit } | { kind: 'timestamp'; column: number; format: TimestampFormat; timeZone: string };

export interface LoggerMapping {
  delimiter: ',' | ';' | '\t';
  decimalComma: boolean;
  /** 0-based index of the header row; rows before it are the logger's preamble. */
  headerRow: number;
  time: TimeColumn;
  /**
   * `dry`: the logger already reports CO2 per mole of dry air (the analyzer corrected for water
   * vapour); the flux engine then does not apply the dilution correction a second time.
   */
  co2: { column: number; unit: Co2Unit; dry?: boolean };
  h2o: { column: number; unit: H2oUnit } | null;
  pressure: { column: number; unit: PressureUnit } | null;
  temp: { column: number; unit: TempUnit } | null;
  closureId: { column: number } | null;
  /** The header names the mapping was made for (kept with a saved mapping, so a file with other columns is not read with it). */
  headers?: string[];
}

/** Our documented names (lower case, compared after trimming). */
export const PLAIN_EXPORT_COLUMNS = {
  timestamp: 'timestamp',
  elapsed: 'time_s',
  co2: 'co2_ppm',
  h2o: 'h2o_mmol_mol',
  pressure: 'pressure_kpa',
  temp: 'temp_c',
  closureId: 'closure_id',
} as const;

const norm = (h: string) =>
  h
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');

/**
 * A first guess from the header names: our plain names exactly, else a loose reading of common
 * words (co2, h2o, press, chamber/air temperature, time). A closure id column is only guessed
 * from our own word "closure"; any other name comes from the crew's saved mapping. The crew
 * confirms or changes every column in the dialog.
 */
export function suggestMapping(
  headers: readonly string[],
  base: Pick<LoggerMapping, 'delimiter' | 'decimalComma' | 'headerRow'>,
  timeZone: string,
): LoggerMapping | null {
  const h = headers.map(norm);
  const exact = (name: string) => h.indexOf(name);
  const loose = (re: RegExp, skip: number[] = []) => h.findIndex((x, i) => re.test(x) && !skip.includes(i));
  const found = (i: number) => (i >= 0 ? i : null);
  const co2 = found(exact(PLAIN_EXPORT_COLUMNS.co2)) ?? found(loose(/co2/));
  if (co2 === null) return null;
  const stamp = found(exact(PLAIN_EXPORT_COLUMNS.timestamp)) ?? found(loose(/date|stamp|clock/));
  const elapsed = found(exact(PLAIN_EXPORT_COLUMNS.elapsed)) ?? found(loose(/^(t|time|elapsed|secs?|seconds)(_s)?$/));
  let time: TimeColumn;
  if (stamp !== null) time = { kind: 'timestamp', column: stamp, format: 'YYYY-MM-DD HH:mm:ss', timeZone };
  else if (elapsed !== null) time = { kind: 'elapsed', column: elapsed, unit: 's' };
  else return null;
  const h2o = found(exact(PLAIN_EXPORT_COLUMNS.h2o)) ?? found(loose(/h2o|water|vapou?r/));
  const pressure = found(exact(PLAIN_EXPORT_COLUMNS.pressure)) ?? found(loose(/press|^p(_kpa)?$/));
  // Only a column named as chamber or air temperature: an analyzer's internal cell temperature is
  // never taken without the crew choosing it (temperature-columns.ts).
  const temp =
    found(exact(PLAIN_EXPORT_COLUMNS.temp)) ?? found(h.findIndex((x, i) => i !== time.column && temperatureKind(x) === 'chamber'));
  const id = found(exact(PLAIN_EXPORT_COLUMNS.closureId)) ?? found(loose(/closure/));
  return {
    ...base,
    time,
    co2: { column: co2, unit: 'µmol/mol (ppm)' },
    h2o: h2o === null ? null : { column: h2o, unit: 'mmol/mol' },
    pressure: pressure === null ? null : { column: pressure, unit: 'kPa' },
    temp: temp === null ? null : { column: temp, unit: '°C' },
    closureId: id === null ? null : { column: id },
  };
}

/**
 * The mapping of a file in our plain export (every header one of our documented names): such a
 * file needs no mapping step. Any other header gets null: its columns are the crew's to confirm.
 */
export function plainExportMapping(
  headers: readonly string[],
  base: Pick<LoggerMapping, 'delimiter' | 'decimalComma' | 'headerRow'>,
  timeZone: string,
): LoggerMapping | null {
  const names: readonly string[] = Object.values(PLAIN_EXPORT_COLUMNS);
  if (!headers.length || !headers.every((h) => names.includes(norm(h)))) return null;
  const m = suggestMapping(headers, base, timeZone);
  return m && { ...m, headers: [...headers] };
}

/** Unit names earlier versions saved in mappings, and the name each has now. */
const RENAMED_H2O_UNITS: Record<string, H2oUnit> = { 'mmol/mol (ppt)': 'mmol/mol' };

/** A mapping saved on the device (a preset per analyzer), with unit names of earlier versions brought up to date. */
export function savedMapping(stored: unknown): LoggerMapping | null {
  if (!stored || typeof stored !== 'object') return null;
  const m = stored as LoggerMapping;
  const renamed = m.h2o ? RENAMED_H2O_UNITS[m.h2o.unit] : undefined;
  return renamed ? { ...m, h2o: { ...m.h2o!, unit: renamed } } : m;
}

/**
 * A saved mapping is used as it is (no mapping step) only for a file laid out the same way: same
 * delimiter and header row, and the same header names when the mapping kept them; every mapped
 * column must exist in the file.
 */
export function mappingFits(
  m: LoggerMapping | null,
  layout: Pick<LoggerMapping, 'delimiter' | 'headerRow'> & { headers: readonly string[] },
): m is LoggerMapping {
  if (!m || m.delimiter !== layout.delimiter || m.headerRow !== layout.headerRow) return false;
  if (m.headers && (m.headers.length !== layout.headers.length || m.headers.some((h, i) => h.trim() !== layout.headers[i]?.trim())))
    return false;
  const cols = [m.time.column, m.co2.column, m.h2o?.column, m.pressure?.column, m.temp?.column, m.closureId?.column].filter(
    (c): c is number => c !== undefined,
  );
  return cols.every((c) => c >= 0 && c < layout.headers.length);
}

export function tempToC(v: number, unit: TempUnit): number {
  if (unit === 'K') return v - 273.15;
  if (unit === '°F') return ((v - 32) * 5) / 9;
  return v;
}
