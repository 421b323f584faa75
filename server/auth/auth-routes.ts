import type { Request, Response } from 'express';
import type { PassportStatic } from 'passport';
import type { SessionUser } from '../../shared/auth/roles';
import { loginSchema } from '../../shared/auth/user-schemas';
import { AppError } from '../core/errors';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import type { Csrf } from './csrf';
import { SESSION_COOKIE } from './session-middleware';
import type { RequestHandler } from 'express';

const WRONG_CREDENTIALS = 'Wrong e-mail or password';

function authenticate(passport: PassportStatic, req: Request, res: Response): Promise<SessionUser> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', (err: unknown, user: SessionUser | false, info?: { message?: string }) => {
      if (err) return reject(err);
      if (user) return resolve(user);
      if (info?.message === 'disabled') return reject(new AppError(403, 'This account is disabled; ask an admin to enable it.'));
      reject(new AppError(401, WRONG_CREDENTIALS));
    })(req, res, (e: unknown) => reject(e));
  });
}

function logIn(req: Request, user: SessionUser): Promise<void> {
  // passport ≥ 0.6 regenerates the session here, so the old CSRF token stops working.
  return new Promise((resolve, reject) => req.logIn(user, (err) => (err ? reject(err) : resolve())));
}

export function registerAuthRoutes(r: RouteRegistry, passport: PassportStatic, csrf: Csrf, loginLimiters: RequestHandler[]): void {
  r.add('get', '/api/auth/csrf', 'public', (req, res) => ({ token: csrf.token(req, res) }));

  r.add(
    'post',
    '/api/auth/login',
    'public',
    async (req, res) => {
      req.body = parse(loginSchema, req.body, 'Enter your e-mail and password');
      const user = await authenticate(passport, req, res);
      await logIn(req, user);
      return { user };
    },
    loginLimiters,
  );

  r.add('post', '/api/auth/logout', ALL_ROLES, async (req, res) => {
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
    await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
    res.clearCookie(SESSION_COOKIE).status(204).end();
  });

  r.add('get', '/api/auth/me', ALL_ROLES, (req) => ({ user: req.user }));
}
