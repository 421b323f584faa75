import { IDBFactory, IDBKeyRange } from 'fake-indexeddb';
import { DERIVED_FIELDS, type SyncEntityName } from '../../../../../shared/model/entities';
import { FluxDb, type LocalRecord, type RecordBag } from '../db-schema';
import { InvalidRecordError, validated } from '../validated';

let n = 0;

/** A fresh in-memory IndexedDB per test, so tests never share state. */
export function testDb(): FluxDb {
  return new FluxDb(`test-${++n}`, { indexedDB: new IDBFactory(), IDBKeyRange });
}

export const SITE = '11111111-1111-4111-8111-111111111111';
export const PLOT = '22222222-2222-4222-8222-222222222222';

/** A whole collar as a pull leaves it (round, 20 cm), its fields changed by `extra`. */
export function collar(id: string, rev: number, extra: Partial<LocalRecord<'collar'>> = {}): LocalRecord<'collar'> {
  return {
    ...deviceRecord('collar', { id, rev, siteId: SITE, code: 'C-01', plotId: PLOT, shape: 'round', diameterCm: 20 }),
    updatedAt: '2025-01-01T00:00:00.000Z',
    updatedBy: null,
    ...extra,
  };
}

/**
 * A whole record of E as a pull leaves it on the device: the given fields parsed by E's schema
 * (so every defaulted field is set, and a field the schema refuses fails the test at once), the
 * server-derived fields kept as given, rev 1 unless said.
 */
export function deviceRecord<E extends SyncEntityName>(
  entity: E,
  record: { id: string; rev?: number; deleted?: boolean; updatedAt?: string } & Record<string, unknown>,
): LocalRecord<E> {
  const { id, rev = 1, deleted = false, updatedAt, ...fields } = record;
  const derived = Object.fromEntries((DERIVED_FIELDS[entity] ?? []).filter((k) => k in fields).map((k) => [k, fields[k]]));
  let parsed: object;
  try {
    parsed = validated(entity, fields);
  } catch (err) {
    if (!(err instanceof InvalidRecordError)) throw err;
    throw new Error(`Fixture ${entity} ${id}: ${err.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`, { cause: err });
  }
  const bag: RecordBag = { ...parsed, ...derived, id, rev, deleted, ...(updatedAt ? { updatedAt } : {}) };
  // Boundary: the fields were parsed by E's schema just above.
  return bag as LocalRecord<E>;
}
