import { IDBFactory, IDBKeyRange } from 'fake-indexeddb';
import { FluxDb, type LocalRecord } from '../db-schema';

let n = 0;

/** A fresh in-memory IndexedDB per test, so tests never share state. */
export function testDb(): FluxDb {
  return new FluxDb(`test-${++n}`, { indexedDB: new IDBFactory(), IDBKeyRange });
}

export const SITE = '11111111-1111-4111-8111-111111111111';
export const PLOT = '22222222-2222-4222-8222-222222222222';

export function collar(id: string, rev: number, extra: Partial<LocalRecord> = {}): LocalRecord {
  return {
    id,
    rev,
    siteId: SITE,
    code: 'C-01',
    plotId: PLOT,
    treatmentId: null,
    notes: '',
    status: 'active',
    statusReason: null,
    shape: 'round',
    diameterCm: 20,
    deleted: false,
    updatedAt: '2025-01-01T00:00:00.000Z',
    updatedBy: null,
    ...extra,
  };
}
