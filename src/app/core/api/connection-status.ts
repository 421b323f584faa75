import { DestroyRef, Injectable, inject, signal } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';

/**
 * Whether the server is reachable, as learnt from real requests. Going offline is normal in the
 * field, so it is shown as a quiet status and a short snackbar — never as an error dialog.
 */
@Injectable({ providedIn: 'root' })
export class ConnectionStatus {
  private readonly snackBar = inject(MatSnackBar);
  private readonly offlineState = signal(false);
  readonly offline = this.offlineState.asReadonly();

  constructor() {
    const goOffline = (): void => this.reportOffline();
    globalThis.addEventListener?.('offline', goOffline);
    inject(DestroyRef).onDestroy(() => globalThis.removeEventListener?.('offline', goOffline));
  }

  /** A request failed without reaching the server. */
  reportOffline(): void {
    const wasOffline = this.offlineState();
    this.offlineState.set(true);
    if (!wasOffline) {
      this.snackBar.open('Offline — the server cannot be reached. Work on this device is kept.', 'OK', {
        duration: 8000,
        politeness: 'polite',
      });
    }
  }

  /** A request reached the server. */
  reportOnline(): void {
    this.offlineState.set(false);
  }
}
