import type { EntityManager } from 'typeorm';
import type { EntityName } from '../../shared/model/entities';
import type { ChangeBuffer } from './change-buffer';
import { afterWriteListeners } from './write-rules';

/** One applied write, as the listeners see it: inside the writing transaction, after the row changed. */
export interface WrittenRecord {
  em: EntityManager;
  actorId: string;
  entity: EntityName;
  id: string;
  action: 'create' | 'update' | 'delete';
  /** The record before the write (null on create) and after it, in wire form. */
  before: Record<string, unknown> | null;
  after: Record<string, unknown>;
  /** Client fields that changed (derived fields not included). */
  changed: string[];
  changes: ChangeBuffer;
}

export type AfterWrite = (w: WrittenRecord) => Promise<void>;

/**
 * Features that must follow writes (review history, recompute requests) are listed in
 * write-rules.ts instead of adding special cases to the writer. Listeners run in the writer's
 * transaction, so what they store commits or rolls back with the write.
 */
export async function notifyWritten(w: WrittenRecord): Promise<void> {
  for (const l of afterWriteListeners()) await l(w);
}
