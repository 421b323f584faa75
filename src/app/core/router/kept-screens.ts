import { ComponentRef, Injectable, effect, inject } from '@angular/core';
import { ActivatedRouteSnapshot, BaseRouteReuseStrategy, DetachedRouteHandle, Route } from '@angular/router';
import { AuthStore } from '../auth/auth-store';

/** How long a kept screen waits for the user to come back before it is made anew. */
export const KEEP_SCREEN_MS = 20 * 60_000;

interface Kept {
  config: Route;
  handle: DetachedRouteHandle;
  userId: string | null;
  at: number;
}

/**
 * Screens whose route says `data: { keepScreen: true }` (Walk's route list) are kept, drawn, while
 * the user opens one of its collars or the map, and put back when they return: going back to a
 * route of thousands of collars then costs no new screen. One screen is kept at a time, for the
 * same user only, for KEEP_SCREEN_MS at most; everything on it stays live (signals, device queries).
 */
@Injectable({ providedIn: 'root' })
export class KeptScreens extends BaseRouteReuseStrategy {
  private readonly auth = inject(AuthStore);
  private kept: Kept | null = null;
  /** For tests: the clock. */
  now = () => Date.now();

  constructor() {
    super();
    // Signed out, or another user: the kept screen ends at once (its device queries read that user's data).
    // An effect because it drives the router's kept view (not a data load).
    effect(() => {
      const id = this.auth.user()?.id ?? null;
      if (this.kept && this.kept.userId !== id) this.drop();
    });
  }

  override shouldDetach(route: ActivatedRouteSnapshot): boolean {
    return route.routeConfig?.data?.['keepScreen'] === true;
  }

  override store(route: ActivatedRouteSnapshot, handle: DetachedRouteHandle | null): void {
    // The router stores null right after it has put a retrieved screen back: that screen lives on.
    if (!handle) {
      if (this.kept?.config === route.routeConfig) this.kept = null;
      return;
    }
    if (this.kept && this.kept.handle !== handle) destroy(this.kept.handle);
    this.kept = { config: route.routeConfig!, handle, userId: this.userId(), at: this.now() };
  }

  override shouldAttach(route: ActivatedRouteSnapshot): boolean {
    const k = this.kept;
    if (!k || k.config !== route.routeConfig) return false;
    if (k.userId === this.userId() && this.now() - k.at <= KEEP_SCREEN_MS) return true;
    // Another user on this device, or kept too long ("today" may have moved on): made anew.
    this.drop();
    return false;
  }

  override retrieve(route: ActivatedRouteSnapshot): DetachedRouteHandle | null {
    return this.kept && this.kept.config === route.routeConfig ? this.kept.handle : null;
  }

  private drop(): void {
    if (this.kept) destroy(this.kept.handle);
    this.kept = null;
  }

  private userId(): string | null {
    return this.auth.user()?.id ?? null;
  }
}

/** A detached handle holds the screen's component (the router's own shape); destroying it ends its queries. */
function destroy(handle: DetachedRouteHandle): void {
  (handle as { componentRef?: ComponentRef<unknown> }).componentRef?.destroy();
}
