import { ENTITY_FIELDS, type EntityFields, type SyncEntityName } from '../../../../shared/model/entities';

export class InvalidRecordError extends Error {
  constructor(readonly problems: { path: string; message: string }[]) {
    super(problems.map((p) => p.message).join('; '));
  }
}

/**
 * Checks a whole record with the shared schema the server uses, so the device never queues what
 * the server refuses. The answer is the entity's parsed fields (defaults filled in), typed by E:
 * what `LocalWrites.create` takes.
 */
export function validated<E extends SyncEntityName>(entity: E, fields: Record<string, unknown>): EntityFields<E> {
  const parsed = ENTITY_FIELDS[entity].safeParse(fields);
  if (!parsed.success) {
    throw new InvalidRecordError(parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
  }
  return parsed.data as EntityFields<E>;
}
