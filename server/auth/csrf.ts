import { csrfSync } from 'csrf-sync';
import type { Request, RequestHandler } from 'express';
import { AppError } from '../core/errors';
import { CSRF_EXEMPT } from '../core/route-registry';

/**
 * Synchroniser-token CSRF: the token lives in the server-side session and comes back in the
 * X-CSRF-Token header. A new session (sign-in regenerates it) means a new token.
 */
const { generateToken, isRequestValid } = csrfSync({
  getTokenFromRequest: (req) => req.headers['x-csrf-token'] as string | undefined,
});

export function csrfToken(req: Request): string {
  return generateToken(req);
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method) || CSRF_EXEMPT.includes(`${req.method} ${req.baseUrl}${req.path}`)) return next();
  if (!req.session || !isRequestValid(req)) {
    return next(new AppError(403, 'Missing or stale security token: fetch GET /api/auth/csrf and send it as X-CSRF-Token'));
  }
  next();
};
