import { ENTITY_FIELDS, type SyncEntityName } from '../../../../shared/model/entities';

export class InvalidRecordError extends Error {
  constructor(readonly problems: { path: string; message: string }[]) {
    super(problems.map((p) => p.message).join('; '));
  }
}

/** Checks a whole record with the shared schema the server uses, so the device never queues what the server refuses. */
export function validated(entity: SyncEntityName, fields: Record<string, unknown>): Record<string, unknown> {
  const parsed = ENTITY_FIELDS[entity].safeParse(fields);
  if (!parsed.success) {
    throw new InvalidRecordError(parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
  }
  return parsed.data as Record<string, unknown>;
}
