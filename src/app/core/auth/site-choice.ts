import { Injectable, computed, inject, linkedSignal } from '@angular/core';
import { DeviceMemory, userKey } from '../device/device-memory';
import { AuthStore } from './auth-store';
import { SiteSummary } from './session-user';

function keyFor(userId: string): string {
  return userKey('site', userId);
}

/**
 * The site the user works on now, picked from their sites in the user menu and remembered per
 * user on this device. Falls back to the first site when the remembered one is no longer theirs.
 */
@Injectable({ providedIn: 'root' })
export class SiteChoice {
  private readonly auth = inject(AuthStore);
  private readonly memory = inject(DeviceMemory);

  private readonly chosenId = linkedSignal<string | null>(() => {
    const user = this.auth.user();
    const stored = user ? this.memory.read(keyFor(user.id)) : null;
    return typeof stored === 'string' ? stored : null;
  });

  readonly current = computed<SiteSummary | null>(() => {
    const sites = this.auth.sites();
    return sites.find((s) => s.id === this.chosenId()) ?? sites[0] ?? null;
  });

  choose(siteId: string): void {
    const user = this.auth.user();
    if (!user || !this.auth.sites().some((s) => s.id === siteId)) return;
    this.chosenId.set(siteId);
    this.memory.write(keyFor(user.id), siteId);
  }
}
