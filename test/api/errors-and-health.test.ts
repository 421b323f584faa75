import request from 'supertest';
import { createApp } from '../../server/core/app';
import { loadConfig } from '../../server/core/config';
import { createDataSource } from '../../server/core/data-source';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

describe('error shapes and health', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when the database answers, then health says ok', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('when the database is unreachable, then health answers 503 degraded', async () => {
    const url = process.env['TEST_DATABASE_URL']!;
    const ds = createDataSource(url, { poolSize: 1 });
    await ds.initialize();
    const { app } = createApp(ds, loadConfig({ databaseUrl: url, staticDir: null }));
    await ds.destroy(); // the pool is gone: every query now fails, as when PostgreSQL is down
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ status: 'degraded', db: 'down' });
  });

  it('when an /api route does not exist, then the answer is a 404 in the error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { message: 'No API route for GET /api/no-such-thing' } });
  });

  it('when a body is over 1 MiB on an ordinary route, then 413 says to send less, with no stack trace', async () => {
    const s = await signIn(t.app, demoEmail('admin'));
    const big = { displayName: 'x'.repeat(1.2 * 1024 * 1024) };
    const res = await s.patch('/api/users/1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a01', big);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/larger than the limit/);
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.js:\d+/);
  });

  it('when a field is invalid, then 400 names the field', async () => {
    const s = await signIn(t.app, demoEmail('admin'));
    const res = await s.post('/api/users', { email: 'not-an-email', displayName: '', password: 'short', roles: ['wizard'] });
    expect(res.status).toBe(400);
    const paths = res.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'displayName', 'password', 'roles.0']));
  });

  it('when the body is not JSON, then 400 says so', async () => {
    const res = await request(t.app).post('/api/auth/login').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/not valid JSON/);
  });
});
