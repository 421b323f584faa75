import { Injectable } from '@angular/core';
import { isOfflineError } from '../../core/api/api-error';

export interface Cached<T> { value: T; savedAt: string; fromCache: boolean }

const PREFIX = 'fw.board.';

/**
 * The Board reads the API and keeps its last answer per question in localStorage, so the lead
 * can still look at it without signal. Only an offline failure falls back to the copy; any
 * other error (403, 404, a bug) reaches the screen.
 */
@Injectable({ providedIn: 'root' })
export class BoardCache {
  async load<T>(key: string, fetch: () => Promise<T>): Promise<Cached<T>> {
    try {
      const value = await fetch();
      const savedAt = new Date().toISOString();
      // Serialising a 5 000-collar answer takes ~100 ms on a slow phone: keep it off the first paint.
      whenIdle(() => {
        try {
          localStorage.setItem(PREFIX + key, JSON.stringify({ value, savedAt }));
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
    try {
      const raw = localStorage.getItem(PREFIX + key);
      return raw ? (JSON.parse(raw) as { value: T; savedAt: string }) : null;
    } catch {
      return null;
    }
  }
}

function whenIdle(task: () => void): void {
  if (typeof requestIdleCallback === 'function') requestIdleCallback(task, { timeout: 2000 });
  else setTimeout(task, 200);
}
