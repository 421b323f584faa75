import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import { PostgresRateLimitStore } from '../auth/postgres-rate-limit-store';
import { errorBody } from '../core/errors';

const address = (req: Request) => ipKeyGenerator(req.ip ?? '');
const emailOf = (req: Request) => (typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '');

/**
 * Reset requests, counted in PostgreSQL like failed sign-ins, so nobody floods inboxes through
 * several server processes. Every request counts (each one may send a mail): per address and
 * client, and per client across addresses (one client asking for many accounts' resets).
 */
export function resetRateLimit(ds: DataSource, max = 5, maxPerClient = 20, windowMs = 60 * 60_000): RequestHandler[] {
  const minutes = Math.ceil(windowMs / 60_000);
  const limit = (prefix: string, n: number, key: (req: Request) => string, message: string) =>
    rateLimit({
      windowMs,
      limit: n,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      store: new PostgresRateLimitStore(ds, prefix),
      keyGenerator: key,
      handler: (_req, res) => {
        res.status(429).json(errorBody(message));
      },
    });
  return [
    limit(
      'reset-address:',
      maxPerClient,
      address,
      `Too many reset requests from this address. Wait up to ${minutes} minutes and look in your inbox (and spam folder) for the links already sent.`,
    ),
    limit(
      'reset:',
      max,
      (req) => `${emailOf(req)}|${address(req)}`,
      `Too many reset requests for this address. Wait up to ${minutes} minutes and look in your inbox (and spam folder) for the links already sent.`,
    ),
  ];
}
