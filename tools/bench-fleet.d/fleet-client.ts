/**
 * The fleet's view of the servers: one address made of several server processes, picked round-robin
 * per request (sessions live in PostgreSQL, so any process serves any device). A process that refuses
 * or drops a connection is taken out of the rotation and the request is sent again to the next one,
 * a bounded number of times: the device's retry after a crash, with the same body (and opIds).
 */
export class FleetAddress {
  private next = 0;
  readonly down = new Set<string>();
  /** Attempts that failed and were sent again (connection lost, 5xx), by reason. */
  retries = 0;
  readonly reasons = new Map<string, number>();

  constructor(private readonly bases: string[]) {}

  /** The answer with its body read: a body cut off by a dying process is sent again too. */
  async fetch(path: string, init: RequestInit, attempts = 8): Promise<{ res: Response; text: string }> {
    let last: unknown;
    for (let a = 0; a < attempts; a++) {
      const live = this.bases.filter((b) => !this.down.has(b));
      if (!live.length) throw new Error('no server process is left');
      const base = live[this.next++ % live.length];
      // The time limit races the request instead of only aborting it: in runs with 40 pooled connections
      // a few requests stayed pending in the client for ever, with no socket left and the abort ignored.
      const abort = new AbortController();
      let timer: NodeJS.Timeout | undefined;
      const limit = new Promise<never>((_, reject) => {
        timer = setTimeout(() => {
          const err = new Error(`no answer within ${ANSWER_LIMIT_MS / 1000} s`);
          abort.abort(err);
          reject(err);
        }, ANSWER_LIMIT_MS);
      });
      try {
        const { res, text } = await Promise.race([
          fetch(base + path, { ...init, signal: abort.signal }).then(async (res) => ({ res, text: await res.text() })),
          limit,
        ]);
        if (res.status < 500 || a === attempts - 1) return { res, text };
        last = new Error(`HTTP ${res.status}: ${text}`);
      } catch (err) {
        last = err;
        // Refused: that process is gone (the bench never restarts one). A reset (a kept-alive socket the
        // server closed, or a process killed mid-request) is only retried: the push is idempotent by opId.
        if (refused(err)) this.down.add(base);
      } finally {
        clearTimeout(timer);
      }
      this.retries++;
      const why = String((last as { cause?: { code?: string } }).cause?.code ?? (last as Error).message ?? last).slice(0, 60);
      this.reasons.set(why, (this.reasons.get(why) ?? 0) + 1);
      await sleep(100 * (a + 1));
    }
    throw last;
  }
}

function refused(err: unknown): boolean {
  const cause = (err as { cause?: { code?: string; errors?: { code?: string }[] } }).cause;
  return cause?.code === 'ECONNREFUSED' || !!cause?.errors?.some((e) => e.code === 'ECONNREFUSED');
}

const ANSWER_LIMIT_MS = 120_000;

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** A signed-in device: cookie jar and CSRF token, every call through the fleet's address. */
export async function deviceSession(addr: FleetAddress, email: string, password = 'fluxwalk-demo') {
  const jar = new Map<string, string>();
  let token = '';
  const call = async (method: string, path: string, body?: unknown): Promise<{ status: number; json: any }> => {
    const headers: Record<string, string> = { cookie: [...jar].map(([k, v]) => `${k}=${v}`).join('; '), accept: 'application/json' };
    if (body !== undefined) headers['content-type'] = 'application/json';
    if (token && method !== 'GET') headers['x-csrf-token'] = token;
    const { res, text } = await addr.fetch(path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    for (const c of res.headers.getSetCookie()) {
      const [kv] = c.split(';');
      const i = kv.indexOf('=');
      jar.set(kv.slice(0, i).trim(), kv.slice(i + 1));
    }
    return { status: res.status, json: text ? JSON.parse(text) : null };
  };
  token = (await call('GET', '/api/auth/csrf')).json.token;
  const login = await call('POST', '/api/auth/login', { email, password });
  if (login.status !== 200) throw new Error(`sign-in failed: ${login.status} ${JSON.stringify(login.json)}`);
  token = (await call('GET', '/api/auth/csrf')).json.token;
  return call;
}

export type Call = Awaited<ReturnType<typeof deviceSession>>;

export function percentile(xs: number[], p: number): number {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
}
