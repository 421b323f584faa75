import Dexie, { type Table } from 'dexie';
import { SYNC_ENTITIES, type SyncEntityName } from '../../../../shared/model/entity-names';
import type { DeviceRecord } from '../../../../shared/model/stored-record';

/**
 * A synced record of any entity, as the sync machinery handles it without knowing its type (push,
 * pull, outbox, conflicts, backups). Screens and stores read `LocalRecord<E>` instead.
 */
export interface RecordBag {
  id: string;
  /** The server's revision this copy is based on (0 for a record created here and not yet pushed). */
  rev: number;
  updatedAt?: string;
  updatedBy?: string | null;
  deleted?: boolean;
  [field: string]: unknown;
}

/**
 * A record of entity E as the device keeps it: the server's record with pending local edits laid
 * over it, typed by the entity's shared schema so a renamed field is a compile error in every
 * reader. Without E it is the untyped bag the sync machinery moves.
 */
export type LocalRecord<E extends SyncEntityName | null = null> = E extends SyncEntityName ? DeviceRecord<E> : RecordBag;

/** One queued operation. At most one unsent op per record: later edits are merged into it. */
export interface OutboxOp {
  seq?: number;
  opId: string;
  entity: SyncEntityName;
  id: string;
  baseRev: number | null;
  op: 'upsert' | 'delete';
  fields: Record<string, unknown>;
  /** Values of the edited fields at `baseRev` where known (shown as "base" if it conflicts). */
  base: Record<string, unknown>;
  /** Set when the op has gone out in a push: it may already be applied, so it is never merged into again. */
  sentAt: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface ConflictRow {
  opId: string;
  entity: SyncEntityName;
  recordId: string;
  /** The fields the server refused because it changed them too. */
  fields: string[];
  mine: Record<string, unknown>;
  base: Record<string, unknown>;
  /** The server's record when the conflict was reported (null when the server sent only its rev). */
  theirs: Record<string, unknown> | null;
  serverRev: number;
  wasDelete: boolean;
  at: string;
}

export interface RejectedOp {
  opId: string;
  entity: SyncEntityName;
  id: string;
  op: 'upsert' | 'delete';
  fields: Record<string, unknown>;
  baseRev: number | null;
  message: string;
  problems: { path: string; message: string }[];
  at: string;
}

/** Ops the server acknowledged, so loading an old backup file does not queue them again. */
export interface AckedOp {
  opId: string;
  at: string;
}

/**
 * File bytes kept on the device until they are uploaded (collar photos, analyzer files), keyed
 * by their attachment record's id. Not a synced entity: the attachment record syncs, the bytes go
 * to object storage separately.
 */
export interface BlobRow {
  attachmentId: string;
  blob: Blob;
  mediaType: string;
  createdAt: string;
  uploadedAt: string | null;
  /** Failed uploads so far and the last reason (shown; the upload is retried with the sync back-off). */
  attempts?: number;
  lastError?: string | null;
}

export interface MetaRow {
  key: string;
  value: unknown;
}

export const META = {
  deviceId: 'deviceId',
  cursor: 'pullCursor',
  lastSync: 'lastSync',
  schemaVersion: 'schemaVersion',
  lastPull: 'lastPull',
} as const;

/**
 * Indexes the screens query by; everything else is read by primary key. Each index is one more
 * IndexedDB write per record on a full download, so only indexes a screen uses are declared.
 */
const ENTITY_INDEXES: Partial<Record<SyncEntityName, string>> = {
  collar: 'id, siteId',
  collarEvent: 'id, siteId, collarId',
  visit: 'id, siteId, collarId, campaignId',
  offsetSet: 'id, siteId, visitId, collarId',
  probeReading: 'id, siteId, visitId, collarId',
  closure: 'id, siteId, visitId, collarId',
  attachment: 'id, siteId, ownerId',
  block: 'id, siteId',
  plot: 'id, siteId',
  treatment: 'id, siteId',
  route: 'id, siteId',
  campaign: 'id, siteId',
};

export const SCHEMA_VERSION = 2;

/** One database per signed-in user, so a shared tablet keeps each person's work apart. */
export function dbNameFor(userId: string): string {
  return `fluxwalk-user-${userId}`;
}

export class FluxDb extends Dexie {
  outbox!: Table<OutboxOp, number>;
  meta!: Table<MetaRow, string>;
  conflicts!: Table<ConflictRow, string>;
  rejected!: Table<RejectedOp, string>;
  acked!: Table<AckedOp, string>;
  blobs!: Table<BlobRow, string>;

  constructor(name: string, options?: ConstructorParameters<typeof Dexie>[1]) {
    super(name, options);
    const stores: Record<string, string> = {
      outbox: '++seq, &opId, [entity+id]',
      meta: 'key',
      conflicts: 'opId, [entity+recordId]',
      rejected: 'opId',
      acked: 'opId, at',
    };
    for (const e of SYNC_ENTITIES) stores[e] = ENTITY_INDEXES[e] ?? 'id, siteId';
    this.version(1).stores(stores);
    // Version 2 adds file bytes waiting for upload; every version-1 table is kept as it was.
    this.version(2).stores({ blobs: 'attachmentId' });
  }

  /** The table of entity E, its rows typed by E's schema. */
  records<E extends SyncEntityName>(entity: E): Table<LocalRecord<E>, string> {
    return this.table(entity);
  }

  /** The table of an entity named at run time, as the sync machinery moves it (untyped rows). */
  anyRecords(entity: SyncEntityName): Table<RecordBag, string> {
    return this.table(entity);
  }

  /** Every table a record write may touch together with its outbox op. */
  entityTables(): Table<RecordBag, string>[] {
    return SYNC_ENTITIES.map((e) => this.anyRecords(e));
  }
}
