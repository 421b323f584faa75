import type { z } from 'zod';
import {
  attachmentFields, campaignFields, closureFields, collarEventFields, collarFields, offsetSetFields,
  probeReadingFields, routeFields, visitFields,
} from './field-records';
import { analyzerCheckFields, analyzerFields, blockFields, chamberProfileFields, plotFields, siteFields, treatmentFields } from './site-layout';
import { temperatureLogFields } from './temperature-log';

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
} as const;

export type EntityName = keyof typeof ENTITY_FIELDS;
export type EntityFields<E extends EntityName> = z.infer<(typeof ENTITY_FIELDS)[E]>;

/** The entities devices sync (temperature logs are a lab import and stay on the server). */
export const SYNC_ENTITIES = [
  'site', 'block', 'treatment', 'plot', 'collar', 'collarEvent', 'chamberProfile', 'analyzer', 'analyzerCheck',
  'route', 'campaign', 'visit', 'offsetSet', 'probeReading', 'closure', 'attachment',
] as const satisfies readonly EntityName[];
export type SyncEntityName = (typeof SYNC_ENTITIES)[number];

/** REST collection path under /api for each entity. */
export const ENTITY_PATHS: Record<EntityName, string> = {
  site: 'sites', block: 'blocks', treatment: 'treatments', plot: 'plots', collar: 'collars',
  collarEvent: 'collar-events', chamberProfile: 'chamber-profiles', analyzer: 'analyzers',
  analyzerCheck: 'analyzer-checks', route: 'routes', campaign: 'campaigns', visit: 'visits',
  offsetSet: 'offset-sets', probeReading: 'probe-readings', closure: 'closures', attachment: 'attachments',
  temperatureLog: 'temperature-logs',
};

/** Fields the server derives; a client never sends them. */
export const DERIVED_FIELDS: Partial<Record<EntityName, readonly string[]>> = {
  collar: ['areaCm2'],
  offsetSet: ['meanCm', 'sdCm'],
  probeReading: ['vwcPct'],
  closure: ['results', 'flags', 'fluxUmolM2S'],
  attachment: ['objectKey'],
};
