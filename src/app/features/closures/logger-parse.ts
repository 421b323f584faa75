import Papa from 'papaparse';
import { readLoggerRows, type LoggerMapping, type LoggerRead } from '../../../../shared/logger';

/** Messages between the import dialog and the parsing worker. */
export type ParseRequest = { text: string; mapping: LoggerMapping };
export type ParseMessage = { type: 'progress'; fraction: number } | { type: 'done'; read: LoggerRead } | { type: 'error'; message: string };

/**
 * Parses a whole logger text with papaparse in chunks (progress after each), then reads the rows
 * with the shared mapping. Blank lines are kept as rows so a row's index + 1 is its line number.
 */
export function parseLoggerText(text: string, mapping: LoggerMapping, progress: (fraction: number) => void = () => undefined): LoggerRead {
  const rows: string[][] = [];
  Papa.parse<string[]>(text, {
    delimiter: mapping.delimiter,
    skipEmptyLines: false,
    chunkSize: 256 * 1024,
    chunk: (res: { data: string[][]; meta: { cursor: number } }) => {
      for (const r of res.data) rows.push(r);
      progress(Math.min(1, res.meta.cursor / Math.max(1, text.length)));
    },
    // A string input is parsed synchronously, chunk by chunk; nothing is left to do at the end.
    complete: () => undefined,
  });
  progress(1);
  return readLoggerRows(rows, mapping);
}
