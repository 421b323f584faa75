import request from 'supertest';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

describe('several server processes on one database', () => {
  let a: TestApp;
  let b: TestApp;
  beforeAll(async () => {
    a = await startTestApp({ loginMaxFailures: 2, loginWindowMs: 60_000 });
    b = await startTestApp({ loginMaxFailures: 2, loginWindowMs: 60_000 });
  });
  afterAll(async () => {
    await a.close();
    await b.close();
  });

  it('when a user signs in on one instance, then the other instance knows the session', async () => {
    const s = await signIn(a.app, demoEmail('crew'));
    const cookie = (s.login.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
    const me = await request(b.app).get('/api/auth/me').set('Cookie', cookie);
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('crew@fluxwalk.example');
  });

  it('when failures are spread over two instances, then they share one counter', async () => {
    const email = `shared-counter-${Date.now()}@fluxwalk.example`;
    expect((await request(a.app).post('/api/auth/login').send({ email, password: 'x' })).status).toBe(401);
    expect((await request(b.app).post('/api/auth/login').send({ email, password: 'x' })).status).toBe(401);
    expect((await request(a.app).post('/api/auth/login').send({ email, password: 'x' })).status).toBe(429);
  });
});
