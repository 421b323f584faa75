import type { DataSource } from 'typeorm';
import type { ColumnMetadata } from 'typeorm/metadata/ColumnMetadata';
import type { EntityName } from '../../shared/model/entities';
import { ENTITY_DEFS } from '../records/entity-registry';
import type { WireRecord } from '../records/wire';

/**
 * Wire records for a pull page straight from raw rows: the same objects `toWire()` makes from
 * hydrated TypeORM entities (same keys in the same order, same values), without building an
 * entity per row. Times and dates come out of PostgreSQL already as the wire's text (no Date
 * object a value), columns the driver hands over as they are pass straight through, and only the
 * rest goes through the driver's own conversion (`prepareHydratedValue`: transformers).
 * test/api/sync-pull-rows.test.ts holds both paths to the same bytes for every entity.
 */
interface Slot {
  key: string;
  column: ColumnMetadata | null;
  initial: unknown;
  /** The row's value is the wire value (no conversion). */
  asIs: boolean;
}

interface Plan {
  sql: string;
  /** One slot per key, in the key order of a hydrated entity; `column` null for a plain property. */
  slots: Slot[];
}

/** Column types PostgreSQL writes as the wire's text itself (see `select` in planFor). */
const AS_WIRE_TEXT = new Set(['timestamptz', 'date']);
/** Column types whose value from node-postgres is already what the hydrated entity holds. */
const AS_DELIVERED = new Set(['text', 'uuid', 'boolean', 'integer', 'double precision', 'jsonb']);
/** toISOString()'s form (UTC, milliseconds), which is how the wire writes a time. */
const ISO_TIME = `'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'`;

const plans = new WeakMap<DataSource, Map<EntityName, Plan>>();

function planFor(ds: DataSource, entity: EntityName): Plan {
  let byEntity = plans.get(ds);
  if (!byEntity) plans.set(ds, (byEntity = new Map()));
  const known = byEntity.get(entity);
  if (known) return known;
  const def = ENTITY_DEFS[entity];
  const meta = ds.getMetadata(def.target);
  const columns = meta.columns.filter((c) => !c.isVirtual && !c.embeddedMetadata && !c.relationMetadata);
  if (columns.length !== meta.columns.length) throw new Error(`${entity}: pull rows support plain columns only`);
  // TypeORM creates each entity with its constructor (class fields give the key order), then sets columns.
  const blank = meta.create() as Record<string, unknown>;
  const byKey = new Map(columns.map((c) => [c.propertyName, c]));
  const keys = [...Object.keys(blank), ...columns.map((c) => c.propertyName).filter((k) => !(k in blank))];
  const quote = (name: string) => `"${name.replace(/"/g, '""')}"`;
  const type = (c: ColumnMetadata) => String(c.type);
  const select = (c: ColumnMetadata) => {
    const col = quote(c.databaseName);
    if (type(c) === 'timestamptz') return `to_char(${col} AT TIME ZONE 'UTC', ${ISO_TIME}) AS ${col}`;
    if (type(c) === 'date') return `to_char(${col}, 'YYYY-MM-DD') AS ${col}`;
    return col;
  };
  const asIs = (c: ColumnMetadata) => AS_WIRE_TEXT.has(type(c)) || (!c.transformer && AS_DELIVERED.has(type(c)));
  const slots = keys.map((key) => {
    const column = byKey.get(key) ?? null;
    return { key, column, initial: blank[key], asIs: !!column && asIs(column) };
  });
  const list = columns.map(select).join(', ');
  const plan = { sql: `SELECT ${list} FROM ${quote(meta.tableName)} WHERE id = ANY($1::uuid[])`, slots };
  byEntity.set(entity, plan);
  return plan;
}

/** The current wire form of the given records of one entity (any order; missing ids are left out). */
export async function wireRecords(ds: DataSource, entity: EntityName, ids: string[]): Promise<WireRecord[]> {
  if (!ids.length) return [];
  const plan = planFor(ds, entity);
  // One array parameter, not one placeholder per id: a 5 000-record page stays one short statement.
  const rows: Record<string, unknown>[] = await ds.query(plan.sql, [ids]);
  const driver = ds.driver;
  const slots = plan.slots;
  const out: WireRecord[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i];
    const rec: Record<string, unknown> = {};
    for (let j = 0; j < slots.length; j++) {
      const s = slots[j];
      if (!s.column) rec[s.key] = s.initial;
      else if (s.asIs) rec[s.key] = row[s.column.databaseName];
      else {
        const v = driver.prepareHydratedValue(row[s.column.databaseName], s.column);
        rec[s.key] = v instanceof Date ? v.toISOString() : v;
      }
    }
    out[i] = rec as WireRecord; // every entity's columns include SyncedColumns' meta
  }
  return out;
}
