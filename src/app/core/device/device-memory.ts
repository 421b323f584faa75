import { Injectable } from '@angular/core';

/**
 * Small JSON values remembered on this device (signed-in user, chosen site, outdoor theme).
 * localStorage is read synchronously at start-up, which is what lets the app open offline
 * straight into the user's screens; failures (private mode, quota, corrupt JSON) read as "nothing".
 */
@Injectable({ providedIn: 'root' })
export class DeviceMemory {
  read(key: string): unknown {
    try {
      const raw = globalThis.localStorage?.getItem(key);
      return raw == null ? null : (JSON.parse(raw) as unknown);
    } catch {
      return null;
    }
  }

  write(key: string, value: unknown): void {
    try {
      globalThis.localStorage?.setItem(key, JSON.stringify(value));
    } catch {
      // A full or blocked storage must not break the screen; the value is simply not remembered.
    }
  }

  remove(key: string): void {
    try {
      globalThis.localStorage?.removeItem(key);
    } catch {
      // Same as write(): nothing to do when storage is unavailable.
    }
  }
}
