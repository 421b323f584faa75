import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { csrfSync } from 'csrf-sync';
import type { Request, RequestHandler, Response } from 'express';
import { AppError } from '../core/errors';
import { CSRF_EXEMPT } from '../core/route-registry';

/** Holds a random value that anonymous CSRF tokens are bound to; no server-side row behind it. */
export const ANONYMOUS_CSRF_COOKIE = 'fluxwalk.csrf';
const STALE = 'Missing or stale security token: fetch GET /api/auth/csrf and send it as X-CSRF-Token';
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export interface Csrf {
  /** The token to send back as X-CSRF-Token: tied to the session once signed in, to a cookie before. */
  token(req: Request, res: Response): string;
  protect: RequestHandler;
}

/**
 * Two kinds of CSRF token, so that a session row exists only for a signed-in user:
 * - signed in: synchroniser token kept in the server-side session (csrf-sync); a new session
 *   (sign-in regenerates it) means a new token;
 * - not signed in: a signed double-submit token, HMAC(secret, random cookie value). A page on
 *   another site can neither read the cookie nor the token, so it cannot send a matching pair,
 *   and nothing is stored on the server for a visitor.
 */
export function createCsrf(secret: string): Csrf {
  const sync = csrfSync({ getTokenFromRequest: (req) => header(req) });
  const sign = (nonce: string) => createHmac('sha256', secret).update(`anonymous-csrf:${nonce}`).digest('base64url');
  const signedIn = (req: Request) => Boolean(req.user && req.session);

  return {
    token(req, res) {
      if (signedIn(req)) return sync.generateToken(req);
      let nonce = readCookie(req, ANONYMOUS_CSRF_COOKIE);
      if (!nonce || !/^[A-Za-z0-9_-]{22,64}$/.test(nonce)) {
        nonce = randomBytes(24).toString('base64url');
        res.cookie(ANONYMOUS_CSRF_COOKIE, nonce, { httpOnly: true, sameSite: 'lax', secure: req.secure, path: '/api' });
      }
      return sign(nonce);
    },
    protect(req, _res, next) {
      if (SAFE.has(req.method) || CSRF_EXEMPT.includes(`${req.method} ${req.baseUrl}${req.path}`)) return next();
      const ok = signedIn(req) ? sync.isRequestValid(req) : anonymousValid(req, sign);
      next(ok ? undefined : new AppError(403, STALE));
    },
  };
}

function header(req: Request): string | undefined {
  const v = req.headers['x-csrf-token'];
  return typeof v === 'string' ? v : undefined;
}

function anonymousValid(req: Request, sign: (nonce: string) => string): boolean {
  const nonce = readCookie(req, ANONYMOUS_CSRF_COOKIE);
  const sent = header(req);
  if (!nonce || !sent) return false;
  const want = Buffer.from(sign(nonce));
  const got = Buffer.from(sent);
  return want.length === got.length && timingSafeEqual(want, got);
}

/** One cookie's value from the Cookie header (the app has no cookie parser; express-session reads its own). */
function readCookie(req: Request, name: string): string | null {
  for (const part of (req.headers.cookie ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i > 0 && part.slice(0, i).trim() === name) return part.slice(i + 1).trim();
  }
  return null;
}
