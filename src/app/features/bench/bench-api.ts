import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { RecordsApi } from '../../core/api/records-api';
import type { RecordMeta } from '../../../../shared/model/common';
import type { EntityFields } from '../../../../shared/model/entities';
import type { PointsChange } from './point-exclusions';

/** A closure as the server stores it: the shared schema's fields, the fields only the server derives, and the record's metadata. */
type StoredClosure = Omit<EntityFields<'closure'>, 'series' | 'results'> & RecordMeta & { flags: string[]; fluxUmolM2S: number | null };

/** The queue's filters as the Bench sends them (query string of GET /api/bench/queue, body of bulk accept). */
export interface QueueFilter {
  siteId?: string;
  campaignId?: string;
  round?: number;
  treatmentId?: string;
  plotId?: string;
  collarId?: string;
  flag?: string;
  reviewState?: 'unreviewed' | 'accepted' | 'rejected';
  installedWithinDays?: number;
  clippedWithinDays?: number;
  rain24h?: boolean;
  calibrationOlderThanDays?: number;
  driftAtLeastPpm?: number;
  leakFailed?: boolean;
  recomputedSinceReview?: boolean;
}

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

export interface QueueItem {
  id: string;
  rev: number;
  siteId: string;
  campaignId: string;
  visitId: string;
  collarId: string;
  startedAt: string;
  day: string;
  settleS: number;
  flags: string[];
  fluxUmolM2S: number | null;
  reviewState: string;
  reviewReason: string | null;
  reviewSettleS: number | null;
  reviewWindowEndS: number | null;
  reviewModel: string | null;
  recomputedSinceReview: RecomputedMark | null;
  changedSinceReview: ChangedMark | null;
  collarCode: string;
  plotCode: string;
  blockCode: string | null;
  treatmentCode: string | null;
  campaignName: string;
  round: number;
  rain24h: boolean;
  daysSinceInstall: number | null;
  daysSinceClipping: number | null;
  calibrationAgeDays: number | null;
  calibrationDriftPpm: number | null;
  leakFailed: boolean;
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
export interface FitResult {
  linear: FitNumbers | null;
  exponential: FitNumbers | null;
  quadratic: FitNumbers | null;
  /** `basis` is absent on results stored before slope bases existed (they were on the settle end). */
  selected: {
    model: 'linear' | 'exponential' | 'quadratic';
    basis?: 'closure' | 'settle_end';
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

export interface ClosureDetail {
  closure: StoredClosure & {
    series: Record<string, (number | null)[] | null>;
    results: {
      raw: FitResult;
      review: FitResult | null;
      volumeCm3: number | null;
      areaCm2: number | null;
      meanOffsetCm: number | null;
      ambientPpm: number | null;
      pressureIsDefault: boolean;
      slopeBasis?: 'closure' | 'settle_end';
      recomputedSinceReview?: RecomputedMark;
      /** Absent on results stored before several chamber systems and the air-temperature order. */
      profileName?: string | null;
      profileSource?: 'closure' | 'site-default' | 'only-chamber' | null;
      ambientCheckId?: string | null;
      ambientAt?: string | null;
      airTempSource?: 'series' | 'visit' | 'site-default' | null;
      airTempC?: number | null;
    };
  };
  context: QueueItem;
  offsetSet: { id: string; takenAt: string; readingsCm: number[]; meanCm: number; supersedesId: string | null } | null;
  profile: { id: string; name: string; validFrom: string; chamberVolumeCm3: number; loopVolumeCm3: number } | null;
  collarHistory: { id: string; startedAt: string; fluxUmolM2S: number | null; reviewState: string; flags: string[] }[];
  replicates: {
    id: string;
    startedAt: string;
    fluxUmolM2S: number | null;
    reviewState: string;
    flags: string[];
    settleS: number;
    tS: (number | null)[];
    co2Ppm: (number | null)[];
  }[];
  replicateSpread: { n: number; mean: number | null; sd: number | null; cvPct: number | null };
  history: {
    id: number;
    at: string;
    kind: string;
    field: string;
    oldValue: unknown;
    newValue: unknown;
    oldFluxUmolM2S: number | null;
    newFluxUmolM2S: number | null;
    userName: string | null;
  }[];
  /** The other visits of the closure's campaign (where the lab may move it). */
  moveTargets?: { visitId: string; round: number; collarId: string; collarCode: string }[];
  /** The site's chamber profile versions and analyzers (the lab may correct which a closure was made with). */
  systems?: { profiles: { id: string; name: string; validFrom: string }[]; analyzers: { id: string; name: string; serial: string }[] };
}

/** What a recompute job reports (GET /api/jobs): how far it got and, when done, what it changed. */
export interface RecomputeJob {
  id: string;
  name: string;
  siteId: string | null;
  state: 'queued' | 'active' | 'completed' | 'failed';
  done: number;
  total: number | null;
  result: { examined: number; changed: number; lockedKept: number; changedIds: string[] } | null;
  error: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

export interface Named {
  id: string;
  code?: string;
  name?: string;
  rounds?: number;
  startsOn?: string;
}

/** The Bench reads the REST API (it runs at the station); decisions are plain review-field PATCHes. */
@Injectable({ providedIn: 'root' })
export class BenchApi {
  private readonly http = inject(HttpClient);
  private readonly records = inject(RecordsApi);

  queue(filter: QueueFilter, offset: number, limit = 100): Promise<Page<QueueItem>> {
    return firstValueFrom(this.http.get<Page<QueueItem>>('/api/bench/queue', { params: toParams({ ...filter, offset, limit }) }));
  }

  detail(id: string): Promise<ClosureDetail> {
    return firstValueFrom(this.http.get<ClosureDetail>(`/api/bench/closures/${id}`));
  }

  decide(id: string, rev: number, fields: Record<string, unknown>): Promise<{ record: StoredClosure }> {
    return firstValueFrom(this.http.patch<{ record: StoredClosure }>(`/api/closures/${id}`, { rev, ...fields }));
  }

  /** Leaves points out of a closure's fit, or puts them back; answers the recomputed closure. */
  changePoints(id: string, change: PointsChange): Promise<{ record: StoredClosure }> {
    return 'exclude' in change
      ? firstValueFrom(
          this.http.post<{ record: StoredClosure }>(`/api/bench/closures/${id}/exclusions`, {
            indices: change.exclude,
            reason: change.reason,
          }),
        )
      : firstValueFrom(
          this.http.post<{ record: StoredClosure }>(`/api/bench/closures/${id}/exclusions/restore`, { indices: change.restore }),
        );
  }

  /** Moves a closure to another visit of its campaign; answers the recomputed closure. */
  move(id: string, visitId: string): Promise<{ record: StoredClosure }> {
    return firstValueFrom(this.http.post<{ record: StoredClosure }>(`/api/bench/closures/${id}/move`, { visitId }));
  }

  bulkAccept(filter: QueueFilter): Promise<{ accepted: number; skipped: { id: string; reason: string }[] }> {
    return firstValueFrom(
      this.http.post<{ accepted: number; skipped: { id: string; reason: string }[] }>('/api/bench/bulk-accept', filter),
    );
  }

  /** Every campaign, plot, treatment or collar of a site (all pages: a site may hold more than one page of collars). */
  list(path: 'campaigns' | 'plots' | 'treatments' | 'collars', siteId: string): Promise<Named[]> {
    return this.records.listAt<Named>(path, { siteId });
  }

  /** Recent recompute jobs (newest first); the server lists those of the user's sites and site-less ones. */
  jobs(limit = 20): Promise<{ items: RecomputeJob[] }> {
    return firstValueFrom(
      this.http.get<{ items: RecomputeJob[] }>('/api/jobs', { params: toParams({ name: 'closure-recompute', limit }) }),
    );
  }

  job(id: string): Promise<RecomputeJob> {
    return firstValueFrom(this.http.get<{ job: RecomputeJob }>(`/api/jobs/${id}`)).then((r) => r.job);
  }

  /** Asks the server to recompute every closure of a site (lab and admin); answers the job to follow. */
  recomputeSite(siteId: string): Promise<{ jobId: string }> {
    return firstValueFrom(this.http.post<{ jobId: string }>('/api/bench/recompute', { siteId }));
  }
}

function toParams(o: Record<string, unknown>): HttpParams {
  let p = new HttpParams();
  for (const [k, v] of Object.entries(o)) if (v !== undefined && v !== null && v !== '') p = p.set(k, String(v));
  return p;
}
