import type { z } from 'zod';
import {
  attachmentFields,
  campaignFields,
  closureFields,
  collarEventFields,
  collarFields,
  offsetSetFields,
  probeReadingFields,
  routeFields,
  visitFields,
} from './field-records';
import {
  analyzerCheckFields,
  analyzerFields,
  blockFields,
  chamberProfileFields,
  plotFields,
  siteFields,
  treatmentFields,
} from './site-layout';
import { temperatureLogFields } from './temperature-log';
import type { EntityName } from './entity-names';

/** Every record type, keyed by its wire name. `fields` validates a whole record (create, or merged edit). */
export const ENTITY_FIELDS = {
  site: siteFields,
  block: blockFields,
  treatment: treatmentFields,
  plot: plotFields,
  collar: collarFields,
  collarEvent: collarEventFields,
  chamberProfile: chamberProfileFields,
  analyzer: analyzerFields,
  analyzerCheck: analyzerCheckFields,
  route: routeFields,
  campaign: campaignFields,
  visit: visitFields,
  offsetSet: offsetSetFields,
  probeReading: probeReadingFields,
  closure: closureFields,
  attachment: attachmentFields,
  temperatureLog: temperatureLogFields,
} as const satisfies Record<EntityName, z.ZodType>;

export type EntityFields<E extends EntityName> = z.infer<(typeof ENTITY_FIELDS)[E]>;

export { DERIVED_FIELDS, ENTITY_NAMES, ENTITY_PATHS, SYNC_ENTITIES, type EntityName, type SyncEntityName } from './entity-names';
