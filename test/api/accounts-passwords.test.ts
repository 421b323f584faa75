import request from 'supertest';
import { startFakeSmtp, type CapturedMail, type FakeSmtp } from '../../tools/fake-smtp-server';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const ORIGIN = 'http://fluxwalk.invalid';
const FIRST = 'Heather-compass-731';

function resetToken(mail: CapturedMail): string {
  const m = /\/reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!m) throw new Error(`no reset link in:\n${mail.text}`);
  return m[1];
}

async function visitor(t: TestApp) {
  const agent = request.agent(t.app);
  const csrf: string = (await agent.get('/api/auth/csrf')).body.token;
  return { agent, post: (path: string, body: object) => agent.post(path).set('X-CSRF-Token', csrf).send(body) };
}

describe('passwords', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let admin: Session;

  beforeAll(async () => {
    smtp = await startFakeSmtp();
    Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port), APP_ORIGIN: ORIGIN });
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
  });

  async function newUser(email: string): Promise<void> {
    const res = await admin.post('/api/users', {
      email,
      displayName: 'Test Person',
      password: FIRST,
      roles: ['crew'],
      siteIds: [DEMO_SITE_ID],
    });
    expect(res.status).toBe(201);
  }

  it('when a signed-in user changes their password, then their other sessions end and the new password signs in', async () => {
    await newUser('changer@fluxwalk.example');
    const here = await signIn(t.app, 'changer@fluxwalk.example', FIRST);
    const elsewhere = await signIn(t.app, 'changer@fluxwalk.example', FIRST);
    const wrong = await here.post('/api/auth/password', { currentPassword: 'not-it-at-all', newPassword: 'Moorland-kettle-58' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toEqual([{ path: 'currentPassword', message: 'Not your current password' }]);
    const common = await here.post('/api/auth/password', { currentPassword: FIRST, newPassword: 'letmein2025' });
    expect(common.body.error.fields[0]).toMatchObject({ path: 'newPassword', message: expect.stringMatching(/too common/) });

    expect((await here.post('/api/auth/password', { currentPassword: FIRST, newPassword: 'Moorland-kettle-58' })).status).toBe(204);
    expect((await here.get('/api/auth/me')).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    expect((await signIn(t.app, 'changer@fluxwalk.example', FIRST)).login.status).toBe(401);
    expect((await signIn(t.app, 'changer@fluxwalk.example', 'Moorland-kettle-58')).login.status).toBe(200);
  });

  it('when a reset is confirmed, then every session of the account ends, the new password works and the link is spent', async () => {
    await newUser('forgetful@fluxwalk.example');
    const phone = await signIn(t.app, 'forgetful@fluxwalk.example', FIRST);
    const laptop = await signIn(t.app, 'forgetful@fluxwalk.example', FIRST);
    const v = await visitor(t);
    const asked = await v.post('/api/auth/password-reset', { email: 'Forgetful@fluxwalk.example' });
    expect(asked.status).toBe(202);
    const mail = await smtp.waitFor('forgetful@fluxwalk.example');
    expect(mail.subject).toBe('Reset your Fluxwalk password');
    expect(mail.text).toContain(`${ORIGIN}/reset-password?token=`);
    const token = resetToken(mail);
    // The expiry is set by the server's clock, the creation time by the database's: a millisecond apart.
    const [row] = await t.ds.query(
      `SELECT extract(epoch FROM expires_at - created_at)::float8 AS ttl_s FROM account_token WHERE kind = 'reset' AND email = 'forgetful@fluxwalk.example'`,
    );
    expect(Math.abs(row.ttl_s - 3600)).toBeLessThan(5);

    const weak = await v.post('/api/auth/password-reset/confirm', { token, password: 'sunshine123' });
    expect(weak.status).toBe(400);
    expect((await v.post('/api/auth/password-reset/confirm', { token, password: 'Lichen-harbour-204' })).status).toBe(204);
    expect((await phone.get('/api/auth/me')).status).toBe(401);
    expect((await laptop.get('/api/auth/me')).status).toBe(401);
    expect((await signIn(t.app, 'forgetful@fluxwalk.example', 'Lichen-harbour-204')).login.status).toBe(200);
    expect((await signIn(t.app, 'forgetful@fluxwalk.example', FIRST)).login.status).toBe(401);
    const reused = await v.post('/api/auth/password-reset/confirm', { token, password: 'Another-long-phrase-7' });
    expect(reused.status).toBe(410);
  });

  it('when a reset is asked for an unknown address, then the answer is the same and no mail goes out', async () => {
    await newUser('known.person@fluxwalk.example');
    const v = await visitor(t);
    const unknown = await v.post('/api/auth/password-reset', { email: 'nobody.at.all@fluxwalk.example' });
    const known = await v.post('/api/auth/password-reset', { email: 'known.person@fluxwalk.example' });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
    expect(unknown.body.message).toMatch(/^If this address belongs to an account/);
    await smtp.waitFor('known.person@fluxwalk.example');
    await new Promise((r) => setTimeout(r, 300));
    expect(smtp.messagesTo('nobody.at.all@fluxwalk.example')).toEqual([]);
    expect(await t.ds.query(`SELECT 1 FROM account_token WHERE email = 'nobody.at.all@fluxwalk.example'`)).toEqual([]);
  });

  it('when a second reset is asked, then the first link stops working; an expired link is refused', async () => {
    await newUser('twice.asked@fluxwalk.example');
    const v = await visitor(t);
    await v.post('/api/auth/password-reset', { email: 'twice.asked@fluxwalk.example' });
    const first = resetToken(await smtp.waitFor('twice.asked@fluxwalk.example'));
    await v.post('/api/auth/password-reset', { email: 'twice.asked@fluxwalk.example' });
    const second = resetToken(await smtp.waitFor('twice.asked@fluxwalk.example', { seen: 1 }));
    expect((await v.post('/api/auth/password-reset/confirm', { token: first, password: 'Sedge-meadow-3141' })).status).toBe(410);
    await t.ds.query(
      `UPDATE account_token SET expires_at = now() - interval '1 second' WHERE email = 'twice.asked@fluxwalk.example' AND used_at IS NULL AND revoked_at IS NULL`,
    );
    expect((await v.post('/api/auth/password-reset/confirm', { token: second, password: 'Sedge-meadow-3141' })).status).toBe(410);
    expect((await signIn(t.app, 'twice.asked@fluxwalk.example', FIRST)).login.status).toBe(200);
  });

  it('when resets for one address are asked over and over, then the sixth within the hour is refused with 429', async () => {
    const v = await visitor(t);
    const answers: number[] = [];
    for (let i = 0; i < 6; i++) answers.push((await v.post('/api/auth/password-reset', { email: 'flooded@fluxwalk.example' })).status);
    expect(answers).toEqual([202, 202, 202, 202, 202, 429]);
  });
});
