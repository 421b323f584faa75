import { isIP } from 'node:net';
import { objectStorageFromEnv, type ObjectStorageConfig } from '../attachments/object-storage';
import { serverEnv, type ServerEnv } from './server-env';

/** Express's "trust proxy" setting: off, every hop, a hop count, or addresses/subnets/names. */
export type TrustProxy = boolean | number | string[];

/** Everything the server reads from the environment, read once through SERVER_ENV (server-env.ts, where the defaults live). */
export interface ServerConfig {
  databaseUrl: string;
  host: string;
  port: number;
  staticDir: string | null;
  sessionSecret: string;
  /**
   * The one origin of every absolute link the server hands out (mail, printed tags): APP_ORIGIN,
   * else the server's own configured address. Never taken from a request's Host header.
   */
  appOrigin: string;
  /** Set behind a TLS reverse proxy: cookies then become Secure and req.ip the client's. */
  trustProxy: TrustProxy | string;
  /** Failed sign-ins per e-mail and client address in the window. */
  loginMaxFailures: number;
  /** Failed sign-ins per client address across all e-mails in the window (guessing many accounts). */
  loginMaxFailuresPerAddress: number;
  loginWindowMs: number;
  /** S3-compatible storage for logger files and photos; null when not configured. */
  objectStorage: ObjectStorageConfig | null;
  /**
   * PostgreSQL connections this process may hold (DB_POOL_SIZE). A push holds one for its whole
   * transaction, most of it waiting on this process between statements, so a fleet's pushes need
   * many more connections than there are cores; keep processes × (this + 4 for the job queue) under
   * PostgreSQL's max_connections (100 by default).
   */
  dbPoolSize: number;
  /**
   * Pulls this process serves at once (PULL_SLOTS); more wait their turn. A pull page is bulk work
   * (thousands of rows read, built and serialised), and at a fleet's day's end a hundred of them at
   * once would hold every push's round trips behind their work on the event loop. With a few slots
   * the pushes, which bring the field's data in, stay quick; the pulls take the same CPU in turn.
   */
  pullSlots: number;
}

export { DEFAULT_DB_POOL_SIZE, DEFAULT_PULL_SLOTS } from './server-env';

export function loadConfig(overrides: Partial<ServerConfig> = {}, env: NodeJS.ProcessEnv = process.env): ServerConfig {
  const e = serverEnv(env);
  const databaseUrl = overrides.databaseUrl ?? e.DATABASE_URL;
  if (!databaseUrl) throw new Error('DATABASE_URL is not set (npm start sets it for its own cluster)');
  return {
    databaseUrl,
    host: e.HOST,
    port: e.PORT,
    staticDir: e.STATIC_DIR,
    sessionSecret: e.SESSION_SECRET,
    appOrigin: appOrigin(e),
    trustProxy: parseTrustProxy(e.TRUST_PROXY),
    loginMaxFailures: e.LOGIN_MAX_FAILURES,
    loginMaxFailuresPerAddress: e.LOGIN_MAX_FAILURES_PER_ADDRESS,
    loginWindowMs: e.LOGIN_WINDOW_MS,
    objectStorage: objectStorageFromEnv(),
    dbPoolSize: e.DB_POOL_SIZE,
    pullSlots: e.PULL_SLOTS,
    ...overrides,
  };
}

/**
 * The origin for links in mail and on tags. A request's Host (or X-Forwarded-Host) is chosen by
 * whoever sends it, so a reset link built from it can point at an attacker; hence only
 * APP_ORIGIN, or in development the address this server is configured to listen on.
 */
export function appOrigin(e: Pick<ServerEnv, 'APP_ORIGIN' | 'NODE_ENV' | 'HOST' | 'PORT'>): string {
  const raw = e.APP_ORIGIN?.trim();
  if (raw) return checkedOrigin(raw);
  if (e.NODE_ENV === 'production') {
    throw new Error(
      'APP_ORIGIN is not set, and NODE_ENV=production needs it: set APP_ORIGIN to the address people open, ' +
        'e.g. APP_ORIGIN=https://fluxwalk.example.org (links in invitation and reset mail and on printed tags use it).',
    );
  }
  // A wildcard bind address is no place to send anyone; loopback is where it answers in development.
  const host = e.HOST;
  const linkHost = host === '0.0.0.0' || host === '::' || host === '' ? '127.0.0.1' : host.includes(':') ? `[${host}]` : host;
  return `http://${linkHost}:${e.PORT}`;
}

function checkedOrigin(raw: string): string {
  const bad = () =>
    new Error(`APP_ORIGIN must be an origin like https://fluxwalk.example.org (scheme and host, optional port, no path), got "${raw}"`);
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    throw bad();
  }
  const onlyOrigin = (url.pathname === '/' || url.pathname === '') && !url.search && !url.hash && !url.username && !url.password;
  if (!['http:', 'https:'].includes(url.protocol) || !onlyOrigin || !/^https?:\/\//i.test(raw)) throw bad();
  return url.origin;
}

const PROXY_NAMES = ['loopback', 'linklocal', 'uniquelocal'];

/**
 * TRUST_PROXY as Express means it: "true"/"false", a hop count ("1": trust the one proxy in
 * front), or comma-separated addresses, subnets (CIDR) and the names loopback, linklocal,
 * uniquelocal. Express reads a plain string "1" as an address, which trusts nothing; so the
 * text is turned into the matching type here, and anything else stops the start with the forms.
 */
export function parseTrustProxy(raw: string | undefined): TrustProxy {
  const text = (raw ?? '').trim();
  if (text === '' || /^false$/i.test(text)) return false;
  if (/^true$/i.test(text)) return true;
  if (/^\d{1,3}$/.test(text)) return Number(text);
  const entries = text.split(',').map((e) => e.trim());
  if (entries.every(isProxyEntry)) return entries;
  throw new Error(
    `TRUST_PROXY must be true, false, a hop count (1 = the one proxy in front), or comma-separated addresses, ` +
      `subnets (10.0.0.0/8) and the names loopback, linklocal, uniquelocal; got "${raw}"`,
  );
}

function isProxyEntry(entry: string): boolean {
  if (PROXY_NAMES.includes(entry)) return true;
  const [addr, bits, ...rest] = entry.split('/');
  const family = isIP(addr ?? '');
  if (!family || rest.length) return false;
  if (bits === undefined) return true;
  if (!/^\d{1,3}$/.test(bits)) return false;
  return Number(bits) <= (family === 4 ? 32 : 128);
}
