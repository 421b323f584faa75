import type { ChildProcess } from 'node:child_process';
import { localClock } from '../../server/mail/local-clock';
import { runDigest } from '../../server/mail/digest-job';
import { scheduleDueDigests } from '../../server/mail/digest-scheduler';
import { loadMailConfig } from '../../server/mail/mail-config';
import { createMailer } from '../../server/mail/mailer';
import { CURRENT_CAMPAIGN_ID } from '../../server/seed/demo-current';
import { startFakeSmtp, type CapturedMail, type FakeSmtp } from '../../tools/fake-smtp-server';
import { DEMO_SITE_ID } from '../support/fixtures';
import { startServerProcess } from '../support/server-process';
import { isolatedDatabase } from '../support/isolated-database';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD = demoEmail('lead');

/** The collar codes a digest mail lists as due and as partial under one campaign's heading. */
function listedCollars(mail: CapturedMail, campaignName: string): { due: string[]; partial: string[] } {
  const start = mail.text.indexOf(campaignName);
  if (start < 0) throw new Error(`campaign "${campaignName}" not in:\n${mail.text}`);
  const section = mail.text.slice(start).split(/\n\n(?=[^\n]+\n-{3,})/)[0];
  const due = [...section.matchAll(/^ {2}- Due \(\d+\): (.+)$/gm)].flatMap((m) => m[1].split(', '));
  const partial = [...section.matchAll(/^ {2}- Partial (\S+): still needs/gm)].map((m) => m[1]);
  return { due, partial };
}

describe('daily digest', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let lead: Session;
  let databaseUrl: string;

  beforeAll(async () => {
    smtp = await startFakeSmtp();
    Object.assign(process.env, { SMTP_HOST: smtp.host, SMTP_PORT: String(smtp.port), APP_ORIGIN: 'http://fluxwalk.invalid' });
    databaseUrl = await isolatedDatabase('digest');
    t = await startTestApp({ databaseUrl });
    lead = await signIn(t.app, LEAD);
  });
  afterAll(async () => {
    await t.close();
    await smtp.close();
  });

  it('when the lead asks for the digest now, then the mail lists exactly the collars the progress query calls due and partial', async () => {
    const asked = await lead.post(`/api/sites/${DEMO_SITE_ID}/digest/send`);
    expect(asked.status).toBe(202);
    const [run] = await t.ds.query(`SELECT id, kind, requested_by FROM digest_run WHERE job_id = $1`, [asked.body.jobId]);
    expect(run).toMatchObject({ kind: 'manual', requested_by: '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02' });
    // The API tests run no job workers: run the job's handler here.
    const result = await runDigest(t.ds, createMailer(loadMailConfig()), run.id);
    const mail = await smtp.waitFor(LEAD);

    const progress = (await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress`)).body;
    const codes = (state: string) =>
      progress.collars.filter((c: { state: string }) => c.state === state).map((c: { code: string }) => c.code);
    const listed = listedCollars(mail, 'December 2026 survey, two rounds');
    expect(listed.due).toEqual(codes('due'));
    expect(listed.partial).toEqual(codes('partial'));
    // Counted by hand from the seed: 48 collars, 7 walked in round 1 (5 complete, 1 partial, 1 skipped)
    // of 2 rounds — the 6 touched are partial overall, the skipped one and the 41 untouched still due.
    expect([listed.due.length, listed.partial.length]).toEqual([42, 6]);
    expect(result).toMatchObject({ sent: 1, recipients: 1, due: 42 });

    const anomalies = (await lead.get(`/api/sites/${DEMO_SITE_ID}/anomalies`)).body.items;
    expect(mail.text).toContain(`Worth a look (${anomalies.length}, `);
    expect(mail.subject).toBe(`Daily digest: Alder Hollow Field Station, ${localClock(new Date(), 'Europe/Berlin').date}`);
    expect(mail.html).toContain(
      '<h2 style="font-size:17px;margin:18px 0 6px">December 2026 survey, two rounds (2026-12-01 to 2026-12-04)</h2>',
    );
  });

  it('when crew ask for the digest, then they are refused; a lead of another site gets 403', async () => {
    const crew = await signIn(t.app, demoEmail('crew'));
    expect((await crew.post(`/api/sites/${DEMO_SITE_ID}/digest/send`)).status).toBe(403);
    const admin = await signIn(t.app, demoEmail('admin'));
    const other = (await admin.post('/api/sites', { name: 'Digest elsewhere', timezone: 'UTC', elevationM: 5 })).body.record;
    expect((await lead.post(`/api/sites/${other.id}/digest/send`)).status).toBe(403);
  });

  it('when the scheduler runs in several places at the same minute, then one run per site and local date is asked for', async () => {
    // 17:30 UTC on a March day is 18:30 in Berlin: past the demo site's 18:00, within the catch-up window.
    const now = new Date('2031-03-05T17:30:00Z');
    const asked = await Promise.all([scheduleDueDigests(t.ds, now), scheduleDueDigests(t.ds, now), scheduleDueDigests(t.ds, now)]);
    const runs = await t.ds.query(
      `SELECT site_id, local_date::text AS day FROM digest_run WHERE kind = 'scheduled' AND local_date = '2031-03-05'`,
    );
    expect(runs.filter((r: { site_id: string }) => r.site_id === DEMO_SITE_ID)).toEqual([{ site_id: DEMO_SITE_ID, day: '2031-03-05' }]);
    expect(asked.flat()).toHaveLength(runs.length);
    const early = await scheduleDueDigests(t.ds, new Date('2031-03-06T16:59:00Z')); // 17:59 in Berlin
    expect(await t.ds.query(`SELECT 1 FROM digest_run WHERE local_date = '2031-03-06' AND site_id = $1`, [DEMO_SITE_ID])).toEqual([]);
    expect(early).toEqual([]);
  });

  it('when two server processes run on one database and the digest time comes, then the lead gets it once', async () => {
    const clock = localClock(new Date(), 'Europe/Berlin');
    const hhmm = `${String(Math.floor(clock.minutes / 60)).padStart(2, '0')}:${String(clock.minutes % 60).padStart(2, '0')}`;
    await t.ds.query(`UPDATE site SET digest_local_time = $2 WHERE id = $1`, [DEMO_SITE_ID, hhmm]);
    // Only this test's runs: the "send now" job asked for above waits in the outbox (no workers under Jest).
    await t.ds.query(`DELETE FROM job_outbox WHERE name = 'daily-digest'`);
    await t.ds.query(`DELETE FROM digest_delivery d USING digest_run r WHERE r.id = d.run_id AND r.kind = 'scheduled'`);
    await t.ds.query(`DELETE FROM digest_run WHERE kind = 'scheduled'`);
    const subject = `Daily digest: Alder Hollow Field Station, ${clock.date}`;
    const before = smtp.messagesTo(LEAD).length;
    Object.assign(process.env, { DIGEST_TICK_SECONDS: '1' });
    const children: ChildProcess[] = [];
    try {
      for (let i = 0; i < 2; i++) children.push((await startServerProcess(databaseUrl)).child);
      const mail = await smtp.waitFor(LEAD, { seen: before, timeoutMs: 30_000 });
      expect(mail.subject).toBe(subject);
      await new Promise((r) => setTimeout(r, 4000)); // several more ticks of both processes
      expect(
        smtp
          .messagesTo(LEAD)
          .slice(before)
          .map((m) => m.subject),
      ).toEqual([subject]);
      const runs = await t.ds.query(
        `SELECT r.local_date::text AS day, j.state FROM digest_run r JOIN job_progress j ON j.id = r.job_id
                                      WHERE r.site_id = $1 AND r.kind = 'scheduled'`,
        [DEMO_SITE_ID],
      );
      expect(runs).toEqual([{ day: clock.date, state: 'completed' }]);
      const delivered = await t.ds.query(
        `SELECT d.email FROM digest_delivery d JOIN digest_run r ON r.id = d.run_id WHERE r.kind = 'scheduled'`,
      );
      expect(delivered).toEqual([{ email: LEAD }]);
    } finally {
      await Promise.all(
        children.map(
          (c) =>
            new Promise((r) => {
              c.once('exit', r);
              c.kill('SIGTERM');
            }),
        ),
      );
    }
  });
});
