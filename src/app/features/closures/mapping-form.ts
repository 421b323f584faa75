import { FormControl, FormGroup } from '@angular/forms';
import type {
  Co2Unit,
  ElapsedUnit,
  H2oUnit,
  LoggerMapping,
  PressureUnit,
  TempUnit,
  TimeColumn,
  TimestampFormat,
} from '../../../../shared/logger';

/** The timestamp format offered first when the crew says the time column is a timestamp. */
export const FIRST_TIMESTAMP_FORMAT: TimestampFormat = 'YYYY-MM-DD HH:mm:ss';

/** A column choice: its index in the header, -1 for "not in this file". */
const column = (v = -1) => new FormControl(v, { nonNullable: true });
const choice = <T>(v: T) => new FormControl<T>(v, { nonNullable: true });

/** The column mapping as a typed form: one control per choice in the dialog. */
export function mappingForm() {
  return new FormGroup({
    timeColumn: column(0),
    timeKind: choice<TimeColumn['kind']>('elapsed'),
    format: choice<TimestampFormat>(FIRST_TIMESTAMP_FORMAT),
    timeZone: choice('UTC'),
    elapsedUnit: choice<ElapsedUnit>('s'),
    co2Column: column(0),
    co2Unit: choice<Co2Unit>('µmol/mol (ppm)'),
    co2Dry: choice(false),
    h2oColumn: column(),
    h2oUnit: choice<H2oUnit>('mmol/mol'),
    pressureColumn: column(),
    pressureUnit: choice<PressureUnit>('kPa'),
    tempColumn: column(),
    tempUnit: choice<TempUnit>('°C'),
    closureIdColumn: column(),
  });
}
export type MappingForm = ReturnType<typeof mappingForm>;
export type MappingValue = ReturnType<MappingForm['getRawValue']>;

/** The form showing a mapping (a saved preset or a guess); a timestamp's zone is the site's unless the mapping names one. */
export function mappingValue(m: LoggerMapping, siteZone: string): MappingValue {
  return {
    timeColumn: m.time.column,
    timeKind: m.time.kind,
    format: m.time.kind === 'timestamp' ? m.time.format : FIRST_TIMESTAMP_FORMAT,
    timeZone: m.time.kind === 'timestamp' ? m.time.timeZone : siteZone,
    elapsedUnit: m.time.kind === 'elapsed' ? m.time.unit : 's',
    co2Column: m.co2.column,
    co2Unit: m.co2.unit,
    co2Dry: m.co2.dry ?? false,
    h2oColumn: m.h2o?.column ?? -1,
    h2oUnit: m.h2o?.unit ?? 'mmol/mol',
    pressureColumn: m.pressure?.column ?? -1,
    pressureUnit: m.pressure?.unit ?? 'kPa',
    tempColumn: m.temp?.column ?? -1,
    tempUnit: m.temp?.unit ?? '°C',
    closureIdColumn: m.closureId?.column ?? -1,
  };
}

/** The mapping the form says, on the file's layout (delimiter, decimal mark, header row) and for its header names. */
export function mappingOf(
  v: MappingValue,
  layout: Pick<LoggerMapping, 'delimiter' | 'decimalComma' | 'headerRow'>,
  headers: readonly string[],
): LoggerMapping {
  const optional = <U>(col: number, unit: U) => (col < 0 ? null : { column: col, unit });
  return {
    delimiter: layout.delimiter,
    decimalComma: layout.decimalComma,
    headerRow: layout.headerRow,
    time:
      v.timeKind === 'elapsed'
        ? { kind: 'elapsed', column: v.timeColumn, unit: v.elapsedUnit }
        : { kind: 'timestamp', column: v.timeColumn, format: v.format, timeZone: v.timeZone },
    co2: { column: v.co2Column, unit: v.co2Unit, ...(v.co2Dry ? { dry: true } : {}) },
    h2o: optional(v.h2oColumn, v.h2oUnit),
    pressure: optional(v.pressureColumn, v.pressureUnit),
    temp: optional(v.tempColumn, v.tempUnit),
    closureId: v.closureIdColumn < 0 ? null : { column: v.closureIdColumn },
    headers: [...headers],
  };
}
