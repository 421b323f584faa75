import request from 'supertest';
import { jobDefinitions } from '../../server/jobs/job-registry';
import { startFakeSmtp, type FakeSmtp } from '../../tools/fake-smtp-server';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

const anonymousSessionRows = async (t: TestApp) =>
  Number((await t.ds.query(`SELECT count(*) AS n FROM session WHERE (sess->'passport'->>'user') IS NULL`))[0].n);
const cookieNames = (res: request.Response) =>
  ((res.headers['set-cookie'] as unknown as string[] | undefined) ?? []).map((c) => c.split('=')[0]);

describe('sessions exist only for signed-in users; CSRF works before sign-in', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let saved: NodeJS.ProcessEnv;
  beforeAll(async () => {
    saved = { ...process.env };
    smtp = await startFakeSmtp();
    Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port), APP_ORIGIN: 'http://fluxwalk.invalid' });
    t = await startTestApp();
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
    process.env = saved;
  });

  it('when 20 anonymous visitors fetch a CSRF token, then no session row is stored and no session cookie is set', async () => {
    const before = await anonymousSessionRows(t);
    for (let i = 0; i < 20; i++) {
      const res = await request(t.app).get('/api/auth/csrf');
      expect(res.status).toBe(200);
      expect(typeof res.body.token).toBe('string');
      expect(cookieNames(res)).not.toContain('fluxwalk.sid');
    }
    expect(await anonymousSessionRows(t)).toBe(before);
  });

  it('when a visitor signs in, then a session row exists for that user', async () => {
    const s = await signIn(t.app, demoEmail('crew'));
    const cookie = (s.login.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fluxwalk.sid='))!;
    const sid = /^s:([^.]+)\./.exec(decodeURIComponent(cookie.split(';')[0]!.slice('fluxwalk.sid='.length)))![1];
    const [row] = await t.ds.query(`SELECT sess->'passport'->>'user' AS user_id FROM session WHERE sid = $1`, [sid]);
    expect(row.user_id).toBe(s.login.body.user.id);
  });

  describe.each([
    { route: '/api/auth/password-reset', body: { email: 'nobody-csrf@fluxwalk.example' }, ok: 202 },
    { route: '/api/invitations/accept', body: { token: 'x'.repeat(43), displayName: 'Nobody', password: 'Harbour-lantern-77' }, ok: 410 },
    { route: '/api/auth/password-reset/confirm', body: { token: 'x'.repeat(43), password: 'Harbour-lantern-77' }, ok: 410 },
  ])('public POST $route', ({ route, body, ok }) => {
    it("when it comes without a token, with another visitor's token, or with a made-up one, then it is refused with 403", async () => {
      const mine = request.agent(t.app);
      const other = request.agent(t.app);
      await mine.get('/api/auth/csrf');
      const othersToken: string = (await other.get('/api/auth/csrf')).body.token;
      for (const token of [undefined, othersToken, 'forged-token']) {
        const req = mine.post(route);
        if (token) req.set('X-CSRF-Token', token);
        const res = await req.send(body);
        expect(res.status).toBe(403);
        expect(res.body.error.message).toMatch(/security token/);
      }
    });

    it("when it carries the visitor's own token, then it passes the CSRF check", async () => {
      const agent = request.agent(t.app);
      const token: string = (await agent.get('/api/auth/csrf')).body.token;
      expect((await agent.post(route).set('X-CSRF-Token', token).send(body)).status).toBe(ok);
    });
  });

  it('when a signed-in user sends the token they had before signing in, then it is refused', async () => {
    const agent = request.agent(t.app);
    const anonymous: string = (await agent.get('/api/auth/csrf')).body.token;
    expect((await agent.post('/api/auth/login').send({ email: demoEmail('lab'), password: 'fluxwalk-demo' })).status).toBe(200);
    expect((await agent.post('/api/auth/logout').set('X-CSRF-Token', anonymous)).status).toBe(403);
    const signedIn: string = (await agent.get('/api/auth/csrf')).body.token;
    expect((await agent.post('/api/auth/logout').set('X-CSRF-Token', signedIn)).status).toBe(204);
  });

  it('when an invitation is accepted with the anonymous token, then the account is made', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const email = `csrf-accept-${Date.now()}@fluxwalk.example`;
    expect((await admin.post('/api/invitations', { email, roles: ['crew'], siteIds: [DEMO_SITE_ID] })).status).toBe(201);
    const token = /accept-invitation\?token=([A-Za-z0-9_-]+)/.exec((await smtp.waitFor(email)).text)![1];
    const agent = request.agent(t.app);
    const csrf: string = (await agent.get('/api/auth/csrf')).body.token;
    const res = await agent
      .post('/api/invitations/accept')
      .set('X-CSRF-Token', csrf)
      .send({ token, displayName: 'Csrf Accept', password: 'Harbour-lantern-77' });
    expect(res.status).toBe(201);
  });
});

describe('the purge job for expired sign-in counters and sessions', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when the purge runs, then expired counters, expired sessions and sessions without a user are gone and live ones stay', async () => {
    const tag = `purge-${Date.now()}`;
    await t.ds.query(
      `INSERT INTO rate_limit_hit (key, hits, reset_at) VALUES ($1, 3, now() - interval '1 minute'), ($2, 2, now() + interval '10 minutes')`,
      [`${tag}:old`, `${tag}:live`],
    );
    const sess = (user: string | null) => JSON.stringify({ cookie: { originalMaxAge: 1000 }, ...(user ? { passport: { user } } : {}) });
    const [u] = await t.ds.query(`SELECT id FROM app_user WHERE email = $1`, [demoEmail('crew')]);
    await t.ds.query(
      `INSERT INTO session (sid, sess, expire) VALUES
      ($1, $4, now() - interval '1 day'), ($2, $5, now() + interval '1 day'), ($3, $4, now() + interval '1 day')`,
      [`${tag}-expired`, `${tag}-anonymous`, `${tag}-live`, sess(u.id), sess(null)],
    );

    const job = jobDefinitions().find((d) => d.name === 'purge-auth-rows');
    expect(job?.schedule).toBeTruthy();
    const result = (await job!.handler({}, { ds: t.ds, jobId: tag, progress: async () => undefined })) as {
      rateLimitRows: number;
      sessionRows: number;
    };
    expect(result.rateLimitRows).toBeGreaterThanOrEqual(1);
    expect(result.sessionRows).toBeGreaterThanOrEqual(2);
    expect(await t.ds.query(`SELECT key FROM rate_limit_hit WHERE key LIKE $1 ORDER BY key`, [`${tag}%`])).toEqual([
      { key: `${tag}:live` },
    ]);
    expect(await t.ds.query(`SELECT sid FROM session WHERE sid LIKE $1`, [`${tag}%`])).toEqual([{ sid: `${tag}-live` }]);
  });
});
