import { Injectable } from '@angular/core';

/**
 * Asks the browser to keep this origin's storage (IndexedDB, caches) under storage pressure.
 * Some browsers evict the data of sites not used for days; a granted request prevents that, a
 * refused one changes nothing. Asked after sign-in, when the user has shown they use the app.
 */
@Injectable({ providedIn: 'root' })
export class StoragePersistence {
  async request(): Promise<boolean> {
    try {
      const storage = globalThis.navigator?.storage;
      if (!storage?.persist) return false;
      if (await storage.persisted?.()) return true;
      return await storage.persist();
    } catch {
      return false;
    }
  }
}
