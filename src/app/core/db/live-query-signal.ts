import { DestroyRef, Signal, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { liveQuery } from 'dexie';
import { Observable, of, retry, switchMap } from 'rxjs';
import type { FluxDb } from './db-schema';
import { DeviceDb } from './device-db';

/** Dexie's liveQuery as an RxJS stream: re-runs whenever a table it read changes (in any tab). */
export function liveQuery$<T>(query: () => Promise<T>): Observable<T> {
  return new Observable<T>((sub) => {
    const s = liveQuery(query).subscribe({ next: (v) => sub.next(v), error: (e) => sub.error(e) });
    return () => s.unsubscribe();
  });
}

/**
 * A signal that always holds the query's latest answer from the signed-in user's database, for
 * the current parameters. Screens read Dexie only, so they behave the same offline and online.
 * Call in an injection context.
 */
export function liveSignal<P, T>(params: () => P, query: (db: FluxDb, p: P) => Promise<T>, initial: T): Signal<T> {
  const deviceDb = inject(DeviceDb);
  const out = signal<T>(initial);
  const input = computed(() => ({ db: deviceDb.db(), p: params() }));
  toObservable(input)
    .pipe(
      // A closed or lost connection ends a live query; it starts again once the database is back.
      switchMap(({ db, p }) => (db ? liveQuery$(() => query(db, p)).pipe(retry({ delay: 1000 })) : of(initial))),
      takeUntilDestroyed(inject(DestroyRef)),
    )
    .subscribe({ next: (v) => out.set(v), error: (e) => console.error('[live query]', e) });
  return out.asReadonly();
}
