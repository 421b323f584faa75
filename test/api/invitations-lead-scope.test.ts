import { startFakeSmtp, type FakeSmtp } from '../../tools/fake-smtp-server';
import { makeLayout, makeUser } from '../fixtures/setup/setup-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * A lead may invite crew to the lead's own sites only; the open invitations a lead sees and may
 * withdraw are exactly those. An admin's lab or admin invitations do not exist for a lead.
 */
describe('invitations a lead sees and withdraws', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let admin: Session, lead: Session;
  let siteId: string;
  let saved: NodeJS.ProcessEnv;
  const invited: Record<string, string> = {};

  beforeAll(async () => {
    saved = { ...process.env };
    smtp = await startFakeSmtp();
    Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port), APP_ORIGIN: 'http://fluxwalk.invalid' });
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    siteId = (await makeLayout(admin)).site.id;
    lead = await makeUser(t.app, admin, 'lead', [siteId]);
    const stamp = Date.now();
    const cases: [string, string[], string[]][] = [
      ['crew', ['crew'], [siteId]],
      ['lab', ['lab'], [siteId]],
      ['admin', ['admin'], []],
      ['lead', ['lead'], [siteId]],
      ['crewAndLab', ['crew', 'lab'], [siteId]],
      ['labNoSite', ['lab'], []],
    ];
    for (const [name, roles, siteIds] of cases) {
      const res = await admin.post('/api/invitations', { email: `scope-${name.toLowerCase()}-${stamp}@fluxwalk.example`, roles, siteIds });
      expect(res.status).toBe(201);
      invited[name] = res.body.invitation.id;
    }
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
    process.env = saved;
  });

  it("when a lead lists invitations, then only crew invitations to the lead's sites are there", async () => {
    const ids = ((await lead.get('/api/invitations')).body.items as { id: string }[]).map((i) => i.id);
    expect(ids).toContain(invited['crew']);
    for (const name of ['lab', 'admin', 'lead', 'crewAndLab', 'labNoSite']) expect(ids).not.toContain(invited[name]);
    const all = ((await admin.get('/api/invitations')).body.items as { id: string }[]).map((i) => i.id);
    expect(all).toEqual(expect.arrayContaining(Object.values(invited)));
  });

  it("when a lead tries to withdraw an admin's lab or admin invitation, then the answer is 404 and it stays open", async () => {
    for (const name of ['lab', 'admin', 'lead', 'crewAndLab', 'labNoSite']) {
      const res = await lead.delete(`/api/invitations/${invited[name]}`);
      expect([name, res.status]).toEqual([name, 404]);
      expect(res.body.error.message).toBe('No open invitation with this id');
    }
    const open = await t.ds.query(`SELECT count(*)::int AS n FROM account_token WHERE id = ANY($1) AND revoked_at IS NULL`, [
      ['lab', 'admin', 'lead', 'crewAndLab', 'labNoSite'].map((n) => invited[n]),
    ]);
    expect(open[0].n).toBe(5);
  });

  it('when a lead withdraws a crew invitation to their site, then it is revoked; the admin may withdraw any', async () => {
    expect((await lead.delete(`/api/invitations/${invited['crew']}`)).status).toBe(204);
    expect((await admin.delete(`/api/invitations/${invited['lab']}`)).status).toBe(204);
  });
});
