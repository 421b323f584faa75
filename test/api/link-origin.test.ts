import request from 'supertest';
import { startFakeSmtp, type FakeSmtp } from '../../tools/fake-smtp-server';
import { makeLayout } from '../fixtures/setup/setup-world';
import { decodePdfQrCodes } from '../fixtures/setup/pdf-qr';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const FORGED_HOST = 'attacker.example';
const binary = (res: { on(e: string, cb: (c?: Buffer) => void): void }, cb: (err: Error | null, body: Buffer) => void) => {
  const parts: Buffer[] = [];
  res.on('data', (c) => parts.push(c!));
  res.on('end', () => cb(null, Buffer.concat(parts)));
};

/** Every absolute address in a text (mail text, mail HTML, QR contents). */
const urls = (text: string) => text.match(/https?:\/\/[^\s"'<>]+/g) ?? [];

/**
 * Links that leave the server (mail, printed tags) must point at the configured origin only:
 * a forged Host or X-Forwarded-Host would otherwise put an attacker's address in a reset link.
 */
describe.each([
  { name: 'APP_ORIGIN set', env: { APP_ORIGIN: 'https://fluxwalk.example.org/' }, origin: 'https://fluxwalk.example.org' },
  { name: "APP_ORIGIN unset (the server's own address)", env: { APP_ORIGIN: '', PORT: '8123' }, origin: 'http://127.0.0.1:8123' },
])('links in mail and tags with $name', ({ env, origin }) => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let admin: Session;
  let saved: NodeJS.ProcessEnv;

  beforeAll(async () => {
    saved = { ...process.env };
    smtp = await startFakeSmtp();
    Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port), ...env });
    // Behind a proxy that forwards the client's headers, the forged ones must not matter either.
    t = await startTestApp({ trustProxy: 'loopback' });
    admin = await signIn(t.app, demoEmail('admin'));
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
    process.env = saved;
  });

  const forged = <T extends request.Test>(req: T) =>
    req.set('Host', FORGED_HOST).set('X-Forwarded-Host', FORGED_HOST).set('X-Forwarded-Proto', 'http');

  it('when a password reset is asked for with a forged Host, then the mailed link points at the configured origin', async () => {
    const email = `reset-origin-${Date.now()}@fluxwalk.example`;
    expect(
      (await admin.post('/api/users', { email, displayName: 'Origin Test', password: 'Origin-test-phrase-1', roles: ['crew'] })).status,
    ).toBe(201);
    const agent = request.agent(t.app);
    const csrf: string = (await forged(agent.get('/api/auth/csrf'))).body.token;
    const res = await forged(agent.post('/api/auth/password-reset')).set('X-CSRF-Token', csrf).send({ email });
    expect(res.status).toBe(202);
    const mail = await smtp.waitFor(email);
    const links = [...urls(mail.text), ...urls(mail.html)];
    expect(links.length).toBeGreaterThan(0);
    for (const link of links) expect(link.startsWith(`${origin}/`)).toBe(true);
    expect(mail.raw).not.toContain(FORGED_HOST);
  });

  it('when an invitation is sent with a forged Host, then the mailed link points at the configured origin', async () => {
    const email = `invite-origin-${Date.now()}@fluxwalk.example`;
    const res = await forged(admin.post('/api/invitations', { email, roles: ['crew'], siteIds: [DEMO_SITE_ID] }));
    expect(res.status).toBe(201);
    const mail = await smtp.waitFor(email);
    const links = [...urls(mail.text), ...urls(mail.html)];
    expect(links.some((l) => l.startsWith(`${origin}/accept-invitation?token=`))).toBe(true);
    for (const link of links) expect(link.startsWith(`${origin}/`)).toBe(true);
    expect(mail.raw).not.toContain(FORGED_HOST);
  });

  it('when tag sheets are printed with a forged Host, then every QR code holds the configured origin', async () => {
    const { site } = await makeLayout(admin);
    expect(
      (
        await admin.post(`/api/sites/${site.id}/collar-import/commit`, {
          csv: 'code,plot,diameter_cm,height_cm\nK1,P1,20,10\nK2,P2,20,10\n',
        })
      ).status,
    ).toBe(201);
    const tags = await forged(admin.get(`/api/sites/${site.id}/collar-tags.pdf`))
      .buffer(true)
      .parse(binary);
    const blank = await forged(admin.get(`/api/sites/${site.id}/blank-collar-tags.pdf?count=2`))
      .buffer(true)
      .parse(binary);
    expect([tags.status, blank.status]).toEqual([200, 200]);
    const scanned = [...decodePdfQrCodes(tags.body as Buffer).codes.flat(), ...decodePdfQrCodes(blank.body as Buffer).codes.flat()];
    expect(scanned).toHaveLength(4);
    for (const u of scanned) expect(u).toMatch(new RegExp(`^${origin.replace(/[.]/g, '\\.')}/walk/collars/[0-9a-f-]{36}$`));
  });
});
