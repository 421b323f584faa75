import type { ObjectLiteral } from 'typeorm';
import type { RecordMeta } from '../../shared/model/common';
import type { EntityFields, EntityName } from '../../shared/model/entities';

/**
 * A stored record of an entity named at run time (the writer, the generic routes, the pull): its
 * meta typed, `siteId` as every entity but a site has it, its other fields by name. Code that knows
 * its entity reads `StoredRecord<E>` instead.
 */
export type WireRecord = RecordMeta & SiteScoped & Record<string, unknown>;

/** Fields of a record of an entity named at run time, before its meta: `siteId` typed (a site has none). */
export type SiteScoped = { siteId?: string } & Record<string, unknown>;

/**
 * A record of an entity named at run time that passed its entity's schema (the writer validates every
 * record it stores, record-writer.ts validate()), read as that entity's fields: the one place generic
 * write code turns a field bag into a typed record.
 */
export function validatedAs<E extends EntityName>(_entity: E, rec: Record<string, unknown>): EntityFields<E> {
  return rec as EntityFields<E>;
}

/** A row of a registered entity as a wire record: every entity extends SyncedColumns, so the meta is there. */
export function toWireRecord(row: ObjectLiteral): WireRecord {
  return toWire(row) as WireRecord;
}

/**
 * Plain wire objects from TypeORM rows: dates as ISO-8601 UTC strings, numbers as numbers,
 * no class instances. Comparing values goes through the same normalisation.
 */
export function toWire<T extends object>(row: T): Record<string, unknown> {
  // A plain key loop: called once per record of every sync page, where entries() arrays showed in the profile.
  const out: Record<string, unknown> = {};
  const src = row as Record<string, unknown>;
  for (const k of Object.keys(src)) {
    const v = src[k];
    out[k] = v instanceof Date ? v.toISOString() : v;
  }
  return out;
}

const ISO_DATE_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** ISO date-times in any offset become one canonical UTC form, so equal instants compare equal. */
export function normalizeValue(v: unknown): unknown {
  if (typeof v === 'string' && ISO_DATE_TIME.test(v)) return new Date(v).toISOString();
  if (v instanceof Date) return v.toISOString();
  return v;
}

export function sameValue(a: unknown, b: unknown): boolean {
  return JSON.stringify(canonical(normalizeValue(a))) === JSON.stringify(canonical(normalizeValue(b)));
}

function canonical(v: unknown): unknown {
  if (Array.isArray(v)) return v.map((x) => canonical(normalizeValue(x)));
  if (v && typeof v === 'object') {
    return Object.fromEntries(
      Object.keys(v)
        .sort()
        .map((k) => [k, canonical(normalizeValue((v as Record<string, unknown>)[k]))]),
    );
  }
  return v === undefined ? null : v;
}
