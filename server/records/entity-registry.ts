import type { EntityTarget, ObjectLiteral } from 'typeorm';
import type { Role } from '../../shared/auth/roles';
import { CLOSURE_FIT_DATA_FIELDS, CLOSURE_REVIEW_FIELDS, CLOSURE_SYSTEM_FIELDS } from '../../shared/model/field-records';
import type { EntityFields, EntityName } from '../../shared/model/entities';
import { CampaignEntity } from '../campaigns/campaign.entity';
import { RouteEntity } from '../campaigns/route.entity';
import { VisitEntity } from '../campaigns/visit.entity';
import { AttachmentEntity } from '../attachments/attachment.entity';
import { ClosureEntity } from '../closures/closure.entity';
import { CollarEventEntity } from '../collars/collar-event.entity';
import { CollarEntity } from '../collars/collar.entity';
import { AnalyzerCheckEntity } from '../instruments/analyzer-check.entity';
import { AnalyzerEntity } from '../instruments/analyzer.entity';
import { ChamberProfileEntity } from '../instruments/chamber-profile.entity';
import { OffsetSetEntity } from '../readings/offset-set.entity';
import { ProbeReadingEntity } from '../readings/probe-reading.entity';
import { BlockEntity } from '../sites/block.entity';
import { PlotEntity } from '../sites/plot.entity';
import { SiteEntity } from '../sites/site.entity';
import { TreatmentEntity } from '../sites/treatment.entity';
import { TemperatureLogEntity } from '../temperature-logs/temperature-log.entity';

export type WriteAction = 'create' | 'update' | 'delete';

/** Who may write what. Finer rules (which fields) return a readable reason, or null when allowed. */
export interface EntityRules<E extends EntityName = EntityName> {
  create: readonly Role[];
  update: readonly Role[];
  delete: readonly Role[];
  /** `next` is the record as it would be stored, already through its entity's schema. */
  fieldRule?(roles: readonly Role[], action: WriteAction, changed: readonly string[], next: EntityFields<E>): string | null;
}

export interface EntityDef<E extends EntityName = EntityName> {
  name: E;
  target: EntityTarget<ObjectLiteral>;
  table: string;
  rules: EntityRules<E>;
  /**
   * References that must point at a live record of the same site, by path: `visitId`, or a list
   * (`collarIds[]`, `routes[].routeId`).
   */
  refs: Partial<Record<string, EntityName>>;
  /** A reference whose entity is named by another field (an attachment's owner). */
  owner?: { entityField: string; idField: string };
  /** Paths of user ids that must be members of the record's site. */
  members?: readonly string[];
  /** A parent whose fields the record must carry unchanged (a reading carries its visit's collar and campaign). */
  agreements?: readonly { ref: string; target: EntityName; same: readonly string[] }[];
  /** Records that belong to a campaign: refused while it is locked. */
  underCampaign: boolean;
  /**
   * Client fields the server sets because of an edit (after the field rules, so the editor need
   * not be allowed to set them): e.g. a raw change to a reviewed closure sends it back to review.
   */
  follows?(current: EntityFields<E>, changed: readonly string[]): Partial<EntityFields<E>>;
  /**
   * An edit reads and changes only its own record: no unique key over a field it may change, no guard
   * that reads other records, and other records' checks reach it only by its id. A push may then
   * apply such an edit after later ops that do not name it (sync-push.ts) with the same answers.
   */
  independentEdits?: boolean;
  /** Fields fixed at creation. */
  immutable: readonly string[];
  /** Fixed fields a move may change (writeRecord's `move` option, never a plain edit or a sync op). */
  movable?: readonly string[];
  /** The time field list filters use for a date range, if any. */
  timeField?: string;
  /** List order. */
  order: Record<string, 'ASC' | 'DESC'>;
}

const ADMIN: Role[] = ['admin'];
const FIELD: Role[] = ['crew', 'lead'];
const LEAD: Role[] = ['lead'];
/**
 * Readings, offset sets and closures name their visit and carry its collar and campaign (a record
 * that disagrees is refused with a field message rather than corrected, so a device bug shows).
 */
const UNDER_VISIT = { ref: 'visitId', target: 'visit', same: ['collarId', 'campaignId'] } as const;
const has = (roles: readonly Role[], ...any: Role[]) => roles.some((r) => any.includes(r));

/** Crew may change a collar's notes and report it damaged; geometry and lifecycle are the lead's. */
function collarFieldRule(roles: readonly Role[], action: WriteAction, changed: readonly string[], next: EntityFields<'collar'>) {
  if (action !== 'update' || has(roles, 'lead', 'admin')) return null;
  const allowed = ['notes', 'status', 'statusReason'];
  const bad = changed.filter((f) => !allowed.includes(f));
  if (bad.length) return `Only a lead may change ${bad.join(', ')} of a collar`;
  if (changed.includes('status') && next.status !== 'damaged') return 'Crew may only report a collar damaged';
  return null;
}

/**
 * The lab sets review fields and never raw readings; field crews never set review fields. The
 * chamber system (profile, analyzer) is the crew's pick that the lab may correct. Admins may
 * leave points out of a fit (CLOSURE_FIT_DATA_FIELDS) and change nothing else of a closure.
 */
function closureFieldRule(roles: readonly Role[], action: WriteAction, changed: readonly string[], next: EntityFields<'closure'>) {
  // A device creating a closure sends the review fields at their defaults; only a real decision counts.
  const values = new Map<string, unknown>(Object.entries(next));
  const isDecision = (f: string) => {
    const v = values.get(f);
    return action !== 'create' || (v !== null && v !== undefined && v !== 'unreviewed' && !(Array.isArray(v) && !v.length));
  };
  const fitData = (f: string) => (CLOSURE_FIT_DATA_FIELDS as readonly string[]).includes(f);
  if (action === 'update' && has(roles, 'admin') && !has(roles, 'lab', 'crew', 'lead')) {
    const other = changed.filter((f) => !fitData(f));
    return other.length ? `An admin may only leave points out of a closure's fit, not change ${other.join(', ')}` : null;
  }
  const fitDataSet = changed.filter((f) => fitData(f) && isDecision(f));
  if (fitDataSet.length && !has(roles, 'lab', 'admin')) return "Only the lab or an admin may leave points out of a closure's fit";
  const review = changed.filter((f) => (CLOSURE_REVIEW_FIELDS as readonly string[]).includes(f) && !fitData(f) && isDecision(f));
  const raw = changed.filter(
    (f) => !(CLOSURE_REVIEW_FIELDS as readonly string[]).includes(f) && !(CLOSURE_SYSTEM_FIELDS as readonly string[]).includes(f),
  );
  if (action === 'update' && raw.length && !has(roles, 'crew', 'lead')) {
    return `The lab reviews closures but never changes raw readings (${raw.join(', ')})`;
  }
  if (review.length && !has(roles, 'lab')) {
    return `Only the lab may set review fields (${review.join(', ')})`;
  }
  return null;
}

/**
 * A review judges the raw data it saw: when raw data of a reviewed (accepted or rejected) closure
 * changes, the closure goes back to `unreviewed` (the lab's window and model stay as its starting
 * point); the review history records who changed which field (closures/closure-history.ts).
 */
export function reviewResetOnRawChange(current: EntityFields<'closure'>, changed: readonly string[]): Partial<EntityFields<'closure'>> {
  if (current.reviewState === 'unreviewed') return {};
  const raw = changed.filter((f) => !(CLOSURE_REVIEW_FIELDS as readonly string[]).includes(f));
  return raw.length ? { reviewState: 'unreviewed', reviewReason: null } : {};
}

function offsetFieldRule(_roles: readonly Role[], action: WriteAction) {
  return action === 'update' ? 'An offset set is never edited: record a new set that supersedes it (supersedesId)' : null;
}

function def<E extends EntityName>(
  name: E,
  target: EntityTarget<ObjectLiteral>,
  table: string,
  rules: EntityRules<E>,
  extra: Partial<Omit<EntityDef<E>, 'name' | 'target' | 'table' | 'rules'>> = {},
): EntityDef<E> {
  return { name, target, table, rules, refs: {}, underCampaign: false, immutable: ['siteId'], order: { id: 'ASC' }, ...extra };
}

export const ENTITY_DEFS: { [E in EntityName]: EntityDef<E> } = {
  site: def(
    'site',
    SiteEntity,
    'site',
    { create: ADMIN, update: ADMIN, delete: ADMIN },
    { refs: { defaultProfileId: 'chamberProfile' }, immutable: [], order: { name: 'ASC' } },
  ),
  block: def('block', BlockEntity, 'block', { create: ADMIN, update: ADMIN, delete: ADMIN }, { order: { code: 'ASC' } }),
  treatment: def('treatment', TreatmentEntity, 'treatment', { create: ADMIN, update: ADMIN, delete: ADMIN }, { order: { code: 'ASC' } }),
  plot: def(
    'plot',
    PlotEntity,
    'plot',
    { create: ADMIN, update: ADMIN, delete: ADMIN },
    { refs: { blockId: 'block', treatmentId: 'treatment' }, order: { code: 'ASC' } },
  ),
  collar: def(
    'collar',
    CollarEntity,
    'collar',
    { create: [...FIELD, 'admin'], update: [...FIELD, 'admin'], delete: [...LEAD, 'admin'], fieldRule: collarFieldRule },
    { refs: { plotId: 'plot', treatmentId: 'treatment' }, order: { code: 'ASC' } },
  ),
  collarEvent: def(
    'collarEvent',
    CollarEventEntity,
    'collar_event',
    { create: FIELD, update: LEAD, delete: LEAD },
    {
      refs: { collarId: 'collar', replacedById: 'collar' },
      independentEdits: true,
      immutable: ['siteId', 'collarId'],
      timeField: 'date',
      order: { date: 'ASC' },
    },
  ),
  chamberProfile: def(
    'chamberProfile',
    ChamberProfileEntity,
    'chamber_profile',
    { create: ADMIN, update: ADMIN, delete: ADMIN },
    { order: { validFrom: 'ASC' } },
  ),
  analyzer: def('analyzer', AnalyzerEntity, 'analyzer', { create: ADMIN, update: ADMIN, delete: ADMIN }, { order: { name: 'ASC' } }),
  analyzerCheck: def(
    'analyzerCheck',
    AnalyzerCheckEntity,
    'analyzer_check',
    { create: ['crew', 'lead', 'admin'], update: LEAD, delete: LEAD },
    { refs: { analyzerId: 'analyzer' }, timeField: 'at', order: { at: 'DESC' } },
  ),
  route: def(
    'route',
    RouteEntity,
    'route',
    { create: ['lead', 'admin'], update: ['lead', 'admin'], delete: ['lead', 'admin'] },
    { refs: { 'collarIds[]': 'collar' }, order: { name: 'ASC' } },
  ),
  campaign: def(
    'campaign',
    CampaignEntity,
    'campaign',
    { create: LEAD, update: LEAD, delete: LEAD },
    { refs: { 'routes[].routeId': 'route' }, members: ['routes[].crewIds[]'], timeField: 'startsOn', order: { startsOn: 'DESC' } },
  ),
  visit: def(
    'visit',
    VisitEntity,
    'visit',
    { create: FIELD, update: FIELD, delete: LEAD },
    {
      refs: { campaignId: 'campaign', collarId: 'collar' },
      members: ['crewId'],
      underCampaign: true,
      independentEdits: true,
      immutable: ['siteId', 'campaignId', 'collarId', 'round'],
      timeField: 'arrivedAt',
      order: { arrivedAt: 'ASC' },
    },
  ),
  offsetSet: def(
    'offsetSet',
    OffsetSetEntity,
    'offset_set',
    { create: FIELD, update: FIELD, delete: LEAD, fieldRule: offsetFieldRule },
    {
      refs: { visitId: 'visit', collarId: 'collar', campaignId: 'campaign', supersedesId: 'offsetSet' },
      underCampaign: true,
      agreements: [UNDER_VISIT, { ref: 'supersedesId', target: 'offsetSet', same: ['collarId'] }],
      timeField: 'takenAt',
      order: { takenAt: 'ASC' },
    },
  ),
  // A crew deletes a wrong replicate on the spot (a tombstone, synced like every record).
  probeReading: def(
    'probeReading',
    ProbeReadingEntity,
    'probe_reading',
    { create: FIELD, update: FIELD, delete: FIELD },
    {
      refs: { visitId: 'visit', collarId: 'collar', campaignId: 'campaign' },
      members: ['takenById'],
      underCampaign: true,
      agreements: [UNDER_VISIT],
      independentEdits: true,
      immutable: ['siteId', 'visitId', 'collarId', 'campaignId', 'takenById'],
      timeField: 'takenAt',
      order: { takenAt: 'ASC' },
    },
  ),
  closure: def(
    'closure',
    ClosureEntity,
    'closure',
    { create: FIELD, update: ['crew', 'lead', 'lab', 'admin'], delete: LEAD, fieldRule: closureFieldRule },
    {
      refs: {
        visitId: 'visit',
        collarId: 'collar',
        campaignId: 'campaign',
        profileId: 'chamberProfile',
        analyzerId: 'analyzer',
        sourceAttachmentId: 'attachment',
        redoOfId: 'closure',
      },
      agreements: [UNDER_VISIT, { ref: 'redoOfId', target: 'closure', same: ['visitId'] }],
      follows: reviewResetOnRawChange,
      underCampaign: true,
      independentEdits: true,
      immutable: ['siteId', 'visitId', 'collarId', 'campaignId'],
      movable: ['visitId', 'collarId'],
      timeField: 'startedAt',
      order: { startedAt: 'ASC' },
    },
  ),
  attachment: def(
    'attachment',
    AttachmentEntity,
    'attachment',
    { create: ['crew', 'lead', 'admin'], update: ['crew', 'lead', 'admin'], delete: LEAD },
    {
      owner: { entityField: 'ownerEntity', idField: 'ownerId' },
      immutable: ['siteId', 'ownerEntity', 'ownerId', 'sha256', 'sizeBytes', 'mediaType'],
    },
  ),
  temperatureLog: def(
    'temperatureLog',
    TemperatureLogEntity,
    'temperature_log',
    { create: ['lab', 'admin'], update: ['lab', 'admin'], delete: ['lab', 'admin'] },
    { refs: { plotId: 'plot' }, order: { depthCm: 'ASC' } },
  ),
};

/** Union of roles that may write an entity at all: the route registry's rule for write routes. */
export function writeRoles(d: EntityDef): Role[] {
  return [...new Set([...d.rules.create, ...d.rules.update, ...d.rules.delete])];
}
