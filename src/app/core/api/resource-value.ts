import { computed, type Resource, type Signal } from '@angular/core';
import { serverMessage } from './api-error';

/** A resource's value, or `empty` while it has none (the first load, or a failed one: `loadProblem` says why). */
export function loadedOr<T>(res: Resource<T | undefined>, empty: T): Signal<T> {
  return computed(() => (res.hasValue() ? res.value() : empty));
}

/** Words for a failed load (the server's own message where it sent one), '' while nothing failed. */
export function loadProblem(res: Resource<unknown>, fallback: string): Signal<string> {
  return computed(() => {
    const err = res.error();
    return err ? serverMessage(err, fallback) : '';
  });
}
