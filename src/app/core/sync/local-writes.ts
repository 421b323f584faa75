import { Injectable, inject } from '@angular/core';
import { v4 as uuidv4 } from 'uuid';
import type { EntityFields, SyncEntityName } from '../../../../shared/model/entities';
import type { AttachmentOwner } from '../../../../shared/model/field-records';
import type { ConflictRow, LocalRecord, OutboxOp } from '../db/db-schema';
import { DeviceDb } from '../db/device-db';
import { resolveConflict, type Side } from '../db/conflict-resolve';
import { attachmentFor, keepFile, type FileOwner } from '../db/device-files';
import { createRecord, deleteRecord, saveEdit } from '../db/outbox-writer';
import { SyncEngine } from './sync-engine';

/**
 * The one way screens change data: into Dexie with its outbox op (one transaction), then a nudge
 * to the sync engine. Nothing here waits for the network, so saving works the same offline.
 */
@Injectable({ providedIn: 'root' })
export class LocalWrites {
  private readonly deviceDb = inject(DeviceDb);
  private readonly engine = inject(SyncEngine);

  /** Changes some fields of a record of E (only E's fields, typed by its schema). */
  async edit<E extends SyncEntityName>(entity: E, id: string, changes: Partial<EntityFields<E>>): Promise<OutboxOp | null> {
    const op = await this.deviceDb.run((db) => saveEdit(db, entity, id, changes));
    if (op) this.engine.requestSync('edit');
    return op;
  }

  /**
   * A new record from E's parsed fields (`validated(entity, …)`); `id` only when the id was decided
   * elsewhere (a collar taking a printed tag's id).
   */
  async create<E extends SyncEntityName>(entity: E, fields: EntityFields<E>, opts: { id?: string } = {}): Promise<LocalRecord<E>> {
    const rec = await this.deviceDb.run((db) => createRecord(db, entity, fields, opts));
    this.engine.requestSync('create');
    return rec;
  }

  /** A file for a record that exists: attachment record and bytes in one transaction (see keepFile). */
  async keepFile(owner: FileOwner, file: { blob: Blob; fileName: string; mediaType: string }): Promise<string> {
    const attachment = await attachmentFor(owner, file.blob, file.fileName, file.mediaType);
    const id = await this.deviceDb.run((db) => keepFile(db, attachment, file.blob));
    this.engine.requestSync('create');
    return id;
  }

  /**
   * A new record and a file that belongs to it (a leak check and the logger file it was fitted
   * from): record, attachment record and bytes in one transaction, so neither is kept alone.
   */
  async createWithFile<E extends SyncEntityName & AttachmentOwner>(
    entity: E,
    fields: EntityFields<E>,
    file: { blob: Blob; fileName: string; mediaType: string },
  ): Promise<{ record: LocalRecord<E>; attachmentId: string }> {
    const id = uuidv4();
    const owner = { siteId: fields.siteId, ownerEntity: entity, ownerId: id };
    const attachment = await attachmentFor(owner, file.blob, file.fileName, file.mediaType);
    const result = await this.deviceDb.run((db) =>
      db.transaction('rw', [db.records(entity), db.records('attachment'), db.outbox, db.blobs], async () => {
        const record = await createRecord(db, entity, fields, { id });
        return { record, attachmentId: await keepFile(db, attachment, file.blob) };
      }),
    );
    this.engine.requestSync('create');
    return result;
  }

  async remove(entity: SyncEntityName, id: string): Promise<void> {
    await this.deviceDb.run((db) => deleteRecord(db, entity, id));
    this.engine.requestSync('delete');
  }

  async resolve(conflict: ConflictRow, choice: Record<string, Side>): Promise<void> {
    const opId = await this.deviceDb.run((db) => resolveConflict(db, conflict, choice));
    if (opId) this.engine.requestSync('resolve');
  }
}
