import request from 'supertest';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

describe('sign-in', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when a demo user signs in with the right password, then the answer lists their roles and sites', async () => {
    const s = await signIn(t.app, demoEmail('crew'));
    expect(s.login.status).toBe(200);
    expect(s.login.body.user).toMatchObject({ email: 'crew@fluxwalk.example', roles: ['crew'] });
    expect(s.login.body.user.siteIds).toHaveLength(1);
    const me = await s.get('/api/auth/me');
    expect(me.body.user.email).toBe('crew@fluxwalk.example');
  });

  it('when lab or admin sign in, then siteIds lists every site', async () => {
    const lab = await signIn(t.app, demoEmail('lab'));
    const sites: { id: string }[] = await t.ds.query('SELECT id FROM site WHERE NOT deleted');
    expect([...lab.login.body.user.siteIds].sort()).toEqual(sites.map((s) => s.id).sort());
  });

  it('when the password is wrong or the user unknown, then both get the same 401 answer', async () => {
    const wrong = await signIn(t.app, demoEmail('lead'), 'not-the-password');
    const unknown = await signIn(t.app, 'nobody-here@fluxwalk.example', 'not-the-password');
    expect(wrong.login.status).toBe(401);
    expect(unknown.login.status).toBe(401);
    expect(wrong.login.body).toEqual(unknown.login.body);
    expect(wrong.login.body.error.message).toBe('Wrong e-mail or password');
  });

  it('when signed out, then /api/auth/me answers 401', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body.error.message).toMatch(/sign in/i);
  });

  it('when the session cookie is set, then it is httpOnly and SameSite=Lax, and not Secure over plain HTTP', async () => {
    const s = await signIn(t.app, demoEmail('lab'));
    const cookie = (s.login.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fluxwalk.sid='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i);
  });

  it('when the app sits behind a TLS proxy, then the session cookie is Secure', async () => {
    const behindProxy = await startTestApp({ trustProxy: 'loopback' });
    try {
      const agent = request.agent(behindProxy.app);
      const res = await agent
        .post('/api/auth/login')
        .set('X-Forwarded-Proto', 'https')
        .send({ email: demoEmail('lab'), password: 'fluxwalk-demo' });
      expect(res.status).toBe(200);
      const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fluxwalk.sid='))!;
      expect(cookie).toMatch(/;\s*Secure/i);
    } finally {
      await behindProxy.close();
    }
  });

  it('when a state-changing request has no CSRF token, then it is refused with 403', async () => {
    const s = await signIn(t.app, demoEmail('crew'));
    const res = await s.agent.post('/api/auth/logout');
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/X-CSRF-Token/);
    const stillIn = await s.get('/api/auth/me');
    expect(stillIn.status).toBe(200);
  });

  it('when signing in, then the CSRF token changes and the old one is refused', async () => {
    const agent = request.agent(t.app);
    const before: string = (await agent.get('/api/auth/csrf')).body.token;
    await agent.post('/api/auth/login').send({ email: demoEmail('crew'), password: 'fluxwalk-demo' });
    const after: string = (await agent.get('/api/auth/csrf')).body.token;
    expect(after).not.toBe(before);
    expect((await agent.post('/api/auth/logout').set('X-CSRF-Token', before)).status).toBe(403);
    expect((await agent.post('/api/auth/logout').set('X-CSRF-Token', after)).status).toBe(204);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });

  it('when a disabled user gives the right password, then the answer is 403 "account disabled"', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const created = await admin.post('/api/users', {
      email: `disabled-${Date.now()}@fluxwalk.example`,
      displayName: 'Test Disabled',
      password: 'a-long-password-1',
      roles: ['crew'],
    });
    expect(created.status).toBe(201);
    const open = await signIn(t.app, created.body.user.email, 'a-long-password-1');
    expect(open.login.status).toBe(200);
    const off = await admin.patch(`/api/users/${created.body.user.id}`, { disabled: true });
    expect(off.status).toBe(200);
    expect((await open.get('/api/auth/me')).status).toBe(401);
    const again = await signIn(t.app, created.body.user.email, 'a-long-password-1');
    expect(again.login.status).toBe(403);
    expect(again.login.body.error.message).toMatch(/disabled/i);
  });
});

describe('sign-in rate limit', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({ loginMaxFailures: 3, loginWindowMs: 60_000 });
  });
  afterAll(() => t.close());

  // Own users: the counters live in the shared test database, and other test files sign in the demo users.
  async function freshUser(): Promise<string> {
    const admin = await signIn(t.app, demoEmail('admin'));
    const email = `limit-${Date.now()}-${Math.random().toString(36).slice(2, 8)}@fluxwalk.example`;
    await admin.post('/api/users', { email, displayName: 'Limit Test', password: 'fluxwalk-demo', roles: ['crew'] });
    return email;
  }

  it('when an e-mail fails too often from one address, then further attempts get 429 — even with the right password', async () => {
    const email = await freshUser();
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await request(t.app).post('/api/auth/login').send({ email, password: 'bad' })).status);
    const blocked = await request(t.app).post('/api/auth/login').send({ email, password: 'fluxwalk-demo' });
    expect(statuses).toEqual([401, 401, 401]);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.message).toMatch(/too many failed sign-ins/i);
  });

  it('when sign-ins succeed, then they are not counted as failures', async () => {
    const email = await freshUser();
    for (let i = 0; i < 5; i++) {
      expect((await request(t.app).post('/api/auth/login').send({ email, password: 'fluxwalk-demo' })).status).toBe(200);
    }
  });
});
