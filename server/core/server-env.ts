import { randomBytes } from 'node:crypto';
import { z } from 'zod';

/** Connections a process holds unless DB_POOL_SIZE says otherwise. */
export const DEFAULT_DB_POOL_SIZE = 40;

/** Pulls a process serves at once unless PULL_SLOTS says otherwise. */
export const DEFAULT_PULL_SLOTS = 1;

/** A number setting: unset or empty takes the default; anything else must be a finite number. */
const numberSetting = (name: string, fallback: number) =>
  z
    .string()
    .optional()
    .transform((raw, ctx) => {
      if (raw === undefined || raw === '') return fallback;
      const n = Number(raw);
      if (!Number.isFinite(n)) ctx.addIssue({ code: 'custom', message: `${name} must be a number, got "${raw}"` });
      return n;
    });

/** A count setting: unset or empty takes the default; anything else must be a whole number of at least `min`. */
const wholeNumberSetting = (name: string, fallback: number, min: number) =>
  z
    .string()
    .optional()
    .transform((raw, ctx) => {
      const text = raw?.trim();
      if (!text) return fallback;
      const n = Number(text);
      if (!Number.isInteger(n) || n < min)
        ctx.addIssue({ code: 'custom', message: `${name} must be a whole number of at least ${min}, got "${raw}"` });
      return n;
    });

/** A text setting where an empty value means unset (SMTP_*, MAIL_FROM): null or the default. */
const textOrNull = z
  .string()
  .optional()
  .transform((raw) => raw || null);

/**
 * Every environment variable the server reads, with its default: parsed once at start
 * (`serverEnv()`), so each setting has one home and one type. Object storage reads its own
 * S3_* variables (attachments/object-storage.ts).
 */
export const SERVER_ENV = z.object({
  DATABASE_URL: z.string().optional(),
  HOST: z.string().default('127.0.0.1'),
  PORT: numberSetting('PORT', 8080),
  STATIC_DIR: z.string().nullable().default(null),
  // Sessions live in PostgreSQL; every process behind a proxy must share this secret.
  SESSION_SECRET: z.string().default(() => randomBytes(32).toString('hex')),
  APP_ORIGIN: z.string().optional(),
  NODE_ENV: z.string().optional(),
  TRUST_PROXY: z.string().optional(),
  LOGIN_MAX_FAILURES: numberSetting('LOGIN_MAX_FAILURES', 8),
  LOGIN_MAX_FAILURES_PER_ADDRESS: numberSetting('LOGIN_MAX_FAILURES_PER_ADDRESS', 100),
  LOGIN_WINDOW_MS: numberSetting('LOGIN_WINDOW_MS', 15 * 60 * 1000),
  /** `off`: this process serves the API only (no job workers, no digest ticks). */
  JOB_WORKERS: z.string().optional(),
  /** PostgreSQL connections one process may hold (see ServerConfig.dbPoolSize). */
  DB_POOL_SIZE: wholeNumberSetting('DB_POOL_SIZE', DEFAULT_DB_POOL_SIZE, 2),
  /** Pulls one process serves at once (see ServerConfig.pullSlots). */
  PULL_SLOTS: wholeNumberSetting('PULL_SLOTS', DEFAULT_PULL_SLOTS, 1),
  /** How often each worker process asks for due digests, in seconds. */
  DIGEST_TICK_SECONDS: numberSetting('DIGEST_TICK_SECONDS', 30),
  SMTP_HOST: textOrNull,
  SMTP_PORT: z
    .string()
    .optional()
    .transform((raw, ctx) => {
      const port = Number(raw || 587);
      if (!Number.isInteger(port) || port <= 0) ctx.addIssue({ code: 'custom', message: `SMTP_PORT must be a port number, got "${raw}"` });
      return port;
    }),
  SMTP_USER: textOrNull,
  SMTP_PASS: textOrNull,
  MAIL_FROM: z
    .string()
    .optional()
    .transform((raw) => raw || 'Fluxwalk <fluxwalk@localhost>'),
});

export type ServerEnv = z.infer<typeof SERVER_ENV>;

/** The environment read through SERVER_ENV; a bad value stops the start with the setting's own message. */
export function serverEnv(env: NodeJS.ProcessEnv = process.env): ServerEnv {
  const parsed = SERVER_ENV.safeParse(env);
  if (!parsed.success) throw new Error(parsed.error.issues.map((i) => i.message).join('; '));
  return parsed.data;
}
