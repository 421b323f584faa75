/**
 * A PostgreSQL `date` value as YYYY-MM-DD. The driver hands dates over as Date objects at
 * midnight of the server process's zone, so the day is read from its local fields: reading it
 * through toISOString() gives the day before on a server east of UTC.
 */
export function pgDay(v: unknown): string {
  if (v instanceof Date) return `${v.getFullYear()}-${String(v.getMonth() + 1).padStart(2, '0')}-${String(v.getDate()).padStart(2, '0')}`;
  return String(v).slice(0, 10);
}
