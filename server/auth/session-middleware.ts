import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import type { PostgresDriver } from 'typeorm/driver/postgres/PostgresDriver';

export const SESSION_COOKIE = 'fluxwalk.sid';
const THIRTY_DAYS_MS = 30 * 24 * 3600 * 1000;

/**
 * Sessions live in PostgreSQL (table `session`, made by a migration), so any server process
 * behind the proxy can answer any request. Cookies: httpOnly, SameSite=Lax, Secure when the
 * request came over TLS (`secure: 'auto'` with `trust proxy`). A row is stored only once someone
 * signs in (saveUninitialized: false, and anonymous CSRF tokens need no session: auth/csrf.ts);
 * expired rows are deleted by the scheduled purge job (auth/auth-purge-job.ts), once for all processes.
 */
export function sessionMiddleware(ds: DataSource, secret: string): RequestHandler {
  const PgStore = connectPgSimple(session);
  const pool = (ds.driver as PostgresDriver).master;
  return session({
    name: SESSION_COOKIE,
    secret,
    store: new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: false }),
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: THIRTY_DAYS_MS },
  });
}
