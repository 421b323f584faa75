/**
 * A small Frictionless Table Schema checker (datapackage.org/standard/table-schema, v1 and v2) for
 * the CSVs of a data package: header against the fields, each cell against its type and
 * constraints (required, enum, minimum, maximum), primary keys unique and complete, foreign keys
 * found in the referenced table. Missing values are the schema's `missingValues` (default [""]).
 */
export type Row = Record<string, string>;

interface Field {
  name: string;
  type: string;
  format?: string;
  constraints?: { required?: boolean; enum?: unknown[]; minimum?: number; maximum?: number };
}
interface ForeignKey {
  fields: string[] | string;
  reference: { resource: string; fields: string[] | string };
}
export interface TableResource {
  name: string;
  schema: { fields: Field[]; missingValues?: string[]; primaryKey?: string[] | string; foreignKeys?: ForeignKey[] };
}

const list = (x: string[] | string | undefined) => (x === undefined ? [] : Array.isArray(x) ? x : [x]);

const CAST: Record<string, (v: string) => unknown> = {
  string: (v) => v,
  number: (v) => (/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(v) ? Number(v) : undefined),
  integer: (v) => (/^[+-]?\d+$/.test(v) ? Number(v) : undefined),
  boolean: (v) => (v === 'true' ? true : v === 'false' ? false : undefined),
  date: (v) => (/^\d{4}-\d{2}-\d{2}$/.test(v) && !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) ? v : undefined),
  datetime: (v) =>
    /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?(Z|[+-]\d{2}:\d{2})$/.test(v) && !Number.isNaN(Date.parse(v)) ? v : undefined,
};

/** Problems of one table; `tables` holds every table of the package by resource name (for foreign keys). */
export function checkTable(resource: TableResource, header: string[], rows: Row[], tables: Map<string, Row[]>): string[] {
  const problems: string[] = [];
  const { fields } = resource.schema;
  const missing = new Set(resource.schema.missingValues ?? ['']);
  const name = resource.name;
  if (JSON.stringify(header) !== JSON.stringify(fields.map((f) => f.name)))
    problems.push(`${name}: header ${header.join(',')} ≠ schema fields`);
  for (const f of fields) if (!CAST[f.type]) problems.push(`${name}.${f.name}: unknown type ${f.type}`);
  rows.forEach((r, i) => {
    for (const f of fields) {
      const v = r[f.name];
      const c = f.constraints ?? {};
      if (v === undefined || missing.has(v)) {
        if (c.required) problems.push(`${name} row ${i + 1}: ${f.name} is required`);
        continue;
      }
      const value = CAST[f.type]?.(v);
      if (value === undefined) {
        problems.push(`${name} row ${i + 1}: ${f.name} = "${v}" is not a ${f.type}`);
        continue;
      }
      if (c.enum && !c.enum.includes(value)) problems.push(`${name} row ${i + 1}: ${f.name} = "${v}" is not one of ${c.enum.join(', ')}`);
      if (c.minimum !== undefined && (value as number) < c.minimum) problems.push(`${name} row ${i + 1}: ${f.name} = ${v} < ${c.minimum}`);
      if (c.maximum !== undefined && (value as number) > c.maximum) problems.push(`${name} row ${i + 1}: ${f.name} = ${v} > ${c.maximum}`);
    }
  });
  const pk = list(resource.schema.primaryKey);
  if (pk.length) {
    const keys = rows.map((r) => pk.map((k) => r[k]));
    if (keys.some((k) => k.some((v) => v === undefined || missing.has(v)))) problems.push(`${name}: a primary key value is missing`);
    const joined = keys.map((k) => JSON.stringify(k));
    if (new Set(joined).size !== joined.length) problems.push(`${name}: primary key ${pk.join(',')} is not unique`);
  }
  for (const fk of resource.schema.foreignKeys ?? []) {
    const from = list(fk.fields);
    const to = list(fk.reference.fields);
    const target = tables.get(fk.reference.resource || name);
    if (!target) {
      problems.push(`${name}: foreign key to missing resource ${fk.reference.resource}`);
      continue;
    }
    const known = new Set(target.map((r) => JSON.stringify(to.map((k) => r[k]))));
    const bad = rows.filter((r) => from.every((k) => !missing.has(r[k])) && !known.has(JSON.stringify(from.map((k) => r[k]))));
    if (bad.length) problems.push(`${name}.${from.join(',')}: ${bad.length} values not in ${fk.reference.resource}.${to.join(',')}`);
  }
  return problems;
}
