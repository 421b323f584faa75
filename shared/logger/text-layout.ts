/**
 * The layout of a delimited text file seen from its first lines: the delimiter, whether numbers
 * use a decimal comma, and where the header row is (loggers often write a preamble first).
 */
import type { LoggerMapping } from './logger-mapping';

const DELIMITERS = ['\t', ';', ','] as const;

/** First non-empty lines of a text (enough to judge its layout). */
export function headLines(text: string, max = 40): string[] {
  const out: string[] = [];
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0; // byte-order mark
  while (out.length < max && start < text.length) {
    let end = text.indexOf('\n', start);
    if (end < 0) end = text.length;
    const line = text.slice(start, end).replace(/\r$/, '');
    if (line.trim()) out.push(line);
    start = end + 1;
  }
  return out;
}

/**
 * The delimiter whose count per line is most consistent (and at least 1). Tab and semicolon win
 * ties over comma, because a semicolon file with decimal commas also has a steady comma count.
 */
export function detectDelimiter(lines: readonly string[]): LoggerMapping['delimiter'] {
  let best: { d: LoggerMapping['delimiter']; score: number } = { d: ',', score: -1 };
  for (const d of DELIMITERS) {
    const counts = lines.map((l) => l.split(d).length - 1);
    const freq = new Map<number, number>();
    for (const c of counts) if (c > 0) freq.set(c, (freq.get(c) ?? 0) + 1);
    const modal = Math.max(0, ...freq.values());
    const score = lines.length ? modal / lines.length : 0;
    if (score > best.score + 1e-9) best = { d, score };
  }
  return best.d;
}

const COMMA_NUMBER = /^[+-]?\d+,\d+$/;
const DOT_NUMBER = /^[+-]?\d+\.\d+$/;

/** Decimal comma when numeric cells look like 412,5 and none like 412.5 (never with a comma delimiter). */
export function detectDecimalComma(rows: readonly string[][], delimiter: LoggerMapping['delimiter']): boolean {
  if (delimiter === ',') return false;
  let comma = 0;
  let dot = 0;
  for (const r of rows) {
    for (const c of r) {
      const v = c.trim();
      if (COMMA_NUMBER.test(v)) comma++;
      else if (DOT_NUMBER.test(v)) dot++;
    }
  }
  return comma > 0 && comma >= dot;
}

const isNumberish = (v: string) => /^[+-]?[\d.,:/ TZ-]+$/.test(v.trim()) && /\d/.test(v);

/**
 * The header row: the first row with the file's usual number of cells where most cells are words
 * (not numbers or times). Preamble lines before it have fewer cells or are not labels.
 */
export function findHeaderRow(rows: readonly string[][]): number {
  const freq = new Map<number, number>();
  for (const r of rows) freq.set(r.length, (freq.get(r.length) ?? 0) + 1);
  const width = [...freq.entries()].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]?.[0] ?? 0;
  const i = rows.findIndex((r) => r.length === width && r.filter((c) => c.trim() && !isNumberish(c)).length >= Math.ceil(width / 2));
  return Math.max(0, i);
}

/** Splits one line (no quoting: logger text exports do not quote numbers) — for previews. */
export function splitLine(line: string, delimiter: string): string[] {
  return line.split(delimiter).map((c) => c.replace(/^"(.*)"$/, '$1'));
}
