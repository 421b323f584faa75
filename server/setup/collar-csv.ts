import { z } from 'zod';
import { collarFields } from '../../shared/model/field-records';
import type { EntityFields } from '../../shared/model/entities';
import { parseBoundedCsv } from './csv-bounds';

/** What a collar CSV column can mean; `unit` is the only unit the import accepts for it. */
export const IMPORT_TARGETS = {
  code: { label: 'Collar code', unit: null, required: true },
  plot: { label: 'Plot code', unit: null, required: true },
  treatment: { label: 'Treatment code (collar level)', unit: null, required: false },
  latitude: { label: 'Latitude', unit: '°', required: false },
  longitude: { label: 'Longitude', unit: '°', required: false },
  shape: { label: 'Shape (round or rectangular)', unit: null, required: false },
  diameterCm: { label: 'Inner diameter', unit: 'cm', required: false },
  sideACm: { label: 'Side A', unit: 'cm', required: false },
  sideBCm: { label: 'Side B', unit: 'cm', required: false },
  heightCm: { label: 'Height', unit: 'cm', required: false },
  insertionCm: { label: 'Insertion depth', unit: 'cm', required: false },
  installedOn: { label: 'Install date (YYYY-MM-DD)', unit: null, required: false },
  notes: { label: 'Notes', unit: null, required: false },
} as const;
export type ImportTarget = keyof typeof IMPORT_TARGETS;
const TARGETS = Object.keys(IMPORT_TARGETS) as ImportTarget[];
const NUMERIC = [
  'latitude',
  'longitude',
  'diameterCm',
  'sideACm',
  'sideBCm',
  'heightCm',
  'insertionCm',
] as const satisfies readonly ImportTarget[];

/** A CSV row as collar input before the shared schema checks it: each cell in its field, still unchecked. */
type CollarCsvInput = {
  siteId: string;
  code: string;
  plotId?: string;
  treatmentId?: string;
  shape?: string;
  installedOn?: string;
  notes?: string;
} & Partial<Record<(typeof NUMERIC)[number], number>>;

/** A spreadsheet export of a few thousand collars is far below this; anything larger is refused, not truncated. */
export const MAX_CSV_BYTES = 512 * 1024;
export const MAX_CSV_ROWS = 5000;
/** Bounds on the parts of a file, so a hostile file costs little; the longest collar field (notes) is 4000 characters. */
export const MAX_COLUMNS = 100;
export const MAX_HEADER_CHARS = 200;
export const MAX_CELL_CHARS = 4000;
/** Structural errors listed one by one; more are counted in one last line. */
export const MAX_FILE_ERRORS = 50;

export const importRequestSchema = z.object({
  csv: z
    .string({ message: 'Send the CSV text in "csv"' })
    .min(1, 'The file is empty')
    .refine(
      (s) => Buffer.byteLength(s, 'utf8') <= MAX_CSV_BYTES,
      `The file is larger than ${MAX_CSV_BYTES / 1024} KiB; split it into smaller files`,
    ),
  /** target → CSV header; a target left out is guessed from the headers. */
  mapping: z
    .record(z.string(), z.string().max(200))
    .default({})
    .superRefine((m, ctx) => {
      for (const k of Object.keys(m)) {
        if (!(TARGETS as string[]).includes(k))
          ctx.addIssue({ code: 'custom', path: [k], message: `Unknown import field "${k}" (known: ${TARGETS.join(', ')})` });
      }
    })
    .transform((m) => m as Partial<Record<ImportTarget, string>>),
});
export type ImportRequest = z.infer<typeof importRequestSchema>;

export interface CellError {
  row: number;
  column: string;
  message: string;
}

export interface ParsedTable {
  headers: string[];
  rows: { row: number; cells: Record<string, string> }[];
}

const UNIT_WORDS: Record<string, string> = { mm: 'mm', cm: 'cm', m: 'm', in: 'in', inch: 'in', inches: 'in', ft: 'ft', deg: '°', '°': '°' };

/**
 * Parses the CSV text; a structural problem (unbalanced quotes, ragged rows) names its row. A
 * file beyond the size bounds is refused whole (400 naming the bound) before any header is read.
 */
export function parseCsv(text: string): { table: ParsedTable; errors: CellError[] } {
  const res = parseBoundedCsv(text.replace(/^\uFEFF/, ''), {
    maxRows: MAX_CSV_ROWS,
    maxColumns: MAX_COLUMNS,
    maxHeaderChars: MAX_HEADER_CHARS,
    maxCellChars: MAX_CELL_CHARS,
  });
  const errors: CellError[] = res.errors
    .slice(0, MAX_FILE_ERRORS)
    .map((e) => ({ row: (e.row ?? 0) + 1, column: '(file)', message: `Malformed CSV: ${e.message}` }));
  if (res.errors.length > MAX_FILE_ERRORS) {
    errors.push({
      row: (res.errors[MAX_FILE_ERRORS]!.row ?? 0) + 1,
      column: '(file)',
      message: `…and ${res.errors.length - MAX_FILE_ERRORS} more structural errors`,
    });
  }
  const [head, ...body] = res.data;
  if (!head || head.every((h) => !h.trim()))
    return { table: { headers: [], rows: [] }, errors: [{ row: 1, column: '(file)', message: 'The file has no header row' }] };
  const headers = head.map((h) => h.trim());
  const seenHeaders = new Set<string>();
  let dup: string | undefined;
  for (const h of headers) {
    if (h && seenHeaders.has(h)) {
      dup = h;
      break;
    }
    seenHeaders.add(h);
  }
  if (dup) errors.push({ row: 1, column: dup, message: `The column "${dup}" appears twice` });
  const rows = body.map((cells, i) => {
    const row = i + 2; // the header is row 1, as a spreadsheet numbers it
    if (cells.length !== headers.length) {
      errors.push({ row, column: '(file)', message: `Row has ${cells.length} cells but the header has ${headers.length}` });
    }
    return { row, cells: Object.fromEntries(headers.map((h, j) => [h, (cells[j] ?? '').trim()])) };
  });
  return { table: { headers, rows }, errors };
}

/**
 * A header reduced for guessing: lower-case letters only, a bracketed part ("(cm)", "[mm]")
 * left out. One pass: the position of the next closing bracket is looked up only after the scan
 * has passed the previous one, so a header of many "(" costs linear time (a lazy regular
 * expression for the brackets rescanned the rest of the header from every "(").
 */
function norm(s: string): string {
  const t = s.toLowerCase();
  const next: Record<string, number> = { ')': -2, ']': -2 }; // -2: not looked up yet; -1: none left
  let out = '';
  for (let i = 0; i < t.length; i++) {
    const c = t[i]!;
    if (c === '(' || c === '[') {
      const closer = c === '(' ? ')' : ']';
      if (next[closer] !== -1 && next[closer]! < i) next[closer] = t.indexOf(closer, i);
      if (next[closer] !== -1) i = next[closer]!;
    } else if (c >= 'a' && c <= 'z') out += c;
  }
  return out;
}
const GUESSES: Record<ImportTarget, string[]> = {
  code: ['code', 'collar', 'collarcode', 'collarid', 'id', 'name'],
  plot: ['plot', 'plotcode', 'plotid'],
  treatment: ['treatment', 'treatmentcode'],
  latitude: ['lat', 'latitude'],
  longitude: ['lon', 'lng', 'long', 'longitude'],
  shape: ['shape'],
  diameterCm: ['diameter', 'diametercm', 'dia', 'innerdiameter'],
  sideACm: ['sidea', 'sideacm', 'length'],
  sideBCm: ['sideb', 'sidebcm', 'width'],
  heightCm: ['height', 'heightcm'],
  insertionCm: ['insertion', 'insertioncm', 'depth', 'insertiondepth'],
  installedOn: ['installed', 'installedon', 'installdate', 'date'],
  notes: ['notes', 'note', 'comment', 'comments'],
};

/** The mapping to use: the one sent, completed by guesses from header names. */
export function resolveMapping(headers: string[], sent: Partial<Record<ImportTarget, string>>): Partial<Record<ImportTarget, string>> {
  const out: Partial<Record<ImportTarget, string>> = {};
  const taken = new Set<string>();
  for (const t of TARGETS) {
    const h = sent[t];
    if (h !== undefined && h !== '') {
      out[t] = h;
      taken.add(h);
    }
  }
  for (const t of TARGETS) {
    if (t in sent) continue;
    // Strip a trailing unit word (diameter_cm → diameter) before comparing.
    const h = headers.find((x) => !taken.has(x) && GUESSES[t].includes(norm(x.replace(/[_\s-]?(cm|mm|m|in|deg)$/i, ''))));
    if (h) {
      out[t] = h;
      taken.add(h);
    }
  }
  return out;
}

/** The unit a header declares: "Diameter (mm)", "height_in", "diameter [cm]". */
export function headerUnit(header: string): string | null {
  const m = /[([]\s*([a-z°]+)\s*[)\]]\s*$/i.exec(header) ?? /[_\s-](mm|cm|m|in|inch|inches|ft|deg)$/i.exec(header);
  return m ? (UNIT_WORDS[m[1]!.toLowerCase()] ?? m[1]!.toLowerCase()) : null;
}

/** Mapping problems that concern every row: missing required columns, unknown headers, wrong units. */
export function mappingErrors(headers: string[], mapping: Partial<Record<ImportTarget, string>>): CellError[] {
  const errors: CellError[] = [];
  for (const t of TARGETS) {
    const spec = IMPORT_TARGETS[t];
    const h = mapping[t];
    if (!h) {
      if (spec.required) errors.push({ row: 1, column: spec.label, message: `No column is mapped to ${spec.label}` });
      continue;
    }
    if (!headers.includes(h)) {
      errors.push({ row: 1, column: h, message: `The file has no column "${h}"` });
      continue;
    }
    const unit = headerUnit(h);
    if (spec.unit && unit && unit !== spec.unit) {
      errors.push({
        row: 1,
        column: h,
        message: `${spec.label} is given in ${unit}; the import takes ${spec.unit} (convert the column first)`,
      });
    }
  }
  return errors;
}

/** A number cell: plain decimal (a trailing unit is accepted only when it is the expected one). */
function numberCell(raw: string, t: ImportTarget): { value: number | null; error?: string } {
  if (raw === '') return { value: null };
  const spec = IMPORT_TARGETS[t];
  const m = /^(-?\d+(?:\.\d+)?)\s*([a-z°]*)$/i.exec(raw.replace(/^\+/, ''));
  if (!m) {
    const hint = /^-?\d+,\d+$/.test(raw) ? ' (use a point as the decimal separator)' : '';
    return { value: null, error: `"${raw}" is not a number${hint}` };
  }
  const unit = m[2] ? (UNIT_WORDS[m[2].toLowerCase()] ?? m[2]) : null;
  if (unit && unit !== spec.unit) return { value: null, error: `"${raw}" is in ${unit}; ${spec.label} must be in ${spec.unit}` };
  return { value: Number(m[1]) };
}

export interface LookupCodes {
  plots: Map<string, string>;
  collarTreatments: Map<string, string>;
  existingCollarCodes: Set<string>;
}

export interface RowResult {
  row: number;
  cells: Record<string, string>;
  fields: EntityFields<'collar'> | null;
  errors: CellError[];
}

/** Turns one CSV row into collar fields validated with the shared collar schema; errors name row and column. */
export function rowToCollar(
  siteId: string,
  r: ParsedTable['rows'][number],
  mapping: Partial<Record<ImportTarget, string>>,
  codes: LookupCodes,
  seen: Map<string, number>,
): RowResult {
  const errors: CellError[] = [];
  const col = (t: ImportTarget) => mapping[t] ?? IMPORT_TARGETS[t].label;
  const cell = (t: ImportTarget) => (mapping[t] ? (r.cells[mapping[t]!] ?? '') : '');
  const code = cell('code');
  const fields: CollarCsvInput = { siteId, code };
  if (code && codes.existingCollarCodes.has(code.toLowerCase()))
    errors.push({ row: r.row, column: col('code'), message: `A collar ${code} exists at this site already` });
  const first = seen.get(code.toLowerCase());
  if (code && first !== undefined)
    errors.push({ row: r.row, column: col('code'), message: `Collar ${code} appears twice in the file (also row ${first})` });
  else if (code) seen.set(code.toLowerCase(), r.row);
  const plot = cell('plot');
  if (plot) {
    const id = codes.plots.get(plot.toLowerCase());
    if (id) fields.plotId = id;
    else errors.push({ row: r.row, column: col('plot'), message: `No plot "${plot}" at this site` });
  } else errors.push({ row: r.row, column: col('plot'), message: 'Give the plot code' });
  const treatment = cell('treatment');
  if (treatment) {
    const id = codes.collarTreatments.get(treatment.toLowerCase());
    if (id) fields.treatmentId = id;
    else errors.push({ row: r.row, column: col('treatment'), message: `No collar-level treatment "${treatment}" at this site` });
  }
  for (const t of NUMERIC) {
    const { value, error } = numberCell(cell(t), t);
    if (error) errors.push({ row: r.row, column: col(t), message: error });
    else if (value !== null) fields[t] = value;
  }
  const shape = cell('shape').toLowerCase();
  if (shape) fields.shape = shape;
  const installed = cell('installedOn');
  if (installed && !isCalendarDate(installed))
    errors.push({ row: r.row, column: col('installedOn'), message: `"${installed}" is not a date YYYY-MM-DD` });
  else if (installed) fields.installedOn = installed;
  if (cell('notes')) fields.notes = cell('notes');
  const parsed = collarFields.safeParse(fields);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? '');
      if (key === 'plotId' && !plot) continue; // already reported in words
      if (key === 'plotId' || errors.some((e) => e.column === col(key as ImportTarget))) continue;
      errors.push({ row: r.row, column: targetColumn(key, col), message: issue.message });
    }
  }
  return { row: r.row, cells: r.cells, fields: errors.length || !parsed.success ? null : parsed.data, errors };
}

function isCalendarDate(s: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

function targetColumn(key: string, col: (t: ImportTarget) => string): string {
  if (key === 'plotId') return col('plot');
  if (key === 'treatmentId') return col('treatment');
  return (TARGETS as string[]).includes(key) ? col(key as ImportTarget) : key;
}
