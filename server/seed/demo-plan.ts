import type { EntityName } from '../../shared/model/entities';
import { DEMO_USERS } from './demo-accounts';

/** Which demo person would have made a record; the seed writes as that person. */
export type DemoRole = 'crew' | 'lead' | 'lab' | 'admin';

/**
 * One step of the demo scenario, before it meets the database: a create (all fields) or an
 * update (changed fields only) of one record. The builders return these as plain data so they
 * can be unit-tested without PostgreSQL; the orchestrator sends them through the record writer.
 */
export interface SeedWrite {
  entity: EntityName;
  id: string;
  as: DemoRole;
  kind: 'create' | 'update';
  fields: Record<string, unknown>;
}

export const createOp = (entity: EntityName, id: string, as: DemoRole, fields: Record<string, unknown>): SeedWrite => ({
  entity,
  id,
  as,
  kind: 'create',
  fields,
});

export const updateOp = (entity: EntityName, id: string, as: DemoRole, fields: Record<string, unknown>): SeedWrite => ({
  entity,
  id,
  as,
  kind: 'update',
  fields,
});

export function demoUserId(role: DemoRole): string {
  return DEMO_USERS.find((u) => u.roles.includes(role))!.id;
}

/** ISO-8601 UTC with milliseconds, as the wire carries times. */
export const iso = (ms: number) => new Date(ms).toISOString();
export const MINUTE_MS = 60_000;
export const DAY_MS = 86_400_000;
