import type { EntityManager } from 'typeorm';
import type { EntityFields, EntityName } from '../../shared/model/entities';
import { validatedAs } from './wire';
import { writeGuardsFor } from './write-rules';
import type { WriteOutcome } from './write-outcome';

/** A create, edit or delete about to be applied, as a guard sees it (inside the writing transaction). */
export interface PendingWrite<E extends EntityName = EntityName> {
  em: EntityManager;
  entity: E;
  id: string;
  action: 'create' | 'update' | 'delete';
  /** The record as stored (null on create). */
  current: EntityFields<E> | null;
  /** The whole record after the write (the current one for a delete), through its entity's schema. */
  next: EntityFields<E>;
  /** Fields the write sets (every field on create). */
  changed: string[];
}

/** The same write as the generic writer holds it: the records as field bags its schema has checked. */
export type WriteInHand = Omit<PendingWrite, 'current' | 'next'> & {
  current: Record<string, unknown> | null;
  next: Record<string, unknown>;
};

/** Returns a refusal (rejected outcome) or null to let the write through. */
export type WriteGuard<E extends EntityName> = (w: PendingWrite<E>) => Promise<WriteOutcome | null>;

/**
 * Feature rules that need the database to decide (e.g. a chamber profile used by closures is
 * never edited), listed in write-rules.ts, so REST, sync and seed writes all obey them.
 */
export async function checkGuards(w: WriteInHand): Promise<WriteOutcome | null> {
  const typed: PendingWrite = { ...w, current: w.current && validatedAs(w.entity, w.current), next: validatedAs(w.entity, w.next) };
  for (const g of writeGuardsFor(w.entity)) {
    const refusal = await g(typed);
    if (refusal) return refusal;
  }
  return null;
}

/** Whether any guard watches this entity's writes. */
export function hasGuards(entity: EntityName): boolean {
  return writeGuardsFor(entity).length > 0;
}
