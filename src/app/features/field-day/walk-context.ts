import { Injectable, computed, inject, linkedSignal } from '@angular/core';
import { AuthStore } from '../../core/auth/auth-store';
import { DeviceMemory, userKey } from '../../core/device/device-memory';

/** What the crew picked for today's walk and what the next collar should start from. */
export interface WalkChoice {
  campaignId: string | null;
  round: number;
  routeId: string | null;
  /** The crew turned the route around on the spot (on top of the campaign's direction). */
  flipped: boolean;
  analyzerId: string | null;
  /** The chamber profile this crew measures with today (each closure carries it). */
  profileId: string | null;
  /** When the analyzer was last chosen (ISO): it counts for closures on that day only. */
  kitAt: string | null;
  /** Probe kit remembered between collars: one probe is used along a whole route. */
  probeId: string;
  rodLengthCm: number | null;
  moistureKind: 'vwc' | 'permittivity';
}

const EMPTY: WalkChoice = {
  campaignId: null,
  round: 1,
  routeId: null,
  flipped: false,
  analyzerId: null,
  kitAt: null,
  profileId: null,
  probeId: '',
  rodLengthCm: null,
  moistureKind: 'vwc',
};

/** Remembered per user on this device (localStorage), so Walk reopens where the crew left it, offline too. */
@Injectable({ providedIn: 'root' })
export class WalkContext {
  private readonly auth = inject(AuthStore);
  private readonly memory = inject(DeviceMemory);
  private readonly key = computed(() => {
    const id = this.auth.user()?.id;
    return id ? userKey('walk', id) : null;
  });
  private readonly state = linkedSignal<WalkChoice>(() => {
    const key = this.key();
    const stored = key ? this.memory.read(key) : null;
    return { ...EMPTY, ...(stored && typeof stored === 'object' ? (stored as Partial<WalkChoice>) : {}) };
  });
  readonly choice = this.state.asReadonly();

  update(changes: Partial<WalkChoice>): void {
    // Choosing an analyzer (here or on the start of day) makes it today's analyzer.
    const next = {
      ...this.state(),
      ...changes,
      ...('analyzerId' in changes && !('kitAt' in changes) ? { kitAt: new Date().toISOString() } : {}),
    };
    this.state.set(next);
    const key = this.key();
    if (key) this.memory.write(key, next);
  }
}
