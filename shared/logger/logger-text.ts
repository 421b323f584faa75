/**
 * A whole logger text → layout guess and rows. The device parses big files with papaparse in a
 * Web Worker (src/app/features/closures); this plain splitter serves previews, the CLI and tests,
 * and agrees with it on files without quoted delimiters (logger exports do not quote numbers).
 */
import { detectDecimalComma, detectDelimiter, findHeaderRow, headLines, splitLine } from './text-layout';
import type { LoggerMapping } from './logger-mapping';

export interface TextLayout {
  delimiter: LoggerMapping['delimiter'];
  decimalComma: boolean;
  headerRow: number;
  headers: string[];
  /** A few data rows after the header, for the mapping dialog's preview. */
  preview: string[][];
}

/** Every line of the text split into cells (blank lines kept, so row index + 1 = line number). */
export function splitRows(text: string, delimiter: string): string[][] {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r?\n/);
  if (lines.length && lines[lines.length - 1] === '') lines.pop();
  return lines.map((l) => splitLine(l, delimiter));
}

/** The layout of a file judged from its first lines. Header row counts from the first line of the file. */
export function guessLayout(text: string): TextLayout {
  const delimiter = detectDelimiter(headLines(text));
  const head = splitRows(text.slice(0, 64 * 1024), delimiter);
  const headerRow = findHeaderRow(head);
  const preview = head.slice(headerRow + 1, headerRow + 9).filter((r) => r.some((c) => c.trim()));
  return {
    delimiter,
    decimalComma: detectDecimalComma(preview, delimiter),
    headerRow,
    headers: (head[headerRow] ?? []).map((h) => h.trim()),
    preview,
  };
}
