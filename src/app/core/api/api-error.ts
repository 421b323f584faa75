import { HttpErrorResponse } from '@angular/common/http';

/** Gateway answers that mean "the Fluxwalk server was not reached" when they lack its error body. */
const UNREACHABLE = new Set([502, 503, 504]);

/**
 * True when the request never reached the server: the browser reports status 0; Angular's
 * service worker answers 504 with an empty body when its own fetch fails; a reverse proxy (or
 * the dev-server proxy) answers 502/503/504 when the server is down. Our server's own errors
 * always carry `{"error":{"message"}}`, so those are never mistaken for offline. After an offline
 * reload `navigator.onLine` may still read true, so the failed request is the signal we trust.
 */
export function isOfflineError(err: unknown): boolean {
  if (!(err instanceof HttpErrorResponse)) return false;
  if (err.status === 0) return true;
  return UNREACHABLE.has(err.status) && !hasServerErrorBody(err);
}

function hasServerErrorBody(err: HttpErrorResponse): boolean {
  const body = err.error as { error?: { message?: unknown } } | null;
  return typeof body === 'object' && body !== null && typeof body.error?.message === 'string';
}

export interface FieldProblem {
  path: string;
  message: string;
}

/** The server's error message (`{"error":{"message"}}`), or a plain fallback. */
export function serverMessage(err: unknown, fallback: string): string {
  if (err instanceof HttpErrorResponse && hasServerErrorBody(err)) {
    return (err.error as { error: { message: string } }).error.message;
  }
  return fallback;
}

export function fieldProblems(err: unknown): FieldProblem[] {
  if (!(err instanceof HttpErrorResponse)) return [];
  const fields = (err.error as { error?: { fields?: unknown } } | null)?.error?.fields;
  if (!Array.isArray(fields)) return [];
  return fields.flatMap((f: unknown) => {
    const p = f as { path?: unknown; message?: unknown };
    return typeof p?.path === 'string' && typeof p.message === 'string' ? [{ path: p.path, message: p.message }] : [];
  });
}

/**
 * Seconds to wait from a Retry-After header, which is either a number of seconds or an HTTP date
 * (RFC 9110 §10.2.3). Null when absent or unreadable.
 */
export function retryAfterSeconds(err: HttpErrorResponse, now: number = Date.now()): number | null {
  const raw = err.headers?.get('Retry-After');
  if (!raw) return null;
  if (/^\d+$/.test(raw.trim())) return Number(raw.trim());
  const at = Date.parse(raw);
  return Number.isNaN(at) ? null : Math.max(0, Math.ceil((at - now) / 1000));
}
