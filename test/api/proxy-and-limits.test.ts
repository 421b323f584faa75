import { randomInt } from 'node:crypto';
import request from 'supertest';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

/**
 * A documentation address (RFC 3849) of our own per call: the counters live in the shared test
 * database. Random in the first 56 bits, because the limiter counts an IPv6 client per /56.
 */
const clientAddress = () => `2001:db8:${randomInt(0, 0x10000).toString(16)}:${randomInt(0, 0x100).toString(16)}00::7`;
const otherAddress = clientAddress;

/**
 * The README's set-up behind a TLS proxy: TRUST_PROXY=1 from the environment, the proxy on
 * loopback forwarding X-Forwarded-Proto and X-Forwarded-For as nginx or Caddy do.
 */
describe('behind a TLS reverse proxy with TRUST_PROXY=1', () => {
  let t: TestApp;
  let saved: NodeJS.ProcessEnv;
  let admin: Awaited<ReturnType<typeof adminThroughProxy>> | undefined;
  beforeAll(async () => {
    saved = { ...process.env };
    Object.assign(process.env, {
      TRUST_PROXY: '1',
      LOGIN_MAX_FAILURES: '3',
      LOGIN_MAX_FAILURES_PER_ADDRESS: '5',
      LOGIN_WINDOW_MS: '60000',
    });
    t = await startTestApp();
  });
  afterAll(async () => {
    await t.close();
    process.env = saved;
  });

  /** The admin signs in through the proxy from an address of their own, so other files' failures never block it. */
  async function adminThroughProxy() {
    const agent = request.agent(t.app);
    const from = clientAddress();
    expect(
      (
        await agent
          .post('/api/auth/login')
          .set('X-Forwarded-For', from)
          .send({ email: demoEmail('admin'), password: 'fluxwalk-demo' })
      ).status,
    ).toBe(200);
    const csrf: string = (await agent.get('/api/auth/csrf').set('X-Forwarded-For', from)).body.token;
    return (path: string, body: object) => agent.post(path).set('X-Forwarded-For', from).set('X-CSRF-Token', csrf).send(body);
  }

  async function freshUser(): Promise<string> {
    admin ??= await adminThroughProxy();
    const email = `proxy-${Date.now()}-${Math.random().toString(36).slice(2, 8)}@fluxwalk.example`;
    expect((await admin('/api/users', { email, displayName: 'Proxy Test', password: 'fluxwalk-demo', roles: ['crew'] })).status).toBe(201);
    return email;
  }
  const login = (from: string, email: string, password: string) =>
    request(t.app).post('/api/auth/login').set('X-Forwarded-For', from).set('X-Forwarded-Proto', 'https').send({ email, password });

  it('when the proxy forwards an HTTPS request, then the session cookie is Secure', async () => {
    const res = await login(clientAddress(), demoEmail('lab'), 'fluxwalk-demo');
    expect(res.status).toBe(200);
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fluxwalk.sid='))!;
    expect(cookie).toMatch(/;\s*Secure/i);
  });

  it('when one client fails too often, then only that client address is locked out of the account', async () => {
    const email = await freshUser();
    const attacker = clientAddress();
    const owner = otherAddress();
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await login(attacker, email, 'wrong')).status);
    statuses.push((await login(attacker, email, 'fluxwalk-demo')).status);
    expect(statuses).toEqual([401, 401, 401, 429]);
    expect((await login(owner, email, 'fluxwalk-demo')).status).toBe(200);
  });

  it('when one address tries many accounts, then it is stopped across accounts while other addresses still sign in', async () => {
    const guesser = clientAddress();
    const emails: string[] = [];
    for (let i = 0; i < 6; i++) emails.push(await freshUser());
    const statuses: number[] = [];
    for (const email of emails) statuses.push((await login(guesser, email, 'wrong')).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    const blocked = await login(guesser, emails[0], 'fluxwalk-demo');
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.message).toMatch(/too many failed sign-ins from this address/i);
    expect((await login(otherAddress(), emails[5], 'fluxwalk-demo')).status).toBe(200);
  });

  it('when two server processes share the database, then failures from one address through either count together', async () => {
    const other = await startTestApp();
    try {
      const guesser = clientAddress();
      const emails: string[] = [];
      for (let i = 0; i < 6; i++) emails.push(await freshUser());
      const statuses: number[] = [];
      for (const [i, email] of emails.entries()) {
        const app = i % 2 ? other.app : t.app;
        statuses.push(
          (await request(app).post('/api/auth/login').set('X-Forwarded-For', guesser).send({ email, password: 'wrong' })).status,
        );
      }
      expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    } finally {
      await other.close();
    }
  });

  it('when one address asks for resets of many accounts, then it is stopped after 20 while another address still may ask', async () => {
    const from = clientAddress();
    const agent = request.agent(t.app);
    const csrf: string = (await agent.get('/api/auth/csrf').set('X-Forwarded-For', from)).body.token;
    const ask = (who: string, email: string) =>
      agent.post('/api/auth/password-reset').set('X-Forwarded-For', who).set('X-CSRF-Token', csrf).send({ email });
    const statuses: number[] = [];
    for (let i = 0; i < 21; i++) statuses.push((await ask(from, `nobody-${i}-${Date.now()}@reset-spray.example`)).status);
    expect(statuses.slice(0, 20).every((s) => s === 202)).toBe(true);
    expect(statuses[20]).toBe(429);
    expect((await ask(clientAddress(), 'someone@reset-spray.example')).status).toBe(202);
  });
});
