import { createHash } from 'node:crypto';
import request from 'supertest';
import { startFakeSmtp, type CapturedMail, type FakeSmtp } from '../../tools/fake-smtp-server';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const ORIGIN = 'http://fluxwalk.invalid';
const GOOD_PASSWORD = 'Bracken-lantern-42';

function linkToken(mail: CapturedMail, page: string): string {
  const m = new RegExp(`${ORIGIN}/${page}\\?token=([A-Za-z0-9_-]+)`).exec(mail.text);
  if (!m) throw new Error(`no ${page} link in:\n${mail.text}`);
  return m[1];
}

/** A visitor who is not signed in, holding the CSRF token the app fetches before any POST. */
async function visitor(t: TestApp) {
  const agent = request.agent(t.app);
  const csrf: string = (await agent.get('/api/auth/csrf')).body.token;
  return { agent, post: (path: string, body: object) => agent.post(path).set('X-CSRF-Token', csrf).send(body) };
}

describe('invitations', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let admin: Session;
  let lead: Session;

  beforeAll(async () => {
    smtp = await startFakeSmtp();
    Object.assign(process.env, {
      SMTP_HOST: smtp.host,
      SMTP_PORT: String(smtp.port),
      APP_ORIGIN: ORIGIN,
      MAIL_FROM: 'Fluxwalk <noreply@fluxwalk.invalid>',
    });
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
  });

  async function invite(by: Session, email: string, roles: string[] = ['crew'], siteIds = [DEMO_SITE_ID]) {
    const seen = smtp.messagesTo(email).length;
    const res = await by.post('/api/invitations', { email, roles, siteIds });
    return { res, mail: res.status === 201 ? await smtp.waitFor(email, { seen }) : null };
  }

  it('when the admin invites a crew member, then the mailed link lets them choose a password and sign in', async () => {
    const { res, mail } = await invite(admin, 'Hazel.Quarry@fluxwalk.example');
    expect(res.status).toBe(201);
    expect(res.body.invitation).toMatchObject({
      email: 'hazel.quarry@fluxwalk.example',
      roles: ['crew'],
      sites: [{ id: DEMO_SITE_ID, name: 'Alder Hollow Field Station' }],
    });
    const days = (Date.parse(res.body.invitation.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);
    expect(mail!.subject).toBe('Invitation to Alder Hollow Field Station on Fluxwalk');
    expect(mail!.from).toBe('noreply@fluxwalk.invalid');
    const token = linkToken(mail!, 'accept-invitation');
    expect(mail!.html).toContain(`href="${ORIGIN}/accept-invitation?token=${token}"`);
    expect(mail!.text).toContain('Priya Lindqvist has invited you');

    const v = await visitor(t);
    const lookup = await v.post('/api/invitations/lookup', { token });
    expect(lookup.status).toBe(200);
    expect(lookup.body.invitation).toMatchObject({
      email: 'hazel.quarry@fluxwalk.example',
      roles: ['crew'],
      sites: [{ name: 'Alder Hollow Field Station' }],
    });
    const accepted = await v.post('/api/invitations/accept', { token, displayName: 'Hazel Quarry', password: GOOD_PASSWORD });
    expect(accepted.status).toBe(201);
    expect(accepted.body.account).toEqual({ email: 'hazel.quarry@fluxwalk.example' });

    const hazel = await signIn(t.app, 'hazel.quarry@fluxwalk.example', GOOD_PASSWORD);
    expect(hazel.login.status).toBe(200);
    expect(hazel.login.body.user).toMatchObject({ displayName: 'Hazel Quarry', roles: ['crew'], siteIds: [DEMO_SITE_ID] });
  });

  it('when an invitation is stored, then only a SHA-256 of its token is in the database', async () => {
    const { mail } = await invite(admin, 'stored.hashed@fluxwalk.example');
    const token = linkToken(mail!, 'accept-invitation');
    const rows: { token_hash: string }[] = await t.ds.query(
      `SELECT token_hash FROM account_token WHERE email = 'stored.hashed@fluxwalk.example'`,
    );
    expect(rows).toEqual([{ token_hash: createHash('sha256').update(token).digest('hex') }]);
    expect(JSON.stringify(await t.ds.query(`SELECT * FROM account_token`))).not.toContain(token);
  });

  it('when an accepted link is used again, then it is refused with 410 and no second account appears', async () => {
    const { mail } = await invite(admin, 'twice.used@fluxwalk.example');
    const token = linkToken(mail!, 'accept-invitation');
    const v = await visitor(t);
    expect((await v.post('/api/invitations/accept', { token, displayName: 'First', password: GOOD_PASSWORD })).status).toBe(201);
    const again = await v.post('/api/invitations/accept', { token, displayName: 'Second', password: 'Another-fine-phrase-9' });
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/no longer valid/);
    expect((await v.post('/api/invitations/lookup', { token })).status).toBe(410);
    const users = await t.ds.query(`SELECT display_name FROM app_user WHERE email = 'twice.used@fluxwalk.example'`);
    expect(users).toEqual([{ display_name: 'First' }]);
  });

  it('when an invitation has expired, then looking it up and accepting it are refused', async () => {
    const { mail } = await invite(admin, 'too.late@fluxwalk.example');
    const token = linkToken(mail!, 'accept-invitation');
    await t.ds.query(`UPDATE account_token SET expires_at = now() - interval '1 minute' WHERE email = 'too.late@fluxwalk.example'`);
    const v = await visitor(t);
    expect((await v.post('/api/invitations/lookup', { token })).status).toBe(410);
    expect((await v.post('/api/invitations/accept', { token, displayName: 'Late', password: GOOD_PASSWORD })).status).toBe(410);
    expect(await t.ds.query(`SELECT 1 FROM app_user WHERE email = 'too.late@fluxwalk.example'`)).toEqual([]);
  });

  it('when someone is invited again, then only the newest link works', async () => {
    const first = linkToken((await invite(admin, 'again@fluxwalk.example')).mail!, 'accept-invitation');
    const second = linkToken((await invite(admin, 'again@fluxwalk.example')).mail!, 'accept-invitation');
    const v = await visitor(t);
    expect((await v.post('/api/invitations/lookup', { token: first })).status).toBe(410);
    expect((await v.post('/api/invitations/lookup', { token: second })).status).toBe(200);
    const open = (await admin.get('/api/invitations')).body.items.filter((i: { email: string }) => i.email === 'again@fluxwalk.example');
    expect(open).toHaveLength(1);
  });

  it('when the chosen password is short, common or contains the address, then accepting names the problem and keeps the link usable', async () => {
    const token = linkToken((await invite(admin, 'weak.choice@fluxwalk.example')).mail!, 'accept-invitation');
    const v = await visitor(t);
    const tries: [string, RegExp][] = [
      ['short1', /at least 10/],
      ['Password2026!', /too common/],
      ['qwertyuiop', /too common/],
      ['weak.choice-garden', /e-mail address/],
    ];
    for (const [password, why] of tries) {
      const res = await v.post('/api/invitations/accept', { token, displayName: 'Weak', password });
      expect(res.status).toBe(400);
      expect(res.body.error.fields).toEqual([{ path: 'password', message: expect.stringMatching(why) }]);
    }
    expect((await v.post('/api/invitations/accept', { token, displayName: 'Weak', password: GOOD_PASSWORD })).status).toBe(201);
  });

  it('when a lead invites crew to their own site, then it works; a lab user or another site is refused with 403', async () => {
    const own = await invite(lead, 'lead.invites.crew@fluxwalk.example');
    expect(own.res.status).toBe(201);
    expect(own.mail!.text).toContain('Imke Dahlberg has invited you');

    const lab = await lead.post('/api/invitations', {
      email: 'lead.invites.lab@fluxwalk.example',
      roles: ['lab'],
      siteIds: [DEMO_SITE_ID],
    });
    expect(lab.status).toBe(403);
    expect(lab.body.error.message).toBe('Leads invite crew only; ask an admin for other roles');

    const other = (await admin.post('/api/sites', { name: "Birch Fen (not the lead's)", timezone: 'UTC', elevationM: 12 })).body.record;
    const elsewhere = await lead.post('/api/invitations', {
      email: 'lead.invites.elsewhere@fluxwalk.example',
      roles: ['crew'],
      siteIds: [other.id],
    });
    expect(elsewhere.status).toBe(403);
    expect(elsewhere.body.error.message).toBe('Leads invite to their own sites only');
    expect(await t.ds.query(`SELECT email FROM account_token WHERE email LIKE 'lead.invites.%' ORDER BY email`)).toEqual([
      { email: 'lead.invites.crew@fluxwalk.example' },
    ]);
    expect(smtp.messagesTo('lead.invites.lab@fluxwalk.example')).toEqual([]);
  });

  it('when the admin invites a lab user to no site, then the account sees every site after accepting', async () => {
    const { res, mail } = await invite(admin, 'new.lab@fluxwalk.example', ['lab'], []);
    expect(res.status).toBe(201);
    const v = await visitor(t);
    await v.post('/api/invitations/accept', {
      token: linkToken(mail!, 'accept-invitation'),
      displayName: 'New Lab',
      password: GOOD_PASSWORD,
    });
    const s = await signIn(t.app, 'new.lab@fluxwalk.example', GOOD_PASSWORD);
    const sites: { id: string }[] = await t.ds.query(`SELECT id FROM site WHERE NOT deleted`);
    expect([...s.login.body.user.siteIds].sort()).toEqual(sites.map((x) => x.id).sort());
    expect(s.login.body.user.roles).toEqual(['lab']);
  });

  it('when the address already has an account or the caller is crew, then no invitation is made', async () => {
    const existing = await admin.post('/api/invitations', { email: demoEmail('crew'), roles: ['crew'], siteIds: [DEMO_SITE_ID] });
    expect(existing.status).toBe(409);
    const crew = await signIn(t.app, demoEmail('crew'));
    expect(
      (await crew.post('/api/invitations', { email: 'by.crew@fluxwalk.example', roles: ['crew'], siteIds: [DEMO_SITE_ID] })).status,
    ).toBe(403);
  });

  it('when an invitation is withdrawn, then its link stops working', async () => {
    const { res, mail } = await invite(lead, 'withdrawn@fluxwalk.example');
    expect((await lead.delete(`/api/invitations/${res.body.invitation.id}`)).status).toBe(204);
    const v = await visitor(t);
    expect((await v.post('/api/invitations/lookup', { token: linkToken(mail!, 'accept-invitation') })).status).toBe(410);
  });
});
