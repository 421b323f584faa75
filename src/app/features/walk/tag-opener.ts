import { Injectable, inject } from '@angular/core';
import { Router } from '@angular/router';
import type { CollarTag } from '../../../../shared/model/collar-tag';
import { DeviceDb } from '../../core/db/device-db';

/**
 * Where a scanned tag leads: the collar's visit when the collar is on this device; otherwise the
 * install screen with the tag adopted — a blank tag printed for a new collar, or a collar this
 * device has not pulled yet (the install screen says to sync first in that case).
 */
@Injectable({ providedIn: 'root' })
export class TagOpener {
  private readonly deviceDb = inject(DeviceDb);
  private readonly router = inject(Router);

  async open(tag: CollarTag, opts: { replaceUrl?: boolean } = {}): Promise<'visit' | 'install'> {
    const collar = await this.deviceDb.run((db) => db.records('collar').get(tag.id)).catch(() => undefined);
    if (collar && !collar.deleted) {
      await this.router.navigate(['/walk/visit', tag.id], opts);
      return 'visit';
    }
    await this.router.navigate(['/walk/install'], { ...opts, queryParams: { tag: tag.id, ...(tag.code ? { code: tag.code } : {}) } });
    return 'install';
  }
}
