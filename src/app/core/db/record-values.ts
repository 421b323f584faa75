import type { LocalRecord, OutboxOp } from './db-schema';

/** Metadata the server owns; never part of an op's fields. */
export const RECORD_META = ['id', 'rev', 'updatedAt', 'updatedBy', 'deleted'] as const;

function canonical(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(canonical);
  if (v && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    return Object.fromEntries(
      Object.keys(o)
        .sort()
        .map((k) => [k, canonical(o[k])]),
    );
  }
  return v === undefined ? null : v;
}

/** Structural equality of two field values (key order and undefined/null do not matter). */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  return JSON.stringify(canonical(a)) === JSON.stringify(canonical(b));
}

/**
 * The record a person sees: the server's copy with every queued op laid over it in order.
 * Null when a queued delete hides it.
 */
export function overlay(server: LocalRecord | null, ops: readonly OutboxOp[]): LocalRecord | null {
  let rec = server;
  for (const op of ops) {
    if (op.op === 'delete') return null;
    rec = { ...(rec ?? { id: op.id, rev: 0 }), ...op.fields, id: op.id, rev: rec?.rev ?? 0 };
  }
  return rec;
}

/** Only the fields a client may send: metadata dropped. */
export function editableFields(fields: object): Record<string, unknown> {
  return Object.fromEntries(Object.entries(fields).filter(([k]) => !(RECORD_META as readonly string[]).includes(k)));
}

export function nowIso(now: Date = new Date()): string {
  return now.toISOString();
}
