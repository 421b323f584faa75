import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { RecordsApi } from '../../core/api/records-api';
import type { ClosureDetail, Page, QueueFilter, QueueItem } from '../../../../shared/bench/review-wire';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import type { PointsChange } from './point-exclusions';

/** A closure as the server answers a write of it (the detail reads it with its results typed). */
type StoredClosure = StoredRecord<'closure'>;

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
