/** CSV per RFC 4180: comma, CRLF-free "\n" rows, fields quoted when they hold a comma, quote or line break. */
export type CsvValue = string | number | boolean | null | undefined;

function cell(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return /[",\n\r]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

export function csvLine(values: readonly CsvValue[]): string {
  return values.map(cell).join(',') + '\n';
}
