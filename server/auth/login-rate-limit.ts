import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import type { ServerConfig } from '../core/config';
import { errorBody } from '../core/errors';
import { PostgresRateLimitStore } from './postgres-rate-limit-store';

type LimitConfig = Pick<ServerConfig, 'loginMaxFailures' | 'loginMaxFailuresPerAddress' | 'loginWindowMs'>;

/** The client's address as the limiter counts it (an IPv6 client per /56, as it can change the rest). */
const address = (req: Request) => ipKeyGenerator(req.ip ?? '');

/**
 * Failed sign-ins, counted in PostgreSQL so every server process shares them; successful ones
 * are not counted. Two limits, both in the window:
 * - per client address across all e-mails (someone guessing many accounts from one place);
 * - per e-mail and address (a lockout that a stranger elsewhere cannot cause for the owner).
 * Behind a proxy the address is the client's only when TRUST_PROXY is set (server/core/config.ts).
 */
export function loginRateLimits(ds: DataSource, config: LimitConfig): RequestHandler[] {
  const minutes = Math.ceil(config.loginWindowMs / 60000);
  const limit = (prefix: string, max: number, key: (req: Request) => string, message: string) =>
    rateLimit({
      windowMs: config.loginWindowMs,
      limit: max,
      skipSuccessfulRequests: true,
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
      'login-address:',
      config.loginMaxFailuresPerAddress,
      address,
      `Too many failed sign-ins from this address. Wait up to ${minutes} minutes and try again.`,
    ),
    limit(
      'login:',
      config.loginMaxFailures,
      (req) => `${emailOf(req)}|${address(req)}`,
      `Too many failed sign-ins for this e-mail from this address. Wait up to ${minutes} minutes and try again, or ask an admin to check the account.`,
    ),
  ];
}

function emailOf(req: Request): string {
  return typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
}
