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
type DerivedOf<E extends EntityName> = E extends keyof DerivedFieldTypes ? DerivedFieldTypes[E] : unknown;

/**
 * A record of entity E as the server stores and answers it: the shared schema's fields, the
 * fields the server derives, and the record's metadata. A renamed field is a compile error in
 * every reader of this type.
 */
export type StoredRecord<E extends EntityName> = Omit<EntityFields<E>, keyof DerivedOf<E>> & DerivedOf<E> & RecordMeta;
