import { inject } from '@angular/core';
import { CanActivateFn, RedirectFunction, Router } from '@angular/router';
import { AuthStore } from './auth-store';
import { DestinationKey, homePathFor, mayOpen } from './destinations';

/** Screens behind sign-in; a remembered user counts, so this works offline. */
export const signedInGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthStore);
  if (auth.signedIn()) return true;
  const returnTo = state.url && state.url !== '/' ? { returnTo: state.url } : {};
  return inject(Router).createUrlTree(['/sign-in'], { queryParams: returnTo });
};

/** The sign-in page is for signed-out users; others go to their first screen. */
export const signedOutGuard: CanActivateFn = () => {
  const auth = inject(AuthStore);
  return auth.signedIn() ? inject(Router).parseUrl(homePathFor(auth.roles())) : true;
};

/** A destination only for the roles that own it; anyone else lands on their own first screen. */
export function destinationGuard(key: DestinationKey): CanActivateFn {
  return () => {
    const auth = inject(AuthStore);
    return mayOpen(key, auth.roles()) ? true : inject(Router).parseUrl(homePathFor(auth.roles()));
  };
}

/**
 * `''` inside the shell: the user's first destination. Redirects run while routes are matched,
 * before the shell's guard, so a signed-out visitor is sent to sign-in here as well.
 */
export const homeRedirect: RedirectFunction = () => {
  const auth = inject(AuthStore);
  return inject(Router).parseUrl(auth.signedIn() ? homePathFor(auth.roles()) : '/sign-in');
};

/** The "no screens for this account" page only for accounts that really have none. */
export const noDestinationsGuard: CanActivateFn = () => {
  const auth = inject(AuthStore);
  const home = homePathFor(auth.roles());
  return home === '/no-destinations' ? true : inject(Router).parseUrl(home);
};
