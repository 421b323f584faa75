import { DOCUMENT, DestroyRef, Injectable, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { SwUpdate, VersionReadyEvent } from '@angular/service-worker';
import { filter, first, fromEvent, interval } from 'rxjs';
import { PendingWorkGuard } from './pending-work-guard';
import { RELOAD_PAGE } from './reload-page';

const CHECK_EVERY_MS = 30 * 60 * 1000;

/**
 * New app versions from the service worker. A ready version is offered to the user, and the page
 * reloads only when they say so and no work is pending. An unrecoverable worker state (e.g. a
 * lazy chunk evicted from its cache) cannot be used any longer, so it reloads as soon as no work
 * is pending.
 */
@Injectable({ providedIn: 'root' })
export class AppUpdate {
  private readonly sw = inject(SwUpdate);
  private readonly pendingWork = inject(PendingWorkGuard);
  private readonly reloadPage = inject(RELOAD_PAGE);
  private readonly destroyRef = inject(DestroyRef);
  private readonly document = inject(DOCUMENT);
  private readonly pending$ = toObservable(this.pendingWork.count);
  private started = false;

  private readonly ready = signal(false);
  readonly updateReady = this.ready.asReadonly();
  private readonly blocked = signal(false);
  /** True after the user asked to reload while work was pending. */
  readonly reloadBlocked = this.blocked.asReadonly();

  start(): void {
    if (this.started || !this.sw.isEnabled) return;
    this.started = true;
    this.sw.versionUpdates
      .pipe(
        filter((e): e is VersionReadyEvent => e.type === 'VERSION_READY'),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe(() => this.ready.set(true));
    this.sw.unrecoverable.pipe(first(), takeUntilDestroyed(this.destroyRef)).subscribe(() => {
      this.pending$
        .pipe(
          filter((n) => n === 0),
          first(),
        )
        .subscribe(() => this.reloadPage());
    });
    // Field devices stay open for days: look again periodically and whenever the app comes back
    // to the foreground.
    interval(CHECK_EVERY_MS)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe(() => void this.checkNow());
    fromEvent(this.document, 'visibilitychange')
      .pipe(
        filter(() => this.document.visibilityState === 'visible'),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe(() => void this.checkNow());
  }

  /** Looks for a new version now; offline or failing checks are not an error for the user. */
  async checkNow(): Promise<void> {
    if (!this.sw.isEnabled) return;
    try {
      await this.sw.checkForUpdate();
    } catch {
      // Next check will try again.
    }
  }

  /** The user's "reload": refused (returns false) while work is pending. */
  reloadToUpdate(): boolean {
    if (!this.pendingWork.allowsReload()) {
      this.blocked.set(true);
      return false;
    }
    this.blocked.set(false);
    this.reloadPage();
    return true;
  }
}
