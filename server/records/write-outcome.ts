import type { Warning } from '../../shared/model/common';
import type { FieldError } from '../core/errors';

export type WriteStatus = 'applied' | 'merged' | 'duplicate' | 'conflict' | 'rejected';

export interface ConflictInfo {
  fields: string[];
  server: Record<string, unknown> | null;
  serverRev: number;
}

/** What one write did; the REST routes and the sync push both answer from it. */
export interface WriteOutcome {
  status: WriteStatus;
  rev?: number;
  record?: Record<string, unknown>;
  conflict?: ConflictInfo;
  error?: { message: string; fields?: FieldError[] };
  warnings?: Warning[];
  /** HTTP status for REST callers of a rejected write. */
  httpStatus?: number;
}

export function rejected(httpStatus: number, message: string, fields?: FieldError[]): WriteOutcome {
  return { status: 'rejected', httpStatus, error: fields?.length ? { message, fields } : { message } };
}

/**
 * What a read answers for a record the caller may not see (or that does not exist); every write
 * path answers the same, so a write never tells more about another site's record than a read.
 */
export function noRecordMessage(entity: string, id: string): string {
  return `No ${entity} ${id}`;
}
