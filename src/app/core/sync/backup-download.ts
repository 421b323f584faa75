import { Injectable, inject } from '@angular/core';
import { saveFile } from '../api/save-file';
import { AuthStore } from '../auth/auth-store';
import { makeBackup } from '../db/backup-file';
import { DeviceDb } from '../db/device-db';

/** "Save a backup file": everything not yet synced (and rejected ops) as a JSON download. */
@Injectable({ providedIn: 'root' })
export class BackupDownload {
  private readonly auth = inject(AuthStore);
  private readonly deviceDb = inject(DeviceDb);

  async save(): Promise<string> {
    const user = this.auth.user();
    if (!user) throw new Error('Nobody is signed in on this device');
    const file = await this.deviceDb.run((db) => makeBackup(db, { id: user.id, email: user.email, displayName: user.displayName }));
    const stamp = file.createdAt.replace(/[:.]/g, '-').slice(0, 19);
    const name = `fluxwalk-backup-${user.email.replace(/[^a-z0-9]+/gi, '-')}-${stamp}.json`;
    saveFile(new Blob([JSON.stringify(file, null, 1)], { type: 'application/json' }), name);
    return name;
  }
}
