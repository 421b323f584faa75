import { DestroyRef, Injectable, inject, signal } from '@angular/core';

/**
 * Whether the server is reachable, as learnt from real requests. Going offline is normal in the
 * field, so it is said once, quietly, by the toolbar's sync chip ("Offline · n not yet synced") —
 * no second badge, no snackbar over the screen's controls, never an error dialog.
 */
@Injectable({ providedIn: 'root' })
export class ConnectionStatus {
  private readonly offlineState = signal(false);
  readonly offline = this.offlineState.asReadonly();

  constructor() {
    const goOffline = (): void => this.reportOffline();
    globalThis.addEventListener?.('offline', goOffline);
    inject(DestroyRef).onDestroy(() => globalThis.removeEventListener?.('offline', goOffline));
  }

  /** A request failed without reaching the server. */
  reportOffline(): void {
    this.offlineState.set(true);
  }

  /** A request reached the server. */
  reportOnline(): void {
    this.offlineState.set(false);
  }
}
