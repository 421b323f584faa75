import { Injectable, signal } from '@angular/core';

/**
 * Persistent storage and how much this origin uses. Browsers may evict site data after days of no
 * use, and `persist()` is a heuristic, so the answer is shown to the person rather than assumed.
 */
@Injectable({ providedIn: 'root' })
export class StorageStatus {
  private readonly persistedState = signal<boolean | null>(null);
  readonly persisted = this.persistedState.asReadonly();
  private readonly usageState = signal<{ usage: number; quota: number } | null>(null);
  readonly usage = this.usageState.asReadonly();

  async requestPersistence(): Promise<void> {
    const storage = globalThis.navigator?.storage;
    if (!storage?.persist) return;
    try {
      const already = await storage.persisted();
      this.persistedState.set(already || (await storage.persist()));
    } catch {
      this.persistedState.set(false);
    }
    await this.refreshUsage();
  }

  async refreshUsage(): Promise<void> {
    const storage = globalThis.navigator?.storage;
    if (!storage?.estimate) return;
    try {
      const e = await storage.estimate();
      this.usageState.set({ usage: e.usage ?? 0, quota: e.quota ?? 0 });
    } catch {
      // Unknown usage is shown as unknown.
    }
  }
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 ** 2) return `${(n / 1024).toFixed(0)} KB`;
  if (n < 1024 ** 3) return `${(n / 1024 ** 2).toFixed(1)} MB`;
  return `${(n / 1024 ** 3).toFixed(1)} GB`;
}
