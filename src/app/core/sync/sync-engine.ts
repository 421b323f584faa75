import { DestroyRef, Injectable, computed, effect, inject, signal, untracked } from '@angular/core';
import { toObservable } from '@angular/core/rxjs-interop';
import { EMPTY, Subject, Subscription, debounceTime, exhaustMap, filter, from, fromEvent, interval, merge, pairwise, timer } from 'rxjs';
import { ConnectionStatus } from '../api/connection-status';
import { AuthStore } from '../auth/auth-store';
import { SessionExpiry } from '../auth/session-expiry';
import { META, type FluxDb } from '../db/db-schema';
import { DeviceDb } from '../db/device-db';
import { liveSignal } from '../db/live-query-signal';
import { applyPullPage, readCursor, resetForRedownload } from '../db/pull-apply';
import { PUSH_BUDGET_BYTES, applyPushResults, takeBatch, toWire } from '../db/push-apply';
import { PendingWorkGuard } from '../sw-update/pending-work-guard';
import { uploadPendingBlobs } from './attachment-upload';
import { StorageStatus } from './storage-status';
import { SyncApi, SyncFailed } from './sync-api';
import { backoffMs, describeSync, type SyncFacts } from './sync-status';

const EVERY_MS = 60_000;
const MIN_BUDGET = 64 * 1024;

const visible = (): boolean => globalThis.document?.visibilityState !== 'hidden';

/**
 * Drives sync from the app itself (Background Sync is missing on some browsers): after sign-in,
 * on `online`, when the page becomes visible, every 60 s while visible, after local edits and on
 * demand. Push goes first, then pull until the server has no more. Only one tab syncs (Web Locks).
 */
@Injectable({ providedIn: 'root' })
export class SyncEngine {
  private readonly auth = inject(AuthStore);
  private readonly expiry = inject(SessionExpiry);
  private readonly connection = inject(ConnectionStatus);
  private readonly deviceDb = inject(DeviceDb);
  private readonly api = inject(SyncApi);
  private readonly storage = inject(StorageStatus);
  private readonly pendingWork = inject(PendingWorkGuard);
  private readonly destroyRef = inject(DestroyRef);

  private readonly queuedOps = liveSignal(
    () => null,
    (db) => db.outbox.count(),
    0,
  );
  /** Files (logger exports, photos) whose bytes have not reached object storage yet. */
  readonly filesWaiting = liveSignal(
    () => null,
    (db) => db.blobs.filter((b) => b.uploadedAt === null).count(),
    0,
  );
  /** "n not yet synced": queued changes plus files waiting for upload (a file is not safe until uploaded). */
  readonly pending = computed(() => this.queuedOps() + this.filesWaiting());
  readonly conflicts = liveSignal(
    () => null,
    (db) => db.conflicts.count(),
    0,
  );
  readonly rejected = liveSignal(
    () => null,
    (db) => db.rejected.count(),
    0,
  );
  readonly lastSuccess = liveSignal(
    () => null,
    async (db) => {
      const v = (await db.meta.get(META.lastSync))?.value;
      return typeof v === 'string' ? v : null;
    },
    null as string | null,
  );

  private readonly phase = signal<SyncFacts['phase']>('idle');
  private readonly pushed = signal(0);
  private readonly pushTotal = signal(0);
  private readonly pulled = signal(0);
  private readonly error = signal<string | null>(null);
  readonly lastError = this.error.asReadonly();

  readonly view = computed(() =>
    describeSync({
      pending: this.pending(),
      phase: this.phase(),
      pushed: this.pushed(),
      pushTotal: this.pushTotal(),
      pulled: this.pulled(),
      offline: this.connection.offline(),
      needsSignIn: this.expiry.expired(),
      error: this.error(),
    }),
  );

  private readonly requests = new Subject<string>();
  private started = false;
  private failures = 0;
  private retry: Subscription | null = null;
  private again = false;

  private readonly signedIn$ = toObservable(computed(() => this.auth.user()?.id ?? null)).pipe(filter((id) => id !== null));
  private readonly signedInAgain$ = toObservable(this.expiry.expired).pipe(
    pairwise(),
    filter(([was, is]) => was && !is),
  );

  constructor() {
    // Effects that push state into other APIs, not loads. The update prompt must not reload over
    // unsent work without saying so.
    effect(() => this.pendingWork.report(this.pending()));
    // Ask for persistent storage once someone is signed in (browsers may evict otherwise).
    effect(() => {
      if (this.auth.user()) untracked(() => void this.storage.requestPersistence());
    });
  }

  /** Starts listening for sync triggers (idempotent; the shell calls it). */
  start(): void {
    if (this.started) return;
    this.started = true;
    const win = globalThis.window;
    const triggers = merge(
      this.requests.pipe(debounceTime(300)),
      this.signedIn$,
      this.signedInAgain$,
      win ? fromEvent(win, 'online') : EMPTY,
      globalThis.document ? fromEvent(globalThis.document, 'visibilitychange').pipe(filter(visible)) : EMPTY,
      interval(EVERY_MS).pipe(filter(visible)),
    );
    const sub = triggers.pipe(exhaustMap(() => from(this.runRounds()))).subscribe();
    this.destroyRef.onDestroy(() => sub.unsubscribe());
  }

  /** "Sync now", and what local writes call after they are stored. */
  requestSync(reason = 'demand'): void {
    if (this.phase() !== 'idle') this.again = true;
    this.requests.next(reason);
  }

  /** Runs a sync now and resolves when it is over (one at a time in this tab). */
  syncNow(): Promise<void> {
    return this.runRounds();
  }

  private running: Promise<void> | null = null;

  private runRounds(): Promise<void> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      try {
        do {
          this.again = false;
          await this.runOnce();
        } while (this.again);
      } finally {
        this.running = null;
      }
    })();
    return this.running;
  }

  private async runOnce(): Promise<void> {
    const user = this.auth.user();
    const db = this.deviceDb.db();
    if (!user || !db || this.deviceDb.needsReload()) return;
    if (this.expiry.expired()) return; // the outbox is kept; "sign in again" restarts sync
    const locks = globalThis.navigator?.locks;
    if (!locks) return this.syncRound(db);
    await locks.request(`fluxwalk-sync-${user.id}`, { ifAvailable: true }, async (lock) => {
      if (lock) await this.syncRound(db);
      // Without the lock another tab is syncing; this tab's counts follow through liveQuery.
    });
  }

  private async syncRound(db: FluxDb): Promise<void> {
    this.retry?.unsubscribe();
    try {
      const deviceId = await this.deviceDb.deviceIdNow();
      await this.pushAll(db, deviceId);
      // Bytes of attachments whose records the push just delivered. A failed upload must not hold
      // back the pull (e.g. storage down for hours): it is thrown after it, for the back-off.
      const uploadFailure = await this.deviceDb
        .run((d) => uploadPendingBlobs(d, (id, type, blob) => this.api.putAttachment(id, type, blob)))
        .then(
          () => null,
          (err: unknown) => err,
        );
      await this.pullAll(db, deviceId);
      if (uploadFailure) throw uploadFailure;
      await this.deviceDb.run((d) => d.meta.put({ key: META.lastSync, value: new Date().toISOString() }));
      this.failures = 0;
      this.error.set(null);
    } catch (err) {
      this.onFailure(err);
    } finally {
      this.phase.set('idle');
    }
  }

  private onFailure(err: unknown): void {
    const f = err instanceof SyncFailed ? err.failure : null;
    if (f?.kind === 'signIn') return; // the interceptor has asked for sign-in; nothing is dropped
    if (f?.kind !== 'offline') {
      this.error.set(f?.kind === 'server' ? f.message : err instanceof Error ? err.message : String(err));
      if (!f) console.error('[sync]', err);
    }
    this.failures++;
    this.retry = timer(backoffMs(this.failures)).subscribe(() => this.requests.next('retry'));
  }

  private async pushAll(db: FluxDb, deviceId: string): Promise<void> {
    const total = await db.outbox.count();
    if (!total) return;
    this.phase.set('pushing');
    this.pushTotal.set(total);
    this.pushed.set(0);
    let budget = PUSH_BUDGET_BYTES;
    for (;;) {
      const batch = await this.deviceDb.run((d) => takeBatch(d, budget));
      if (!batch.length) return;
      let results;
      try {
        results = await this.api.push(deviceId, await db.outbox.count(), batch.map(toWire));
      } catch (err) {
        // 413: split the batch; one op alone over the limit can never go and is reported instead.
        if (err instanceof SyncFailed && err.failure.kind === 'tooLarge' && (batch.length > 1 || budget > MIN_BUDGET)) {
          budget = Math.max(MIN_BUDGET, Math.floor(budget / 2));
          continue;
        }
        if (err instanceof SyncFailed && err.failure.kind === 'tooLarge') {
          results = batch.map((op) => ({
            opId: op.opId,
            status: 'rejected' as const,
            error: { message: 'This change is larger than the server accepts in one request' },
          }));
        } else {
          throw err;
        }
      }
      const tally = await this.deviceDb.run((d) => applyPushResults(d, batch, results));
      const answered = tally.done + tally.conflicts + tally.rejected;
      this.pushed.update((k) => k + answered);
      this.pushTotal.update((n) => Math.max(n, this.pushed()));
      if (!answered) throw new Error('The server answered the push without any result');
    }
  }

  private async pullAll(db: FluxDb, deviceId: string): Promise<void> {
    this.phase.set('pulling');
    this.pulled.set(0);
    const started = performance.now();
    // Time split between waiting for the server and writing to Dexie (kept for tools/bench-pull).
    const t = { fetchMs: 0, writeMs: 0 };
    try {
      await this.pullPages(deviceId, await readCursor(db), t);
    } catch (err) {
      if (!(err instanceof SyncFailed && err.failure.kind === 'reset')) throw err;
      // Away longer than the server keeps deletions: start over, keeping the outbox.
      await this.deviceDb.run((d) => resetForRedownload(d));
      await this.pullPages(deviceId, 0, t);
    }
    const ms = Math.round(performance.now() - started);
    const value = {
      ms,
      fetchMs: Math.round(t.fetchMs),
      writeMs: Math.round(t.writeMs),
      records: this.pulled(),
      at: new Date().toISOString(),
    };
    await this.deviceDb.run((d) => d.meta.put({ key: META.lastPull, value }));
  }

  /**
   * Pages in order; the next page is already being fetched while this one is written, so the
   * server's time and Dexie's overlap. A download from cursor 0 skips the "newer copy" check.
   */
  private async pullPages(deviceId: string, from: number, t: { fetchMs: number; writeMs: number }): Promise<void> {
    const fetchPage = (cursor: number) => {
      const asked = performance.now();
      const p = this.api.pull(deviceId, cursor).then((a) => {
        t.fetchMs += performance.now() - asked;
        return a;
      });
      p.catch(() => undefined); // awaited below; this only keeps an unused prefetch from being reported
      return p;
    };
    let next = fetchPage(from);
    for (;;) {
      const answer = await next;
      if (answer.more) next = fetchPage(answer.cursor);
      const writing = performance.now();
      const written = await this.deviceDb.run((d) => applyPullPage(d, answer, { fresh: from === 0 }));
      t.writeMs += performance.now() - writing;
      this.pulled.update((n) => n + written);
      if (!answer.more) return;
    }
  }
}
