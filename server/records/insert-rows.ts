import type { EntityManager } from 'typeorm';
import type { ColumnMetadata } from 'typeorm/metadata/ColumnMetadata';
import { ApplyValueTransformers } from 'typeorm/util/ApplyValueTransformers';
import type { EntityName } from '../../shared/model/entities';
import { ENTITY_DEFS } from './entity-registry';

const quote = (name: string) => `"${name.replace(/"/g, '""')}"`;
const JSON_TYPES = new Set<unknown>(['json', 'jsonb']);

/**
 * Stores rows of one entity with `INSERT … SELECT FROM json_populate_recordset(…) ON CONFLICT DO
 * NOTHING RETURNING id` (one JSON parameter, parsed by PostgreSQL, instead of a placeholder per
 * cell) and answers the ids stored: a row whose id or other unique value is taken is skipped.
 * Values are the driver's `preparePersistentValue` per column (json columns keep their value), and
 * a property a row lacks takes the column default: each stretch of consecutive rows that set the same
 * columns is one statement naming only those, in row order (so of two rows with the same unique
 * value the first is stored), as TypeORM's insert builder does cell by cell.
 */
export async function insertRows(em: EntityManager, entity: EntityName, rows: Record<string, unknown>[]): Promise<Set<string>> {
  const stored = new Set<string>();
  if (!rows.length) return stored;
  const meta = em.connection.getMetadata(ENTITY_DEFS[entity].target);
  const columns: ColumnMetadata[] = meta.columns.filter((c) => c.isInsert && !c.isVirtual && !c.isGenerated);
  const driver = em.connection.driver;
  const groups: { key: string; cols: ColumnMetadata[]; items: Record<string, unknown>[] }[] = [];
  for (const row of rows) {
    const cols = columns.filter((c) => row[c.propertyName] !== undefined);
    const item: Record<string, unknown> = {};
    for (const c of cols) {
      const v = row[c.propertyName];
      item[c.databaseName] = JSON_TYPES.has(c.type)
        ? c.transformer
          ? ApplyValueTransformers.transformTo(c.transformer, v)
          : v
        : driver.preparePersistentValue(v, c);
    }
    const key = cols.map((c) => c.databaseName).join();
    const last = groups[groups.length - 1];
    if (last?.key === key) last.items.push(item);
    else groups.push({ key, cols, items: [item] });
  }
  for (const { cols, items } of groups) {
    const names = cols.map((c) => quote(c.databaseName)).join(', ');
    const out: { id: string }[] = await em.query(
      `INSERT INTO ${quote(meta.tableName)} (${names}) SELECT ${names} FROM json_populate_recordset(NULL::${quote(meta.tableName)}, $1::json)
       ON CONFLICT DO NOTHING RETURNING "id"`,
      [JSON.stringify(items)],
    );
    for (const r of out) stored.add(r.id);
  }
  return stored;
}
