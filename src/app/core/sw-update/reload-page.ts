import { InjectionToken } from '@angular/core';

/** Reloads the page; a token so tests can see a reload without losing the test page. */
export const RELOAD_PAGE = new InjectionToken<() => void>('RELOAD_PAGE', {
  providedIn: 'root',
  factory: () => () => globalThis.location.reload(),
});
