import { Injectable, inject } from '@angular/core';
import { AuthStore } from '../auth/auth-store';
import { DeviceDb } from '../db/device-db';
import { DeviceMemory } from './device-memory';

/** What would be lost with the device's data: unsynced changes and files, refused changes, open conflicts. */
export interface Unsaved {
  pending: number;
  refused: number;
  conflicts: number;
}

/**
 * "Sign out and remove this device's data", for a tablet that several people use: the user's own
 * database (records, outbox, files, conflicts) and everything kept for them in device storage
 * (Board copies, Walk choices, chosen site) go; device settings (theme, logger presets) stay.
 * Plain sign-out keeps all of it for the user's next sign-in.
 */
@Injectable({ providedIn: 'root' })
export class DeviceRemoval {
  private readonly auth = inject(AuthStore);
  private readonly deviceDb = inject(DeviceDb);
  private readonly memory = inject(DeviceMemory);

  async unsaved(): Promise<Unsaved> {
    if (!this.deviceDb.db()) return { pending: 0, refused: 0, conflicts: 0 };
    return this.deviceDb.run(async (db) => ({
      pending: (await db.outbox.count()) + (await db.blobs.filter((b) => b.uploadedAt === null).count()),
      refused: await db.rejected.count(),
      conflicts: await db.conflicts.count(),
    }));
  }

  async signOutAndRemove(): Promise<void> {
    const user = this.auth.user();
    if (!user) return;
    await this.auth.signOut();
    await this.deviceDb.remove(user.id);
    this.memory.forgetUser(user.id);
  }
}
