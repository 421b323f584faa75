import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import { errorBody } from '../core/errors';
import { PostgresRateLimitStore } from './postgres-rate-limit-store';

/** Counts failed sign-ins per e-mail + address; successful ones are not counted. */
export function loginRateLimit(ds: DataSource, maxFailures: number, windowMs: number): RequestHandler {
  return rateLimit({
    windowMs,
    limit: maxFailures,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    store: new PostgresRateLimitStore(ds, 'login:'),
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${email}|${ipKeyGenerator(req.ip ?? '')}`;
    },
    handler: (_req, res, _next, options) => {
      const minutes = Math.ceil(options.windowMs / 60000);
      res.status(429).json(errorBody(
        `Too many failed sign-ins for this e-mail from this address. Wait up to ${minutes} minutes and try again, or ask an admin to check the account.`));
    },
  });
}
