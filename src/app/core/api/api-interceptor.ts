import { HttpContextToken, HttpErrorResponse, HttpEvent, HttpInterceptorFn, HttpResponse } from '@angular/common/http';
import { inject } from '@angular/core';
import { Observable, catchError, from, switchMap, tap, throwError } from 'rxjs';
import { SessionExpiry } from '../auth/session-expiry';
import { isOfflineError, serverMessage } from './api-error';
import { ConnectionStatus } from './connection-status';
import { CsrfToken } from './csrf-token';

/** Set on requests whose 401 is an answer, not an ended session (sign-in, sign-out). */
export const SKIP_SESSION_EXPIRY = new HttpContextToken<boolean>(() => false);

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

function isApiUrl(url: string): boolean {
  return url === '/api' || url.startsWith('/api/');
}

/**
 * Every `/api` request: sends the session cookie and, when it changes state, the CSRF token;
 * bypasses the service worker (API answers must never come from its caches); reports reachability;
 * turns a 401 into "sign in again" instead of throwing the user out of the current screen.
 * A CSRF refusal is retried once with a fresh token, because the token changes with the session.
 */
export const apiInterceptor: HttpInterceptorFn = (req, next) => {
  if (!isApiUrl(req.url)) return next(req);
  const csrf = inject(CsrfToken);
  const connection = inject(ConnectionStatus);
  const expiry = inject(SessionExpiry);
  const changesState = STATE_CHANGING.has(req.method);
  const base = req.clone({ withCredentials: true, setHeaders: { 'ngsw-bypass': 'true' } });

  const send = (retried: boolean): Observable<HttpEvent<unknown>> => {
    const outgoing = changesState
      ? from(csrf.get()).pipe(switchMap((token) => next(base.clone({ setHeaders: { 'X-CSRF-Token': token } }))))
      : next(base);
    return outgoing.pipe(
      tap((event) => {
        if (event instanceof HttpResponse) connection.reportOnline();
      }),
      catchError((err: unknown) => {
        if (isOfflineError(err)) {
          connection.reportOffline();
        } else if (err instanceof HttpErrorResponse) {
          connection.reportOnline();
          if (err.status === 403 && changesState && !retried && /csrf|security token/i.test(serverMessage(err, ''))) {
            csrf.invalidate();
            return send(true);
          }
          if (err.status === 401 && !req.context.get(SKIP_SESSION_EXPIRY)) expiry.markExpired();
        }
        return throwError(() => err);
      }),
    );
  };
  return send(false);
};
