import type { z } from 'zod';
import { ENTITY_FIELDS } from '../../../../shared/model/entities';
import type { SyncEntityName } from '../../../../shared/model/entity-names';
import type { RecordBag } from './db-schema';

/**
 * The server's copy of a record as the device stores it: parsed through the entity's shared schema,
 * so a field the copy lacks (written before the field existed, or by a server that leaves it out)
 * gets the schema's default once, on arrival, and no reader has to supply its own.
 *
 * This module holds zod: pull-apply loads it with `import()`, so it stays out of the first chunks.
 */

/** The parts of a zod 4 schema's definition this walk reads (wrappers, objects, lists, pipes). */
interface Def {
  type: string;
  innerType?: z.ZodType;
  shape?: Record<string, z.ZodType>;
  element?: z.ZodType;
  in?: z.ZodType;
  options?: z.ZodType[];
}
const defOf = (s: z.ZodType): Def => (s as unknown as { _zod: { def: Def } })._zod.def;

/** True when a value lacks a field the schema would fill with a default, at any depth. */
type Lacks = (v: unknown) => boolean;

/** Null when nothing below the schema has a default (the value never needs filling). */
function lacksCheck(schema: z.ZodType): Lacks | null {
  const def = defOf(schema);
  switch (def.type) {
    case 'default':
    case 'prefault': {
      const inner = lacksCheck(def.innerType!);
      return (v) => v === undefined || (inner !== null && inner(v));
    }
    case 'nullable':
    case 'optional':
    case 'nonoptional':
    case 'readonly':
    case 'catch':
      return lacksCheck(def.innerType!);
    case 'pipe':
      return lacksCheck(def.in!);
    case 'array': {
      const each = lacksCheck(def.element!);
      return each && ((v) => Array.isArray(v) && v.some(each));
    }
    case 'object': {
      const fields = Object.entries(def.shape!)
        .map(([k, s]) => [k, lacksCheck(s)] as const)
        .filter((f): f is readonly [string, Lacks] => f[1] !== null);
      if (!fields.length) return null;
      return (v) => {
        if (v === null || typeof v !== 'object') return false; // a wrong type is the parse's to report
        const o = v as Record<string, unknown>;
        for (const [k, lacks] of fields) if (lacks(o[k])) return true;
        return false;
      };
    }
    case 'union':
      // Which branch fills what is the parse's decision: parse whenever any branch has defaults.
      return def.options!.some((o) => lacksCheck(o) !== null) ? (v) => v !== undefined : null;
    default:
      return null;
  }
}

const checks = new Map<SyncEntityName, Lacks | null>();

/** Whether a pulled copy lacks a defaulted field: only those are parsed (tools/bench-pull prints both costs: the check is 3–8× cheaper than the parse). */
export function lacksDefault(entity: SyncEntityName, record: unknown): boolean {
  if (!checks.has(entity)) checks.set(entity, lacksCheck(ENTITY_FIELDS[entity]));
  const lacks = checks.get(entity)!;
  return lacks !== null && lacks(record);
}

/** The top-level fields of an entity's object schema (seen through refinements and transforms). */
function topFields(schema: z.ZodType): Record<string, z.ZodType> {
  const def = defOf(schema);
  if (def.type === 'object') return def.shape!;
  if (def.type === 'pipe') return topFields(def.in!);
  return {};
}

/**
 * A pulled copy with the schema's defaults applied. A copy with every defaulted field is returned
 * as it is. Otherwise the parsed values are laid over the copy, so the fields the schema does not
 * name (server-derived values, the record's meta, a newer server's fields) are kept. A copy the
 * device's schema refuses (stored under an older rule) is kept as sent, each missing top-level
 * field given its default: the server's copy is never dropped or altered beyond filling gaps.
 */
export function pulledRecord(entity: SyncEntityName, record: RecordBag): RecordBag {
  if (!lacksDefault(entity, record)) return record;
  const schema = ENTITY_FIELDS[entity];
  const parsed = schema.safeParse(record);
  if (parsed.success) return { ...record, ...(parsed.data as Record<string, unknown>), id: record.id, rev: record.rev };
  const filled: RecordBag = { ...record };
  for (const [k, field] of Object.entries(topFields(schema))) {
    if (filled[k] !== undefined) continue;
    const dflt = field.safeParse(undefined);
    if (dflt.success && dflt.data !== undefined) filled[k] = dflt.data;
  }
  return filled;
}
