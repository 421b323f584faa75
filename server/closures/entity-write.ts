import type { EntityName } from '../../shared/model/entities';
import type { StoredRecord } from '../../shared/model/stored-record';
import type { WrittenRecord } from '../records/after-write';

/** A write of entity E as listeners see it: the writer hands over any entity's records in wire form and names the entity. */
export type WriteOf<E extends EntityName> = WrittenRecord & { entity: E; before: StoredRecord<E> | null; after: StoredRecord<E> };

/** Reads a written record as its entity's type, by the entity the writer names. */
export const isWriteOf = <E extends EntityName>(w: WrittenRecord, entity: E): w is WriteOf<E> => w.entity === entity;
