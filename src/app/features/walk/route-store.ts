import { DestroyRef, Injectable, Signal, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { Observable, ReplaySubject, combineLatest, map, of, retry, share, switchMap, timer } from 'rxjs';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { liveQuery$ } from '../../core/db/live-query-signal';
import { loadRoundRecords, loadRoutePlan, routeRows, type RouteParams, type RouteView } from './route-query';

export type { RouteParams, RouteRow, RouteView } from './route-query';

/** How long a route no screen shows stays ready (route → visit → route reuses it). */
const KEEP_MS = 60_000;

/**
 * The route of the walk, shared by the route list, the visit screen's "next collar" and the map.
 * The collars are read once per route and round (the read that grows with the route), the
 * round's records on every save; a screen opened from another one gets the route at once.
 */
@Injectable({ providedIn: 'root' })
export class RouteStore {
  private readonly deviceDb = inject(DeviceDb);
  private readonly shared = new WeakMap<FluxDb, Map<string, Observable<RouteView | null>>>();

  /** The route for the given choice, live; call in an injection context. */
  view(params: () => RouteParams): Signal<RouteView | null | undefined> {
    const out = signal<RouteView | null | undefined>(undefined);
    const input = computed(() => ({ db: this.deviceDb.db(), p: params() }), {
      equal: (a, b) => a.db === b.db && keyOf(a.p) === keyOf(b.p),
    });
    toObservable(input)
      .pipe(
        switchMap(({ db, p }) => (db ? this.live(db, p) : of(undefined))),
        takeUntilDestroyed(inject(DestroyRef)),
      )
      .subscribe({ next: (v) => out.set(v), error: (e) => console.error('[route]', e) });
    return out.asReadonly();
  }

  private live(db: FluxDb, p: RouteParams): Observable<RouteView | null> {
    const byKey = this.shared.get(db) ?? new Map<string, Observable<RouteView | null>>();
    this.shared.set(db, byKey);
    const key = keyOf(p);
    let view = byKey.get(key);
    if (!view) {
      // A closed or lost connection ends a live query; it starts again once the database is back.
      const plan$ = liveQuery$(() => loadRoutePlan(db, p)).pipe(retry({ delay: 1000 }));
      const round$ = liveQuery$(() => loadRoundRecords(db, p)).pipe(retry({ delay: 1000 }));
      view = combineLatest([plan$, round$]).pipe(
        map(([plan, round]) =>
          plan ? { rows: routeRows(plan, round), due: plan.due, direction: plan.direction, rounds: plan.rounds, round: p.round } : null,
        ),
        share({ connector: () => new ReplaySubject(1), resetOnRefCountZero: () => timer(KEEP_MS), resetOnError: true }),
      );
      byKey.set(key, view);
    }
    return view;
  }
}

function keyOf(p: RouteParams): string {
  return `${p.campaignId}|${p.routeId}|${p.round}|${p.flipped}`;
}
