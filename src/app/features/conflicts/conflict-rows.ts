import type { ConflictRow } from '../../core/db/db-schema';
import { fieldLabel } from '../../core/sync/op-labels';

export interface ConflictFieldRow {
  field: string;
  label: string;
  base: string | null;
  mine: string;
  theirs: string;
}

/** Values as plain text for the table (rendered by interpolation, never as HTML). */
export function showValue(v: unknown): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'string') return v;
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  return JSON.stringify(v);
}

/** One row per conflicting field: base (where known), mine and theirs. A delete shows as such. */
export function conflictFieldRows(
  c: Pick<ConflictRow, 'fields' | 'mine' | 'base' | 'wasDelete'> & { theirs: Record<string, unknown> | null },
): ConflictFieldRow[] {
  if (c.wasDelete) {
    return [{ field: 'deleted', label: 'record', base: null, mine: 'deleted', theirs: c.theirs ? 'changed' : 'unknown' }];
  }
  return c.fields.map((field) => ({
    field,
    label: fieldLabel(field),
    base: field in c.base ? showValue(c.base[field]) : null,
    mine: showValue(c.mine[field]),
    theirs: c.theirs ? showValue(c.theirs[field]) : '(sync to see)',
  }));
}
