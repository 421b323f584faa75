/**
 * Temperature columns of a logger file. Many analyzers log their own internal temperatures (the
 * optical cell, a block or the electronics, often held near 50 °C) beside or instead of the
 * chamber air temperature. Taken as the chamber air, a 51 °C cell temperature against 15 °C air
 * lowers the flux by (273.15 + 15)/(273.15 + 51) − 1 = −11 % without any warning (flux ∝ 1/T).
 * The guess therefore only takes a column whose name says chamber or air; every other
 * temperature-like column is shown to the crew with its range of values to choose from.
 */
import { splitRows, type TextLayout } from './logger-text';

export type TempColumnKind = 'chamber' | 'internal' | 'unknown';

export interface TempColumn {
  column: number;
  header: string;
  kind: TempColumnKind;
  /** Range of the first rows' values (null when none is numeric). */
  min: number | null;
  max: number | null;
}

const norm = (h: string) =>
  h
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
const TEMPERATURE = /temp|^t$|^t_|_t$|_t_|°c|degc|deg_c/;
const INTERNAL =
  /cell|block|bench|optic|detector|internal|irga|analy[sz]er|sensor|board|case|box|housing|lamp|source|cpu|logger|pcb|electronics/;
const CHAMBER = /chamber|cham|air|headspace|^temp_c$/;

/** What a header says about a temperature column, or null when it is not one. */
export function temperatureKind(header: string): TempColumnKind | null {
  const h = norm(header);
  if (!TEMPERATURE.test(h)) return null;
  if (INTERNAL.test(h)) return 'internal';
  if (CHAMBER.test(h)) return 'chamber';
  return 'unknown';
}

/** The temperature-like columns of a file with the range of their values in the first rows (64 KiB). */
export function temperatureColumns(
  text: string,
  layout: Pick<TextLayout, 'delimiter' | 'decimalComma' | 'headerRow' | 'headers'>,
): TempColumn[] {
  const rows = splitRows(text.slice(0, 64 * 1024), layout.delimiter).slice(layout.headerRow + 1);
  const out: TempColumn[] = [];
  layout.headers.forEach((header, column) => {
    const kind = temperatureKind(header);
    if (!kind) return;
    let min: number | null = null;
    let max: number | null = null;
    for (const r of rows) {
      const raw = (r[column] ?? '').trim();
      const v = Number(layout.decimalComma ? raw.replace(',', '.') : raw);
      if (raw === '' || !Number.isFinite(v)) continue;
      min = min === null ? v : Math.min(min, v);
      max = max === null ? v : Math.max(max, v);
    }
    out.push({ column, header, kind, min, max });
  });
  return out;
}
