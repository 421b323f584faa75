import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';

export type ClosureSelection = 'accepted' | 'not-rejected';
export interface Estimate {
  value: number;
  ciLow: number;
  ciHigh: number;
  se: number;
}
export type Fit<T> =
  ({ ok: true; n: number; tempSpanC: number; rmse: number; r10: Estimate; warnings: string[] } & T) | { ok: false; reason: string };

export interface Cell {
  key: string;
  label: string;
  level: 'plot' | 'collar';
}
export interface CellMean {
  cellKey: string;
  campaignId: string;
  nPlots: number;
  nCollars: number;
  nVisits: number;
  nClosures: number;
  meanUmolM2S: number;
  seUmolM2S: number | null;
  seBlockUmolM2S: number | null;
  soilTempC: number | null;
  vwcPct: number | null;
}
export interface Summary {
  campaigns: { campaignId: string; name: string; startsOn: string }[];
  cells: Cell[];
  cellMeans: CellMean[];
  blockStrata: { campaignId: string; stratum: string; blockEffects: { blockCode: string; effectUmolM2S: number }[] }[];
  counts: { closures: number; visits: number; collars: number; plots: number };
}
export interface LogFit {
  ok: true;
  n: number;
  nLeftOut: number;
  tempSpanC: number;
  rmseLog: number;
  r10: Estimate;
  q10: Estimate | null;
  e0K: Estimate | null;
  warnings: string[];
}
/** One experimental unit: a plot's visits in one campaign round. */
export interface ResponsePoint {
  plotId: string;
  campaignId: string;
  round: number;
  nVisits: number;
  tempC: number;
  fluxUmolM2S: number;
  vwcPct: number | null;
}
export interface CellResponse {
  cellKey: string;
  label: string;
  nPlots: number;
  points: ResponsePoint[];
  q10: Fit<{ q10: Estimate }>;
  lloydTaylor: Fit<{ e0K: Estimate; publishedE0K: number }>;
  q10Log: LogFit | { ok: false; reason: string };
  lloydTaylorLog: LogFit | { ok: false; reason: string };
  curve: { tempC: number; q10: number | null; lloydTaylor: number | null; q10Log: number | null; lloydTaylorLog: number | null }[];
}
export interface Responses {
  tempDepthCm: number;
  responses: CellResponse[];
}
export interface DayCounts {
  logged: number;
  interpolated: number;
  missing: number;
  outsideRange: number;
}
export interface PlotTotal {
  plotCode: string;
  status: 'complete' | 'incomplete' | 'too little signal';
  totalGCM2: number | null;
  days: DayCounts;
  logDepthCm: number | null;
  responseDepthCm: number;
  depthDiffers: boolean;
  daytimeVisitsOnly: boolean;
  flags: string[];
}
export interface CellTotal {
  cellKey: string;
  label: string;
  status: 'complete' | 'partial' | 'incomplete' | 'too little signal';
  nPlots: number;
  nPlotsTotalled: number;
  totalGCM2: number | null;
  ciLowGCM2: number | null;
  ciHighGCM2: number | null;
  days: DayCounts;
  shareOutsideRange: number;
  fittedRangeC: { minTempC: number; maxTempC: number } | null;
  completePeriod: { fromDay: string; toDay: string } | null;
  flags: string[];
  plots: PlotTotal[];
  cumulative: { day: string; gCM2: number }[];
}
export type ResponseModel = 'lloyd-taylor' | 'q10' | 'lloyd-taylor-log' | 'q10-log';
export interface Seasonal {
  fromDay: string;
  toDay: string;
  model: ResponseModel;
  method: string;
  interval: string;
  totals: CellTotal[];
}
export interface ExportJob {
  id: string;
  state: 'queued' | 'active' | 'completed' | 'failed';
  done: number;
  total: number | null;
  error: string | null;
  result: { fileName: string; sizeBytes: number } | null;
}

/** The results routes of the Bench (lab and admin). */
@Injectable({ providedIn: 'root' })
export class ResultsApi {
  private readonly http = inject(HttpClient);
  private params(o: Record<string, string | number | undefined>) {
    let p = new HttpParams();
    for (const [k, v] of Object.entries(o)) if (v !== undefined && v !== '') p = p.set(k, String(v));
    return p;
  }

  summary(siteId: string, closures: ClosureSelection): Promise<Summary> {
    return firstValueFrom(this.http.get<Summary>('/api/results/summary', { params: this.params({ siteId, closures }) }));
  }
  responses(siteId: string, closures: ClosureSelection): Promise<Responses> {
    return firstValueFrom(this.http.get<Responses>('/api/results/responses', { params: this.params({ siteId, closures }) }));
  }
  seasonal(siteId: string, closures: ClosureSelection, model: string): Promise<Seasonal> {
    return firstValueFrom(this.http.get<Seasonal>('/api/results/seasonal', { params: this.params({ siteId, closures, model }) }));
  }
  startExport(siteId: string, closures: ClosureSelection, model: string, license: string): Promise<{ jobId: string }> {
    return firstValueFrom(this.http.post<{ jobId: string }>('/api/results/exports', { siteId, closures, model, license }));
  }
  exportJob(id: string): Promise<{ job: ExportJob }> {
    return firstValueFrom(this.http.get<{ job: ExportJob }>(`/api/results/exports/${id}`));
  }
}
