/** One editable column of a record table. */
export type ColumnDef =
  | { key: string; label: string; kind: 'text' | 'date'; optional?: boolean }
  | { key: string; label: string; kind: 'number'; unit?: string; optional?: boolean }
  | { key: string; label: string; kind: 'select'; options: () => { value: string | null; label: string }[] };

/** Form strings to wire values: numbers as numbers, empty optional fields as null, selects as chosen. */
export function toFields(columns: ColumnDef[], draft: Partial<Record<string, string>>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const c of columns) {
    if (!(c.key in draft)) continue;
    const raw = draft[c.key] ?? '';
    if (c.kind === 'number') out[c.key] = raw.trim() === '' ? (c.optional ? null : undefined) : Number(raw);
    else if (c.kind === 'select') out[c.key] = raw === '' ? null : raw;
    else out[c.key] = raw === '' && c.optional ? null : raw;
  }
  return out;
}

/** First message per field from zod issues (the shared schemas' own words). */
export function issuesByField(issues: readonly { path: readonly PropertyKey[]; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const i of issues) {
    const key = i.path.map(String).join('.') || '(form)';
    out[key] ??= i.message;
  }
  return out;
}
