import { Injectable } from '@angular/core';

/**
 * The one naming rule for anything kept for one user on this device: `fw.<what>.<userId>[.<rest>]`.
 * "Sign out and remove this device's data" finds a user's keys by that segment, so a new per-user
 * value is removed with the rest as long as its key is made here.
 */
export function userKey(what: string, userId: string, rest?: string): string {
  return rest ? `fw.${what}.${userId}.${rest}` : `fw.${what}.${userId}`;
}

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

  /** Removes every value kept for this user (see userKey); device settings (theme, logger presets) stay. */
  forgetUser(userId: string): void {
    try {
      const storage = globalThis.localStorage;
      if (!storage) return;
      const mine = Object.keys(storage).filter((k) => k.startsWith('fw.') && k.split('.').includes(userId));
      for (const k of mine) storage.removeItem(k);
    } catch {
      // Same as write(): nothing to do when storage is unavailable.
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
