import { z } from 'zod';
import { isoDate, isoDateTime, name, ranged, text, uuid } from './common';
import { checkExclusions, reviewExclusionsSchema } from './point-exclusion';

export const COLLAR_STATUSES = ['active', 'damaged', 'retired'] as const;
export const COLLAR_SHAPES = ['round', 'rectangular'] as const;

export const collarFields = z
  .object({
    siteId: uuid('siteId'),
    code: name('collar code'),
    plotId: uuid('plotId'),
    treatmentId: uuid('treatmentId').nullable().default(null),
    latitude: ranged(-90, 90, '°', 'Latitude').nullable().default(null),
    longitude: ranged(-180, 180, '°', 'Longitude').nullable().default(null),
    accuracyM: ranged(0, 10000, 'm', 'Position accuracy').nullable().default(null),
    shape: z.enum(COLLAR_SHAPES).default('round'),
    diameterCm: ranged(5, 100, 'cm', 'Collar diameter').nullable().default(null),
    sideACm: ranged(5, 100, 'cm', 'Collar side').nullable().default(null),
    sideBCm: ranged(5, 100, 'cm', 'Collar side').nullable().default(null),
    heightCm: ranged(1, 100, 'cm', 'Collar height').nullable().default(null),
    insertionCm: ranged(0, 100, 'cm', 'Insertion depth').nullable().default(null),
    installedOn: isoDate('installedOn').nullable().default(null),
    notes: text(4000).default(''),
    status: z.enum(COLLAR_STATUSES).default('active'),
    statusReason: text(1000).nullable().default(null),
  })
  .refine((c) => (c.shape === 'round' ? c.diameterCm !== null : c.sideACm !== null && c.sideBCm !== null), {
    message: 'Give the inner diameter (round) or both sides (rectangular)',
    path: ['diameterCm'],
  });

export const COLLAR_EVENT_KINDS = ['installed', 'clipped', 'reseated', 'replaced', 'damaged', 'retired'] as const;
export const collarEventFields = z
  .object({
    siteId: uuid('siteId'),
    collarId: uuid('collarId'),
    kind: z.enum(COLLAR_EVENT_KINDS),
    date: isoDate('date'),
    note: text(2000).default(''),
    replacedById: uuid('replacedById').nullable().default(null),
  })
  .refine((e) => e.kind !== 'replaced' || e.replacedById !== null, { message: 'Name the new collar', path: ['replacedById'] });

export const routeFields = z.object({
  siteId: uuid('siteId'),
  name: name('route name'),
  collarIds: z.array(uuid('collarIds')).max(10000),
});

export const ROUTE_DIRECTIONS = ['forward', 'reverse', 'alternate'] as const;
export const campaignFields = z
  .object({
    siteId: uuid('siteId'),
    name: name('campaign name'),
    startsOn: isoDate('startsOn'),
    endsOn: isoDate('endsOn'),
    rounds: z.number().int().min(1, 'At least one round').max(48, 'At most 48 rounds'),
    dueOffset: z.boolean().default(true),
    dueClosures: z.number().int().min(0).max(10).default(1),
    dueProbes: z.boolean().default(true),
    routes: z
      .array(
        z.object({
          routeId: uuid('routeId'),
          crewIds: z.array(uuid('crewIds')).default([]),
          // Alternating direction each round keeps treatments from being confounded with time of day.
          direction: z.enum(ROUTE_DIRECTIONS).default('alternate'),
        }),
      )
      .default([]),
    roundWindows: z.array(z.object({ round: z.number().int().min(1), from: z.string(), to: z.string() })).default([]),
    locked: z.boolean().default(false),
  })
  .refine((c) => c.endsOn >= c.startsOn, { message: 'The campaign ends before it starts', path: ['endsOn'] });

export const visitConditionsSchema = z.object({
  rainNow: z.boolean().default(false),
  rain24h: z.boolean().default(false),
  standingWater: z.boolean().default(false),
  frostSnow: z.boolean().default(false),
  trampled: z.boolean().default(false),
  animal: z.boolean().default(false),
  other: text(500).default(''),
  /** Air temperature at the collar, °C: the chamber air temperature of closures whose file has none. */
  airTempC: ranged(-40, 60, '°C', 'Air temperature').nullable().default(null),
});

export const visitFields = z
  .object({
    siteId: uuid('siteId'),
    campaignId: uuid('campaignId'),
    round: z.number().int().min(1).max(48),
    collarId: uuid('collarId'),
    crewId: uuid('crewId').nullable().default(null),
    arrivedAt: isoDateTime('arrivedAt'),
    conditions: visitConditionsSchema.default({
      rainNow: false,
      rain24h: false,
      standingWater: false,
      frostSnow: false,
      trampled: false,
      animal: false,
      other: '',
      airTempC: null,
    }),
    skipped: z.boolean().default(false),
    skipReason: text(500).nullable().default(null),
  })
  .refine((v) => !v.skipped || (v.skipReason ?? '').trim().length > 0, { message: 'A skip needs a reason', path: ['skipReason'] });

export const offsetSetFields = z.object({
  siteId: uuid('siteId'),
  visitId: uuid('visitId'),
  collarId: uuid('collarId'),
  campaignId: uuid('campaignId'),
  takenAt: isoDateTime('takenAt'),
  readingsCm: z
    .array(ranged(0, 30, 'cm', 'Offset reading'))
    .min(3, 'Take 3 to 8 offset readings')
    .max(8, 'Take 3 to 8 offset readings'),
  /** A correction is a new set naming the one it replaces; the old set is kept. */
  supersedesId: uuid('supersedesId').nullable().default(null),
});

export const MOISTURE_KINDS = ['vwc', 'permittivity'] as const;
/** What one probe insertion reads: the part of a probe reading the crew types. */
const probeValueFields = {
  soilTemps: z
    .array(
      z.object({
        depthCm: ranged(0, 200, 'cm', 'Probe depth'),
        tempC: ranged(-40, 70, '°C', 'Soil temperature'),
      }),
    )
    .max(10)
    .default([]),
  moistureRaw: z.number().finite().nullable().default(null),
  moistureKind: z.enum(MOISTURE_KINDS).nullable().default(null),
  rodLengthCm: ranged(1, 100, 'cm', 'Rod length').nullable().default(null),
  probeId: text(100).default(''),
};
function checkMoisture(p: { moistureRaw: number | null; moistureKind: string | null }, ctx: z.RefinementCtx): void {
  if (p.moistureRaw === null) return;
  if (p.moistureKind === null)
    ctx.addIssue({ code: 'custom', path: ['moistureKind'], message: 'Say whether moisture is VWC or permittivity' });
  if (p.moistureKind === 'vwc' && (p.moistureRaw < 0 || p.moistureRaw > 100)) {
    ctx.addIssue({ code: 'custom', path: ['moistureRaw'], message: 'VWC must be between 0 and 100 %' });
  }
  if (p.moistureKind === 'permittivity' && (p.moistureRaw < 1 || p.moistureRaw > 90)) {
    ctx.addIssue({ code: 'custom', path: ['moistureRaw'], message: 'Permittivity Ka must be between 1 and 90' });
  }
}
/** The typed values of one probe insertion, checked by the same rules as the stored record (the form uses it). */
export const probeValuesSchema = z.object(probeValueFields).superRefine(checkMoisture);

/**
 * One probe insertion (a replicate): a visit keeps every one as its own record; its value for
 * fluxes and exports is their mean (shared/model/probe-replicates.ts).
 */
export const probeReadingFields = z
  .object({
    siteId: uuid('siteId'),
    visitId: uuid('visitId'),
    collarId: uuid('collarId'),
    campaignId: uuid('campaignId'),
    takenAt: isoDateTime('takenAt'),
    /** Who took the replicate (a member of the site). */
    takenById: uuid('takenById').nullable().default(null),
    ...probeValueFields,
  })
  .superRefine(checkMoisture);

const seriesColumn = (what: string, min: number, max: number, unit: string) =>
  z
    .array(
      z.number().finite().min(min, `${what} must be at least ${min} ${unit}`).max(max, `${what} must be at most ${max} ${unit}`).nullable(),
    )
    .max(20000, 'At most 20 000 samples per closure');

export const closureSeriesSchema = z
  .object({
    tS: z.array(z.number().finite().nullable()).max(20000, 'At most 20 000 samples per closure'),
    co2Ppm: seriesColumn('CO2', 0, 20000, 'µmol/mol'),
    h2oMmolMol: seriesColumn('H2O', 0, 100, 'mmol/mol').nullable().default(null),
    pressureKpa: seriesColumn('Pressure', 50, 110, 'kPa').nullable().default(null),
    tempC: seriesColumn('Chamber air temperature', -40, 70, '°C').nullable().default(null),
    /** The logger reported CO2 per mole of dry air already: no dilution correction is applied again. */
    co2IsDry: z.boolean().optional(),
  })
  .superRefine((s, ctx) => {
    for (const key of ['co2Ppm', 'h2oMmolMol', 'pressureKpa', 'tempC'] as const) {
      const col = s[key];
      if (col && col.length !== s.tS.length) {
        ctx.addIssue({ code: 'custom', path: [key], message: `${key} has ${col.length} values but tS has ${s.tS.length}` });
      }
    }
  });

export const REVIEW_STATES = ['unreviewed', 'accepted', 'rejected'] as const;
export const closureFields = z
  .object({
    siteId: uuid('siteId'),
    visitId: uuid('visitId'),
    collarId: uuid('collarId'),
    campaignId: uuid('campaignId'),
    profileId: uuid('profileId').nullable().default(null),
    analyzerId: uuid('analyzerId').nullable().default(null),
    startedAt: isoDateTime('startedAt'),
    endedAt: isoDateTime('endedAt').nullable().default(null),
    settleS: ranged(0, 600, 's', 'Settle time'),
    series: closureSeriesSchema,
    chamberOnAt: isoDateTime('chamberOnAt').nullable().default(null),
    chamberOffAt: isoDateTime('chamberOffAt').nullable().default(null),
    sourceAttachmentId: uuid('sourceAttachmentId').nullable().default(null),
    /** Redo of an earlier closure at the same visit (both are kept). */
    redoOfId: uuid('redoOfId').nullable().default(null),
    // Lab review: kept apart from the raw fields above, which the lab never changes.
    reviewState: z.enum(REVIEW_STATES).default('unreviewed'),
    reviewReason: text(1000).nullable().default(null),
    reviewSettleS: ranged(0, 600, 's', 'Review settle time').nullable().default(null),
    reviewWindowEndS: ranged(1, 7200, 's', 'Review window end').nullable().default(null),
    reviewModel: z.enum(['linear', 'exponential', 'quadratic']).nullable().default(null),
    /** Samples the lab left out of the fit, each with its reason (point-exclusion.ts); the series keeps them. */
    reviewExclusions: reviewExclusionsSchema.default([]),
  })
  .superRefine((c, ctx) => {
    if (c.reviewState === 'rejected' && !(c.reviewReason ?? '').trim().length) {
      ctx.addIssue({ code: 'custom', message: 'A rejection needs a reason', path: ['reviewReason'] });
    }
    checkExclusions(c, ctx);
  });

/** Closure fields only the lab (review) may set; every other closure field is raw data. */
export const CLOSURE_REVIEW_FIELDS = [
  'reviewState',
  'reviewReason',
  'reviewSettleS',
  'reviewWindowEndS',
  'reviewModel',
  'reviewExclusions',
] as const;
/**
 * Review fields that change which data the flux stands on (points left out): refused in a locked
 * campaign like raw edits, and open to admins as well as the lab. The other review fields are
 * decisions a locked campaign still takes.
 */
export const CLOSURE_FIT_DATA_FIELDS = ['reviewExclusions'] as const;
/**
 * The chamber system a closure was made with: set by the crew's device when the closure is made
 * and correctable by the lab (a wrong pick at the start of the day), each correction kept in the
 * closure's history.
 */
export const CLOSURE_SYSTEM_FIELDS = ['profileId', 'analyzerId'] as const;

export const ATTACHMENT_MEDIA_TYPES = [
  'text/csv',
  'text/plain',
  'text/tab-separated-values',
  'image/jpeg',
  'image/png',
  'image/webp',
] as const;
/** Uploads share the 5 MiB body limit of the push; photos are resized on the device first. */
export const MAX_ATTACHMENT_BYTES = 5 * 1024 * 1024;
/** What a file may belong to: photos of collars, events and visits; logger files of closures and leak checks. */
export const ATTACHMENT_OWNERS = ['collar', 'collarEvent', 'visit', 'closure', 'analyzerCheck'] as const;
export type AttachmentOwner = (typeof ATTACHMENT_OWNERS)[number];
export const attachmentFields = z.object({
  siteId: uuid('siteId'),
  ownerEntity: z.enum(ATTACHMENT_OWNERS, { message: `A file belongs to one of: ${ATTACHMENT_OWNERS.join(', ')}` }),
  ownerId: uuid('ownerId'),
  fileName: text(255).default(''),
  mediaType: z.enum(ATTACHMENT_MEDIA_TYPES, { message: `Allowed types: ${ATTACHMENT_MEDIA_TYPES.join(', ')}` }),
  sizeBytes: z
    .number()
    .int()
    .min(1)
    .max(MAX_ATTACHMENT_BYTES, `Files are limited to ${MAX_ATTACHMENT_BYTES / 1024 / 1024} MiB`),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, 'sha256 must be 64 lower-case hex digits'),
});
