import { HttpErrorResponse } from '@angular/common/http';
import { isOfflineError, retryAfterSeconds, serverMessage } from '../../core/api/api-error';

function waitText(seconds: number): string {
  if (seconds < 90) return `${seconds} seconds`;
  const minutes = Math.ceil(seconds / 60);
  return minutes === 1 ? 'a minute' : `${minutes} minutes`;
}

/** What the person at the sign-in form reads when signing in fails. */
export function describeSignInError(err: unknown): string {
  if (isOfflineError(err)) {
    return 'You are offline. Signing in needs a connection once; after that Fluxwalk also opens offline.';
  }
  if (!(err instanceof HttpErrorResponse)) return 'Signing in failed. Please try again.';
  switch (err.status) {
    case 400:
    case 401:
      return serverMessage(err, 'The e-mail or the password is not right.');
    case 403:
      return serverMessage(err, 'This account is disabled. Ask an admin of your site to enable it again.');
    case 429: {
      const wait = retryAfterSeconds(err);
      const when = wait === null ? 'later' : `in ${waitText(wait)}`;
      return `Too many failed sign-in attempts with this e-mail. To protect the account, signing in is paused — try again ${when}.`;
    }
    default:
      return serverMessage(err, `The server could not sign you in (error ${err.status}). Please try again.`);
  }
}
