import { randomBytes } from 'node:crypto';
import { objectStorageFromEnv, type ObjectStorageConfig } from '../attachments/object-storage';

/** Everything the server reads from the environment, read once, with the defaults documented here. */
export interface ServerConfig {
  databaseUrl: string;
  host: string;
  port: number;
  staticDir: string | null;
  sessionSecret: string;
  /** Set behind a TLS reverse proxy: cookies then become Secure and req.ip the client's. */
  trustProxy: string | false;
  loginMaxFailures: number;
  loginWindowMs: number;
  /** S3-compatible storage for logger files and photos; null when not configured. */
  objectStorage: ObjectStorageConfig | null;
}

function int(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isFinite(n)) throw new Error(`${name} must be a number, got "${raw}"`);
  return n;
}

export function loadConfig(overrides: Partial<ServerConfig> = {}): ServerConfig {
  const databaseUrl = overrides.databaseUrl ?? process.env['DATABASE_URL'];
  if (!databaseUrl) throw new Error('DATABASE_URL is not set (npm start sets it for its own cluster)');
  return {
    databaseUrl,
    host: process.env['HOST'] ?? '127.0.0.1',
    port: int('PORT', 8080),
    staticDir: process.env['STATIC_DIR'] ?? null,
    // Sessions live in PostgreSQL; every process behind a proxy must share this secret.
    sessionSecret: process.env['SESSION_SECRET'] ?? randomBytes(32).toString('hex'),
    trustProxy: process.env['TRUST_PROXY'] || false,
    loginMaxFailures: int('LOGIN_MAX_FAILURES', 8),
    loginWindowMs: int('LOGIN_WINDOW_MS', 15 * 60 * 1000),
    objectStorage: objectStorageFromEnv(),
    ...overrides,
  };
}
