import { Injectable, inject } from '@angular/core';
import type { SyncEntityName } from '../../../../shared/model/entity-names';
import type { ConflictRow, LocalRecord, OutboxOp } from '../db/db-schema';
import { DeviceDb } from '../db/device-db';
import { resolveConflict, type Side } from '../db/conflict-resolve';
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

  async edit(entity: SyncEntityName, id: string, changes: Record<string, unknown>): Promise<OutboxOp | null> {
    const op = await this.deviceDb.run((db) => saveEdit(db, entity, id, changes));
    if (op) this.engine.requestSync('edit');
    return op;
  }

  /** A new record; `id` only when the id was decided elsewhere (a collar taking a printed tag's id). */
  async create(entity: SyncEntityName, fields: Record<string, unknown>, opts: { id?: string } = {}): Promise<LocalRecord> {
    const rec = await this.deviceDb.run((db) => createRecord(db, entity, fields, opts));
    this.engine.requestSync('create');
    return rec;
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
