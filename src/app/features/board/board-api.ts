import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { RecordsApi } from '../../core/api/records-api';
import type { Anomaly, DeviceRow, Digest, MemberRow } from '../../../../shared/board/board-wire';
import type { EntityFields } from '../../../../shared/model/entities';
import { ENTITY_PATHS, type EntityName } from '../../../../shared/model/entity-names';
import type { ProgressState } from '../../../../shared/model/progress-state';
import type { StoredRecord } from '../../../../shared/model/stored-record';
export type { ProgressState };
export type ItemKey = 'offset' | 'closures' | 'probes';
export interface ProgressItem {
  state: ProgressState;
  done: number;
  needed: number;
}
export interface ProgressCollar {
  collarId: string;
  code: string;
  routeId: string | null;
  plotId: string;
  state: ProgressState;
  skipReason: string | null;
  items: Partial<Record<ItemKey, ProgressItem>>;
}
export type StateCounts = Record<ProgressState, number>;
export interface Progress {
  collars: ProgressCollar[];
  totals: { byRoute: Record<string, StateCounts>; byPlot: Record<string, StateCounts>; byTreatment: Record<string, StateCounts> };
}
/** The campaign records the Board plans and follows (routes with their crews, round windows, the lock). */
export type Campaign = StoredRecord<'campaign'>;
export type CampaignRoute = Campaign['routes'][number];
export type { Anomaly, DeviceRow, Digest };
export type { DigestRoute } from '../../../../shared/board/board-wire';
export interface JobState {
  id: string;
  state: 'queued' | 'active' | 'completed' | 'failed';
  done: number;
  total: number | null;
  result: Record<string, unknown> | null;
  error: string | null;
}
export type Member = MemberRow;

/** The Board's calls: generic record routes, the progress query and the Board's own routes. */
@Injectable({ providedIn: 'root' })
export class BoardApi {
  private readonly http = inject(HttpClient);
  private readonly records = inject(RecordsApi);

  list<E extends EntityName>(entity: E, query: Record<string, string>): Promise<StoredRecord<E>[]> {
    return this.records.list(entity, query);
  }

  record<E extends EntityName>(entity: E, id: string): Promise<StoredRecord<E>> {
    return firstValueFrom(this.http.get<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}/${id}`)).then((r) => r.record);
  }

  progress(campaignId: string, round: number | null): Promise<Progress> {
    const params: Record<string, string> = round ? { round: String(round) } : {};
    return firstValueFrom(this.http.get<Progress>(`/api/campaigns/${campaignId}/progress`, { params }));
  }

  /** `forSpreadsheet` adds a UTF-8 byte order mark (?bom=1) so spreadsheets read accents and symbols right. */
  csvUrl(campaignId: string, round: number | null, forSpreadsheet = false): string {
    const q = [round ? `round=${round}` : '', forSpreadsheet ? 'bom=1' : ''].filter(Boolean).join('&');
    return `/api/campaigns/${campaignId}/progress.csv${q ? `?${q}` : ''}`;
  }

  create<E extends EntityName>(entity: E, fields: Partial<EntityFields<E>>): Promise<StoredRecord<E>> {
    return firstValueFrom(this.http.post<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}`, fields)).then((r) => r.record);
  }

  update<E extends EntityName>(entity: E, id: string, rev: number, fields: Partial<EntityFields<E>>): Promise<StoredRecord<E>> {
    return firstValueFrom(this.http.patch<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}/${id}`, { rev, ...fields })).then(
      (r) => r.record,
    );
  }

  setLocked(campaignId: string, locked: boolean): Promise<Campaign> {
    return firstValueFrom(this.http.post<{ record: Campaign }>(`/api/campaigns/${campaignId}/${locked ? 'lock' : 'unlock'}`, {})).then(
      (r) => r.record,
    );
  }

  anomalies(siteId: string, campaignId: string | null, days: number): Promise<{ campaignId: string | null; items: Anomaly[] }> {
    const params: Record<string, string> = { days: String(days), ...(campaignId ? { campaignId } : {}) };
    return firstValueFrom(this.http.get<{ campaignId: string | null; items: Anomaly[] }>(`/api/sites/${siteId}/anomalies`, { params }));
  }

  devices(siteId: string): Promise<DeviceRow[]> {
    return firstValueFrom(this.http.get<{ items: DeviceRow[] }>(`/api/sites/${siteId}/devices`)).then((r) => r.items);
  }

  members(siteId: string): Promise<Member[]> {
    return firstValueFrom(this.http.get<{ items: Member[] }>(`/api/sites/${siteId}/field-members`)).then((r) => r.items);
  }

  digest(siteId: string): Promise<Digest | null> {
    return firstValueFrom(this.http.get<{ digest: Digest | null }>(`/api/sites/${siteId}/digest`)).then((r) => r.digest);
  }

  /** "Send me the digest now": the server queues a job that mails it to the person asking. */
  sendDigest(siteId: string): Promise<{ jobId: string; to: string }> {
    return firstValueFrom(this.http.post<{ jobId: string; to: string }>(`/api/sites/${siteId}/digest/send`, {}));
  }

  job(id: string): Promise<JobState> {
    return firstValueFrom(this.http.get<{ job: JobState }>(`/api/jobs/${id}`)).then((r) => r.job);
  }
}
