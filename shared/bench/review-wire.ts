import { z } from 'zod';
import { QC_FLAGS } from '../flux/qc-flags';
import type { ClosureModel, SlopeBasis } from '../flux/closure-input';
import type { AirTempSource } from '../flux/chamber-air-temperature';
import type { ProfileSource } from '../flux/chamber-system';
import { REVIEW_STATES } from '../model/field-records';
import type { StoredRecord } from '../model/stored-record';

/*
 * What the Bench's routes answer (GET /api/bench/queue, /api/bench/closures/:id and its history),
 * written once: the server builds these shapes and the Bench reads them, so a renamed field is a
 * compile error on both sides.
 */

const bool = z.enum(['true', 'false']).transform((v) => v === 'true');
const days = z.coerce.number().min(0).max(36500);

/** Filters of the review queue: the design (site … collar), the fit (flag, state) and the context of the day. */
export const queueFilterSchema = z.object({
  siteId: z.string().uuid().optional(),
  campaignId: z.string().uuid().optional(),
  round: z.coerce.number().int().min(1).optional(),
  treatmentId: z.string().uuid().optional(),
  plotId: z.string().uuid().optional(),
  collarId: z.string().uuid().optional(),
  flag: z
    .enum(Object.keys(QC_FLAGS) as [string, ...string[]])
    .or(z.literal('none'))
    .or(z.literal('any'))
    .optional(),
  reviewState: z.enum(REVIEW_STATES).optional(),
  /** At most this many days since the collar was installed or reseated (settling disturbance). */
  installedWithinDays: days.optional(),
  clippedWithinDays: days.optional(),
  rain24h: bool.optional(),
  /** The analyzer's last calibration at least this many days before the closure. */
  calibrationOlderThanDays: days.optional(),
  /** |drift| of that calibration at least this many µmol/mol. */
  driftAtLeastPpm: z.coerce.number().min(0).max(5000).optional(),
  leakFailed: bool.optional(),
  recomputedSinceReview: bool.optional(),
});
/** The queue's filters as parsed (the Bench sends them as a query string, or as the body of bulk accept). */
export type QueueFilter = z.infer<typeof queueFilterSchema>;

export type ReviewState = (typeof REVIEW_STATES)[number];

/** A recompute moved the flux of a reviewed closure (the lab looks again). */
export interface RecomputedMark {
  oldFluxUmolM2S: number | null;
  newFluxUmolM2S: number | null;
  at: string;
  reason: string;
}

/** Raw data changed after the last review decision (the change sent the closure back to review). */
export interface ChangedMark {
  at: string;
  userName: string | null;
  fields: string[];
  previousState: string | null;
}

/** One closure of the review queue with the context of its day. */
export interface QueueItem {
  id: string;
  rev: number;
  siteId: string;
  campaignId: string;
  visitId: string;
  collarId: string;
  startedAt: string;
  /** The closure's day in the site's zone (YYYY-MM-DD). */
  day: string;
  settleS: number;
  flags: string[];
  fluxUmolM2S: number | null;
  reviewState: ReviewState;
  reviewReason: string | null;
  reviewSettleS: number | null;
  reviewWindowEndS: number | null;
  reviewModel: ClosureModel | null;
  redoOfId: string | null;
  recomputedSinceReview: RecomputedMark | null;
  changedSinceReview: ChangedMark | null;
  collarCode: string;
  plotCode: string;
  blockCode: string | null;
  treatmentCode: string | null;
  campaignName: string;
  campaignLocked: boolean;
  round: number;
  rain24h: boolean;
  daysSinceInstall: number | null;
  daysSinceClipping: number | null;
  calibrationAgeDays: number | null;
  calibrationDriftPpm: number | null;
  leakFailed: boolean;
  /** The analyzer's interval, the calibration's larger drift in % of its span gas, and the site's limit for it. */
  calibrationIntervalDays: number | null;
  calibrationDriftPct: number | null;
  calibrationDriftLimitPct: number;
  /** The site's IANA zone: every time of the closure is shown in it. */
  timezone: string;
}

export interface Page<T> {
  items: T[];
  total: number;
  limit: number;
  offset: number;
}

/** One row of a closure's review history: a decision, a recompute, a raw change or a move. */
export interface HistoryEntry {
  id: number;
  at: string;
  kind: 'decision' | 'recompute' | 'raw-change' | 'move';
  field: string;
  oldValue: unknown;
  newValue: unknown;
  oldFluxUmolM2S: number | null;
  newFluxUmolM2S: number | null;
  userId: string | null;
  userName: string | null;
  jobId: string | null;
}

/** One model's numbers as stored in a closure's results (jsonb: NaN and Infinity stored as null). */
export interface FitNumbers {
  slopePpmS: number;
  fluxUmolM2S: number;
  r2: number;
  rmse: number;
  aic: number;
  aicc?: number;
  n: number;
  /** Curved models: slope and flux at chamber closure (t = 0). */
  slopeAtClosurePpmS?: number;
  fluxAtClosureUmolM2S?: number;
  interceptPpm?: number;
  p1?: number;
  p2?: number;
  p3?: number;
  b0?: number;
  b1?: number;
  b2?: number;
}

/** One fit of a closure as stored (`results.raw`, `results.review`). */
export interface FitResult {
  linear: FitNumbers | null;
  exponential: FitNumbers | null;
  quadratic: FitNumbers | null;
  /** `basis` is absent on results stored before slope bases existed (they were on the settle end). */
  selected: {
    model: ClosureModel;
    basis?: SlopeBasis;
    fluxUmolM2S: number;
    slopePpmS: number;
    reason: string;
  } | null;
  exponentialRejectedReason: string | null;
  flags: string[];
  error: string | null;
  window: { t0S: number; firstTS: number; lastTS: number; n: number } | null;
  minDetectableFluxUmolM2S: number | null;
  /** Absent on results stored before the engine reported the precision it used. */
  precisionPpm?: number | null;
  precisionIsDefault?: boolean;
}

/** A closure's stored `results`: both fits and what the flux stood on. */
export interface ClosureResultsWire {
  raw: FitResult;
  review: FitResult | null;
  engineVersion?: string;
  volumeCm3: number | null;
  areaCm2: number | null;
  meanOffsetCm: number | null;
  offsetSetId?: string | null;
  profileId?: string | null;
  ambientPpm: number | null;
  pressureIsDefault: boolean;
  slopeBasis?: SlopeBasis;
  recomputedSinceReview?: RecomputedMark;
  /** Absent on results stored before several chamber systems and the air-temperature order. */
  profileName?: string | null;
  profileSource?: ProfileSource | null;
  ambientCheckId?: string | null;
  ambientAt?: string | null;
  airTempSource?: AirTempSource | null;
  airTempC?: number | null;
}

/** The closure record as the detail answers it: its series and its results read as the Bench's types. */
export type DetailClosure = Omit<StoredRecord<'closure'>, 'results'> & { results: ClosureResultsWire };

export interface CollarHistoryEntry {
  id: string;
  startedAt: string;
  fluxUmolM2S: number | null;
  reviewState: ReviewState;
  flags: string[];
}

/** A closure of the same visit, with what the replicate chart draws. */
export interface ReplicateEntry extends CollarHistoryEntry {
  redoOfId: string | null;
  /** The lab's settle time when set, else the crew's. */
  settleS: number;
  tS: (number | null)[];
  co2Ppm: (number | null)[];
}

export interface ReplicateSpread {
  n: number;
  mean: number | null;
  sd: number | null;
  cvPct: number | null;
}

export interface MoveTarget {
  visitId: string;
  round: number;
  collarId: string;
  collarCode: string;
}

/** Everything the closure view shows, in one answer (GET /api/bench/closures/:id). */
export interface ClosureDetail {
  closure: DetailClosure;
  context: QueueItem;
  offsetSet: { id: string; takenAt: string; readingsCm: number[]; meanCm: number; supersedesId: string | null } | null;
  profile: { id: string; name: string; validFrom: string; chamberVolumeCm3: number; loopVolumeCm3: number } | null;
  collarHistory: CollarHistoryEntry[];
  replicates: ReplicateEntry[];
  replicateSpread: ReplicateSpread;
  history: HistoryEntry[];
  /** The other visits of the closure's campaign (where the lab may move it). */
  moveTargets: MoveTarget[];
  /** The site's chamber profile versions and analyzers (the lab may correct which a closure was made with). */
  systems: { profiles: { id: string; name: string; validFrom: string }[]; analyzers: { id: string; name: string; serial: string }[] };
}
