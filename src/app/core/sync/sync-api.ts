import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { PullAnswer, PushResult, SyncOp } from '../../../../shared/sync/sync-wire';
import { isOfflineError, serverMessage } from '../api/api-error';

export const PULL_PAGE = 5000;

/** Why a sync round stopped; each is shown differently. */
export type SyncFailure =
  | { kind: 'offline' }
  | { kind: 'signIn' }
  | { kind: 'tooLarge' }
  | { kind: 'reset'; message: string }
  | { kind: 'server'; status: number; message: string };

export class SyncFailed extends Error {
  constructor(readonly failure: SyncFailure) {
    super(failure.kind === 'server' || failure.kind === 'reset' ? failure.message : failure.kind);
  }
}

/** Any failed request counts as offline when it never reached the server, whatever navigator.onLine says. */
export function classify(err: unknown): SyncFailure {
  if (isOfflineError(err) || !(err instanceof HttpErrorResponse)) return { kind: 'offline' };
  if (err.status === 401) return { kind: 'signIn' };
  if (err.status === 413) return { kind: 'tooLarge' };
  const body = err.error as { reset?: unknown } | null;
  if (err.status === 410 && body && body.reset === true) {
    return { kind: 'reset', message: serverMessage(err, 'Download everything again') };
  }
  return { kind: 'server', status: err.status, message: serverMessage(err, `The server answered ${err.status}`) };
}

/** The two sync requests, exactly as the wire describes them. */
@Injectable({ providedIn: 'root' })
export class SyncApi {
  private readonly http = inject(HttpClient);

  async push(deviceId: string, outboxSize: number, ops: SyncOp[]): Promise<PushResult[]> {
    try {
      const res = await firstValueFrom(this.http.post<{ results: PushResult[] }>('/api/sync/push', { deviceId, outboxSize, ops }));
      return res.results;
    } catch (err) {
      throw new SyncFailed(classify(err));
    }
  }

  /** The bytes of an attachment whose record has synced; answers the server's record (with objectKey). */
  async putAttachment(id: string, mediaType: string, blob: Blob): Promise<StoredRecord<'attachment'>> {
    try {
      const res = await firstValueFrom(
        this.http.put<{ record: StoredRecord<'attachment'> }>(`/api/attachments/${encodeURIComponent(id)}/content`, blob, {
          headers: { 'Content-Type': mediaType },
        }),
      );
      return res.record;
    } catch (err) {
      throw new SyncFailed(classify(err));
    }
  }

  async pull(deviceId: string, cursor: number, limit = PULL_PAGE): Promise<PullAnswer> {
    try {
      return await firstValueFrom(
        this.http.get<PullAnswer>('/api/sync/pull', { params: { cursor: String(cursor), limit: String(limit), deviceId } }),
      );
    } catch (err) {
      throw new SyncFailed(classify(err));
    }
  }
}
