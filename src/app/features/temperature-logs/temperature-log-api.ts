import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { TimestampFormat } from '../../../../shared/logger';

export type LogMode = 'replace' | 'append';

/** The body of POST /api/results/temperature-logs/import. */
export interface TemperatureLogRequest {
  siteId: string;
  plotIds: string[];
  depthCm: number;
  source: string;
  text: string;
  timeColumn: string;
  tempColumn: string;
  timeZone: string;
  timeFormat?: TimestampFormat;
  mode: LogMode;
  dryRun: boolean;
}
export interface PlotOutcome {
  plotId: string;
  logId: string | null;
  samples: number;
  skipped: number;
  replacedSamples: number;
  touchedLogs: string[];
}
export interface TemperatureLogOutcome {
  id: string | null;
  mode: LogMode;
  dryRun: boolean;
  samples: number;
  from: string | null;
  to: string | null;
  plots: PlotOutcome[];
}
export interface PlotChoice {
  id: string;
  code: string;
}

@Injectable({ providedIn: 'root' })
export class TemperatureLogApi {
  private readonly http = inject(HttpClient);

  importLog(body: TemperatureLogRequest): Promise<TemperatureLogOutcome> {
    return firstValueFrom(this.http.post<TemperatureLogOutcome>('/api/results/temperature-logs/import', body));
  }
}
