import Papa from 'papaparse';
import { badRequest } from '../core/errors';

/** Bounds on the parts of an uploaded CSV; anything beyond is refused whole with a 400 naming the bound. */
export interface CsvBounds {
  maxRows: number;
  maxColumns: number;
  maxHeaderChars: number;
  maxCellChars: number;
}

const shown = (s: string) => (s.length > 40 ? `${s.slice(0, 40)}…` : s);

/**
 * Parses a CSV only once it is known to be within the bounds. The parser costs about a
 * microsecond a byte and far more on broken quoting (an error object per stray quote), so a
 * hostile file is first measured in one cheap pass over the raw text: row count, header width,
 * field lengths. Raw lengths include quotes (an escaped quote counts twice), so the first pass
 * refuses only fields over twice the bound and the parsed cells are checked exactly after.
 */
export function parseBoundedCsv(text: string, b: CsvBounds): Papa.ParseResult<string[]> {
  // The delimiter as the parser guesses it from the first few kilobytes (cheap whatever follows).
  const delimiter = Papa.parse<string[]>(text.slice(0, 8 * 1024), { preview: 10, skipEmptyLines: 'greedy' }).meta.delimiter || ',';
  measureRaw(text, delimiter, b);
  const res = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: 'greedy' });
  checkParsed(res.data, b);
  return res;
}

function measureRaw(text: string, delimiter: string, b: CsvBounds): void {
  const n = text.length;
  let i = 0;
  let fields = 0;
  let hasText = false;
  let records = 0; // records with text, as the parser keeps them (blank lines skipped)
  while (i <= n) {
    const start = i;
    if (text[i] === '"') {
      i = endOfQuoted(text, i, delimiter);
      if (!hasText && text.slice(start + 1, i - 1).trim()) hasText = true;
    } else {
      while (i < n && text[i] !== delimiter && text[i] !== '\n' && text[i] !== '\r') {
        if (!hasText && text[i]!.trim()) hasText = true;
        i++;
      }
    }
    fields++;
    const header = records === 0;
    if (header && i - start > 2 * b.maxHeaderChars + 2) {
      throw badRequest(`Column header ${fields} ("${shown(text.slice(start, i))}") is longer than ${b.maxHeaderChars} characters`);
    }
    if (i - start > 2 * b.maxCellChars + 2) throw badRequest(`Row ${records + 1}: a cell is longer than ${b.maxCellChars} characters`);
    if (i < n && text[i] === delimiter) {
      i++;
      continue;
    }
    // End of a record: a line break (\r\n, \n or \r) or the end of the text.
    if (hasText && records === 0 && fields > b.maxColumns) tooManyColumns(b, fields);
    if (hasText) records++;
    if (records > b.maxRows + 1)
      throw badRequest(`The file has more than ${b.maxRows} collar rows; split it into files of at most ${b.maxRows}`);
    fields = 0;
    hasText = false;
    if (i >= n) break;
    i += text[i] === '\r' && text[i + 1] === '\n' ? 2 : 1;
  }
}

/**
 * The end of a quoted field: a quote followed by the delimiter, a line break or the end. A quote
 * followed by anything else is a stray quote; the parser keeps reading the field, and so does this.
 */
function endOfQuoted(text: string, open: number, delimiter: string): number {
  let j = open + 1;
  for (;;) {
    const q = text.indexOf('"', j);
    if (q < 0) return text.length;
    const after = text[q + 1];
    if (after === '"') {
      j = q + 2;
      continue;
    }
    if (after === undefined || after === delimiter || after === '\n' || after === '\r') return q + 1;
    j = q + 1;
  }
}

function tooManyColumns(b: CsvBounds, count: number): never {
  throw badRequest(`The file has more than ${b.maxColumns} columns (${count}); keep the collar columns and remove the rest`);
}

function checkParsed(rows: string[][], b: CsvBounds): void {
  const head = rows[0] ?? [];
  if (head.length > b.maxColumns) tooManyColumns(b, head.length);
  const long = head.findIndex((h) => h.length > b.maxHeaderChars);
  if (long >= 0) throw badRequest(`Column header ${long + 1} ("${shown(head[long]!)}") is longer than ${b.maxHeaderChars} characters`);
  if (rows.length > b.maxRows + 1)
    throw badRequest(`The file has more than ${b.maxRows} collar rows; split it into files of at most ${b.maxRows}`);
  for (let r = 1; r < rows.length; r++) {
    const c = rows[r]!.findIndex((cell) => cell.length > b.maxCellChars);
    if (c >= 0)
      throw badRequest(`Row ${r + 1}, column "${shown(head[c] ?? String(c + 1))}": the cell is longer than ${b.maxCellChars} characters`);
  }
}
