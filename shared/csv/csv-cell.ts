/**
 * The one rule for every CSV Fluxwalk writes (data package tables, the Board's progress CSV, any
 * CSV built on the device): RFC 4180 fields, and no text cell a spreadsheet would run as a formula.
 *
 * A spreadsheet opening a CSV runs a cell that starts with =, +, -, @, tab or carriage return as a
 * formula (=HYPERLINK, =WEBSERVICE, DDE): such a text cell gets a leading apostrophe, which
 * spreadsheets read as "this is text" (OWASP "CSV Injection"; common practice). Numbers are never
 * touched: a negative flux (-0.31), numeric or text, must stay a number that its table schema accepts.
 */
export type CsvValue = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** Text made safe to open in a spreadsheet; a plain number written as text (from a numeric column) stays as it is. */
export function neutralizeFormula(text: string): string {
  return FORMULA_START.test(text) && !PLAIN_NUMBER.test(text) ? `'${text}` : text;
}

/** One field as CSV text: empty for missing or non-finite values, quoted when it holds a comma, quote or line break. */
export function csvField(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  const safe = neutralizeFormula(v);
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** One CSV record with its line ending ("\n" for the data package's dialect, "\r\n" where RFC 4180 is followed to the letter). */
export function csvLine(values: readonly CsvValue[], newline: '\n' | '\r\n' = '\n'): string {
  return values.map(csvField).join(',') + newline;
}

/**
 * UTF-8 byte order mark: put before a CSV a person downloads to open in a spreadsheet, which
 * otherwise may read UTF-8 (µ, °, –, names with accents) in a legacy code page. Files for
 * programs (the data package) stay without it, as RFC 4180 and the Table Dialect expect.
 */
export const UTF8_BOM = '\uFEFF';
