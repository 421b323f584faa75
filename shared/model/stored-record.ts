import type { RecordMeta } from './common';
import type { EntityFields, EntityName } from './entities';

/** The fields only the server derives, per entity (DERIVED_FIELDS names them; a client never sends them). */
interface DerivedFieldTypes {
  collar: { areaCm2: number | null };
  offsetSet: { meanCm: number | null; sdCm: number | null };
  probeReading: { vwcPct: number | null };
  /** The engine's results are read through the Bench's own result types (bench-api.ts). */
  closure: { results: Record<string, unknown> | null; flags: string[]; fluxUmolM2S: number | null };
  attachment: { objectKey: string | null };
}
export type DerivedOf<E extends EntityName> = E extends keyof DerivedFieldTypes ? DerivedFieldTypes[E] : unknown;

/**
 * A record of entity E as the server stores and answers it: the shared schema's fields, the
 * fields the server derives, and the record's metadata. A renamed field is a compile error in
 * every reader of this type.
 */
export type StoredRecord<E extends EntityName> = Omit<EntityFields<E>, keyof DerivedOf<E>> & DerivedOf<E> & RecordMeta;

/**
 * A record of entity E as a device keeps it: the shared schema's fields, the server-derived fields
 * once the server has answered (absent on a record made here and not yet pushed), and the meta the
 * server owns (rev 0 and no `updatedAt` until the first push).
 */
export type DeviceRecord<E extends EntityName> = Omit<EntityFields<E>, keyof DerivedOf<E>> &
  Partial<DerivedOf<E>> & {
    id: string;
    rev: number;
    updatedAt?: string;
    updatedBy?: string | null;
    deleted?: boolean;
  };
