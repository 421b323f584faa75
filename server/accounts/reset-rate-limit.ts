import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import { PostgresRateLimitStore } from '../auth/postgres-rate-limit-store';
import { errorBody } from '../core/errors';

/**
 * Reset requests per address + client, counted in PostgreSQL like failed sign-ins, so nobody
 * floods an inbox through several server processes. Every request counts (each one sends a mail).
 */
export function resetRateLimit(ds: DataSource, max = 5, windowMs = 60 * 60_000): RequestHandler {
  return rateLimit({
    windowMs,
    limit: max,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    store: new PostgresRateLimitStore(ds, 'reset:'),
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${email}|${ipKeyGenerator(req.ip ?? '')}`;
    },
    handler: (_req, res, _next, options) => {
      res.status(429).json(errorBody(`Too many reset requests for this address. Wait up to ${Math.ceil(options.windowMs / 60_000)} minutes and look in your inbox (and spam folder) for the links already sent.`));
    },
  });
}
