import { Injectable, computed, signal } from '@angular/core';

/**
 * How much work on this device is not yet safely stored for the server (the sync engine's outbox
 * will report it here). A page reload — an app update or sign-out — waits while it is above 0.
 */
@Injectable({ providedIn: 'root' })
export class PendingWorkGuard {
  private readonly pending = signal(0);
  readonly count = this.pending.asReadonly();
  readonly allowsReload = computed(() => this.pending() === 0);

  report(count: number): void {
    this.pending.set(Math.max(0, Math.floor(count)));
  }
}
