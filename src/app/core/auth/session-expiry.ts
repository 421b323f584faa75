import { Injectable, signal } from '@angular/core';

/**
 * Set when the server answers 401 to a signed-in user (the session ended or the server
 * restarted). The shell then offers "sign in again" on top of the current screen, so nothing
 * typed is lost; the remembered user stays on the device meanwhile.
 */
@Injectable({ providedIn: 'root' })
export class SessionExpiry {
  private readonly state = signal(false);
  readonly expired = this.state.asReadonly();

  markExpired(): void {
    this.state.set(true);
  }

  clear(): void {
    this.state.set(false);
  }
}
