import { Injectable, inject } from '@angular/core';
import { isOfflineError } from '../../core/api/api-error';
import { AuthStore } from '../../core/auth/auth-store';
import { userKey } from '../../core/device/device-memory';

export interface Cached<T> {
  value: T;
  savedAt: string;
  fromCache: boolean;
}

/** The stored name of one kept answer: per user (then per question, which names the site), so a shared tablet never shows one lead's Board to another. */
export function boardCacheKey(userId: string, key: string): string {
  return userKey('board', userId, key);
}

/**
 * The Board reads the API and keeps its last answer per question in localStorage, so the lead
 * can still look at it without signal. Only an offline failure falls back to the copy; any
 * other error (403, 404, a bug) reaches the screen.
 */
@Injectable({ providedIn: 'root' })
export class BoardCache {
  private readonly auth = inject(AuthStore);

  constructor() {
    dropUnownedCopies();
  }

  private storageKey(key: string): string | null {
    const id = this.auth.user()?.id;
    return id ? boardCacheKey(id, key) : null;
  }

  async load<T>(key: string, fetch: () => Promise<T>): Promise<Cached<T>> {
    try {
      const value = await fetch();
      const savedAt = new Date().toISOString();
      const stored = this.storageKey(key);
      // Serialising a 5 000-collar answer takes ~100 ms on a slow phone: keep it off the first paint.
      if (stored)
        whenIdle(() => {
          try {
            localStorage.setItem(stored, JSON.stringify({ value, savedAt }));
          } catch {
            // Storage full (a 5 000-collar answer is ~1.5 MB): the live answer is still shown.
          }
        });
      return { value, savedAt, fromCache: false };
    } catch (err) {
      const copy = isOfflineError(err) ? this.recall<T>(key) : null;
      if (!copy) throw err;
      return { ...copy, fromCache: true };
    }
  }

  recall<T>(key: string): { value: T; savedAt: string } | null {
    const stored = this.storageKey(key);
    if (!stored) return null;
    try {
      const raw = localStorage.getItem(stored);
      return raw ? (JSON.parse(raw) as { value: T; savedAt: string }) : null;
    } catch {
      return null;
    }
  }
}

/** Copies kept by an earlier version under `fw.board.<question>`, whose owner is unknown. */
function dropUnownedCopies(): void {
  try {
    const old = Object.keys(localStorage).filter((k) =>
      /^fw\.board\.(progress|anomalies|devices|campaigns|routes|plots|treatments|members|collars)\./.test(k),
    );
    for (const k of old) localStorage.removeItem(k);
  } catch {
    // Storage unavailable: nothing was kept either.
  }
}

function whenIdle(task: () => void): void {
  if (typeof requestIdleCallback === 'function') requestIdleCallback(task, { timeout: 2000 });
  else setTimeout(task, 200);
}
