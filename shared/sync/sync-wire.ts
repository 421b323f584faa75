import { z } from 'zod';
import { SYNC_ENTITIES } from '../model/entities';

/** Push and pull wire shapes (exact: devices and outside scripts rely on them). */
export const MAX_PUSH_OPS = 5000;
export const DEFAULT_PULL_LIMIT = 500;
export const MAX_PULL_LIMIT = 5000;

export const syncOpSchema = z.object({
  opId: z.string().uuid('opId must be a UUID'),
  entity: z.enum(SYNC_ENTITIES, { message: `entity must be one of ${SYNC_ENTITIES.join(', ')}` }),
  id: z.string().uuid('id must be a UUID'),
  baseRev: z.number().int().min(1).nullable(),
  op: z.enum(['upsert', 'delete']),
  fields: z.record(z.string(), z.unknown()).default({}),
});
export type SyncOp = z.infer<typeof syncOpSchema>;

export const pushBodySchema = z.object({
  deviceId: z.string().uuid('deviceId must be a UUID'),
  outboxSize: z.number().int().min(0),
  ops: z.array(z.unknown()).max(MAX_PUSH_OPS, `At most ${MAX_PUSH_OPS} operations per push: split the batch`),
});

export const pullQuerySchema = z.object({
  cursor: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(MAX_PULL_LIMIT).default(DEFAULT_PULL_LIMIT),
  deviceId: z.string().uuid('deviceId must be a UUID'),
});

export type SyncStatus = 'applied' | 'merged' | 'duplicate' | 'conflict' | 'rejected';

export interface PushResult {
  opId: string;
  status: SyncStatus;
  rev?: number;
  record?: Record<string, unknown>;
  conflict?: { fields: string[]; server: Record<string, unknown> | null; serverRev: number };
  error?: { message: string; fields?: { path: string; message: string }[] };
  originalStatus?: SyncStatus;
  warnings?: { path: string; message: string }[];
}

export interface PullChange {
  seq: number;
  entity: string;
  id: string;
  rev: number;
  deleted: boolean;
  record: Record<string, unknown> | null;
  reason?: 'deleted' | 'access';
}

export interface PullAnswer {
  changes: PullChange[];
  cursor: number;
  more: boolean;
}
