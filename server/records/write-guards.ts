import type { EntityManager } from 'typeorm';
import type { EntityName } from '../../shared/model/entities';
import { writeGuardsFor } from './write-rules';
import type { WriteOutcome } from './write-outcome';

/** A create, edit or delete about to be applied, as a guard sees it (inside the writing transaction). */
export interface PendingWrite {
  em: EntityManager;
  entity: EntityName;
  id: string;
  action: 'create' | 'update' | 'delete';
  /** The record as stored (null on create). */
  current: Record<string, unknown> | null;
  /** The whole record after the write (the current one for a delete). */
  next: Record<string, unknown>;
  /** Fields the write sets (every field on create). */
  changed: string[];
}

/** Returns a refusal (rejected outcome) or null to let the write through. */
export type WriteGuard = (w: PendingWrite) => Promise<WriteOutcome | null>;

/**
 * Feature rules that need the database to decide (e.g. a chamber profile used by closures is
 * never edited), listed in write-rules.ts, so REST, sync and seed writes all obey them.
 */
export async function checkGuards(w: PendingWrite): Promise<WriteOutcome | null> {
  for (const g of writeGuardsFor(w.entity)) {
    const refusal = await g(w);
    if (refusal) return refusal;
  }
  return null;
}

/** Whether any guard watches this entity's writes. */
export function hasGuards(entity: EntityName): boolean {
  return writeGuardsFor(entity).length > 0;
}
