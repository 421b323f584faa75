import type { SyncEntityName } from '../../../../shared/model/entity-names';
import type { FluxDb, LocalRecord } from '../db/db-schema';

const NAMES: Record<SyncEntityName, string> = {
  site: 'Site',
  block: 'Block',
  treatment: 'Treatment',
  plot: 'Plot',
  collar: 'Collar',
  collarEvent: 'Collar event',
  chamberProfile: 'Chamber profile',
  analyzer: 'Analyzer',
  analyzerCheck: 'Analyzer check',
  route: 'Route',
  campaign: 'Campaign',
  visit: 'Visit',
  offsetSet: 'Offset set',
  probeReading: 'Probe reading',
  closure: 'Closure',
  attachment: 'Attachment',
};

export function entityName(entity: SyncEntityName): string {
  return NAMES[entity] ?? entity;
}

/** The fields that name a record, in order, across entities (collar code, site name, file name…). */
const LABEL_FIELDS = ['code', 'name', 'fileName'] as const;

/**
 * "Collar C-07" when the record has a code or name, else the kind and a short id. The entity is
 * named at run time (an outbox op, a conflict), so the record is the untyped bag.
 */
export function recordLabel(entity: SyncEntityName, id: string, rec: LocalRecord | undefined | null): string {
  const tag = LABEL_FIELDS.map((f) => rec?.[f]).find((v) => v !== undefined && v !== null);
  return `${entityName(entity)} ${typeof tag === 'string' && tag ? tag : id.slice(0, 8)}`;
}

/** Readable labels for a list of (entity, id) pairs, read in one go per entity. */
export async function labelsFor(db: FluxDb, items: { entity: SyncEntityName; id: string }[]): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  const byEntity = new Map<SyncEntityName, string[]>();
  for (const i of items) byEntity.set(i.entity, [...(byEntity.get(i.entity) ?? []), i.id]);
  for (const [entity, ids] of byEntity) {
    const recs = await db.anyRecords(entity).bulkGet(ids);
    ids.forEach((id, k) => out.set(`${entity}:${id}`, recordLabel(entity, id, recs[k])));
  }
  return out;
}

const FIELD_LABELS: Record<string, string> = {
  notes: 'notes',
  status: 'status',
  statusReason: 'reason',
  code: 'code',
  plotId: 'plot',
  treatmentId: 'treatment',
};

export function fieldLabel(field: string): string {
  return FIELD_LABELS[field] ?? field.replace(/([A-Z])/g, ' $1').toLowerCase();
}
