import type { Express, NextFunction, Request, RequestHandler, Response } from 'express';
import type { Role } from '../../shared/auth/roles';
import { AppError } from './errors';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
export type Access = readonly Role[] | 'public';

export interface RegisteredRoute {
  method: Method;
  path: string;
  access: Access;
}

/**
 * Routes anyone may call without signing in. Anything else must name the roles allowed;
 * the role-matrix test walks the registry and fails for a route that does neither.
 */
export const PUBLIC_ROUTES: readonly string[] = [
  'GET /api/health',
  'GET /api/auth/csrf',
  'POST /api/auth/login',
  'POST /api/invitations/lookup',
  'POST /api/invitations/accept',
  'POST /api/auth/password-reset',
  'POST /api/auth/password-reset/confirm',
];

/** Public routes that change state without a CSRF token (the token arrives with the session they start). */
export const CSRF_EXEMPT: readonly string[] = ['POST /api/auth/login'];

export const ALL_ROLES: readonly Role[] = ['crew', 'lead', 'lab', 'admin'];

export type Handler = (req: Request, res: Response) => unknown;

export function requireRoles(roles: readonly Role[]): RequestHandler {
  return (req: Request, _res: Response, next: NextFunction) => {
    if (!req.user) return next(new AppError(401, 'Sign in to continue'));
    if (!req.user.roles.some((r) => roles.includes(r))) {
      return next(new AppError(403, 'Your role does not allow this'));
    }
    next();
  };
}

/** Registers every API route through one door, recording method, path and who may call it. */
export class RouteRegistry {
  readonly routes: RegisteredRoute[] = [];

  constructor(private readonly app: Express) {}

  /** `before` runs ahead of the handler (e.g. a rate limiter) but after the role check. */
  add(method: Method, path: string, access: Access, handler: Handler, before: RequestHandler[] = []): void {
    const key = `${method.toUpperCase()} ${path}`;
    if (access === 'public' && !PUBLIC_ROUTES.includes(key)) {
      throw new Error(`${key} is marked public but is not in PUBLIC_ROUTES`);
    }
    if (access !== 'public' && access.length === 0) throw new Error(`${key} has no role rule`);
    this.routes.push({ method, path, access });
    const guard: RequestHandler[] = access === 'public' ? [] : [requireRoles(access)];
    // Express 5 passes rejected promises to the error middleware, so handlers may be async.
    // A handler returns the JSON body, or answers itself through `res`.
    const run = async (req: Request, res: Response) => {
      const result = await handler(req, res);
      if (!res.headersSent) res.json(result ?? null);
    };
    this.app[method](path, ...guard, ...before, run);
  }
}
