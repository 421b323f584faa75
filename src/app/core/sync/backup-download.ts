import { Injectable, inject } from '@angular/core';
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
    const url = URL.createObjectURL(new Blob([JSON.stringify(file, null, 1)], { type: 'application/json' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = name;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
    return name;
  }
}
