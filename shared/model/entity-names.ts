/**
 * Record type names, their REST paths and server-derived fields, with no schema attached: the
 * device's store imports this without pulling zod into the app's first chunks.
 */
export const ENTITY_NAMES = [
  'site',
  'block',
  'treatment',
  'plot',
  'collar',
  'collarEvent',
  'chamberProfile',
  'analyzer',
  'analyzerCheck',
  'route',
  'campaign',
  'visit',
  'offsetSet',
  'probeReading',
  'closure',
  'attachment',
  'temperatureLog',
] as const;
export type EntityName = (typeof ENTITY_NAMES)[number];

/** The entities devices sync (temperature logs are a lab import and stay on the server). */
export const SYNC_ENTITIES = [
  'site',
  'block',
  'treatment',
  'plot',
  'collar',
  'collarEvent',
  'chamberProfile',
  'analyzer',
  'analyzerCheck',
  'route',
  'campaign',
  'visit',
  'offsetSet',
  'probeReading',
  'closure',
  'attachment',
] as const satisfies readonly EntityName[];
export type SyncEntityName = (typeof SYNC_ENTITIES)[number];

/** REST collection path under /api for each entity. */
export const ENTITY_PATHS: Record<EntityName, string> = {
  site: 'sites',
  block: 'blocks',
  treatment: 'treatments',
  plot: 'plots',
  collar: 'collars',
  collarEvent: 'collar-events',
  chamberProfile: 'chamber-profiles',
  analyzer: 'analyzers',
  analyzerCheck: 'analyzer-checks',
  route: 'routes',
  campaign: 'campaigns',
  visit: 'visits',
  offsetSet: 'offset-sets',
  probeReading: 'probe-readings',
  closure: 'closures',
  attachment: 'attachments',
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
