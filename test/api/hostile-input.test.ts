import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { performance } from 'node:perf_hooks';
import { makeLayout } from '../fixtures/setup/setup-world';
import { httpSession } from '../support/http-session';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

/** Generous for a loaded 2-core machine; the quadratic normaliser took tens of seconds on these files. */
const ANSWER_MS = 1500;
const HEALTH_MS = 1000;

interface Measured {
  status: number;
  body: { error?: { message: string }; fileErrors?: unknown[] };
  answerMs: number;
  healthMs: number[];
}

/**
 * Collar import previews of hostile files: each must be answered quickly, and /api/health (served
 * by the same process) must stay responsive while the preview runs.
 */
describe('hostile collar files', () => {
  let t: TestApp;
  let server: Server;
  let call: Awaited<ReturnType<typeof httpSession>>;
  let base: string;
  let siteId: string;

  beforeAll(async () => {
    t = await startTestApp();
    server = t.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    siteId = (await makeLayout(await signIn(t.app, demoEmail('admin')))).site.id;
    call = await httpSession(base, demoEmail('admin'));
  });
  afterAll(async () => {
    await new Promise((r) => server.close(r));
    await t.close();
  });

  async function previewWhileProbingHealth(csv: string): Promise<Measured> {
    const start = performance.now();
    let answered = false;
    const preview = call('POST', `/api/sites/${siteId}/collar-import/preview`, { csv }).then((r) => {
      answered = true;
      return { ...r, answerMs: performance.now() - start };
    });
    const healthMs: number[] = [];
    do {
      const s = performance.now();
      const h = await fetch(`${base}/api/health`);
      await h.text();
      healthMs.push(performance.now() - s);
    } while (!answered);
    const r = await preview;
    if (process.env['SHOW_TIMINGS'])
      console.log(
        `${csv.slice(0, 12)}… ${csv.length} chars: ${r.status} in ${r.answerMs.toFixed(0)} ms; health max ${Math.max(...healthMs).toFixed(0)} ms over ${healthMs.length}`,
      );
    return { status: r.status, body: r.json, answerMs: r.answerMs, healthMs };
  }

  const cases: { name: string; csv: string; limit: RegExp }[] = [
    {
      name: 'a header of 60 000 "("',
      csv: `code,plot,${'('.repeat(60_000)}\nC1,P1,x\n`,
      limit: /column header.*longer than 200 characters/i,
    },
    {
      name: 'a header of 60 000 "["',
      csv: `${'['.repeat(60_000)},code,plot\nx,C1,P1\n`,
      limit: /column header.*longer than 200 characters/i,
    },
    {
      name: 'a header of "(a" pairs and spaces',
      csv: `code,plot,${'(a '.repeat(40_000)}x\nC1,P1,x\n`,
      limit: /longer than 200 characters/i,
    },
    {
      name: '60 000 distinct columns',
      csv: `code,plot,${Array.from({ length: 60_000 }, (_, i) => `c${i}`).join(',')}\n`,
      limit: /more than 100 columns/i,
    },
    {
      name: 'a cell of 300 000 digits',
      csv: `code,plot,diameter_cm\nC1,P1,${'1'.repeat(300_000)}x\n`,
      limit: /cell.*longer than 4000 characters/i,
    },
    {
      name: 'a notes cell of 300 000 spaces',
      csv: `code,plot,notes\nC1,P1,"a${' '.repeat(300_000)}"\n`,
      limit: /cell.*longer than 4000 characters/i,
    },
    // Broken quoting makes one quoted cell of the rest of the file (150 000 parser errors before).
    { name: 'nothing but broken quoting', csv: `code,plot\n${'"a"b,c\n'.repeat(60_000)}`, limit: /cell.*longer than 4000 characters/i },
    { name: '60 000 short rows with stray quotes', csv: `code,plot\n${'"a"b",x\n'.repeat(60_000)}`, limit: /more than 5000 collar rows/i },
    { name: '120 000 plain rows', csv: `code,plot\n${'a,x\n'.repeat(120_000)}`, limit: /more than 5000 collar rows/i },
  ];

  it.each(cases)('when the file has $name, then 400 names the limit at once and health stays responsive', async ({ csv, limit }) => {
    const r = await previewWhileProbingHealth(csv);
    expect(r.status).toBe(400);
    expect(r.body.error!.message).toMatch(limit);
    expect(r.answerMs).toBeLessThan(ANSWER_MS);
    expect(Math.max(...r.healthMs)).toBeLessThan(HEALTH_MS);
  });

  it('when the hostile commit is sent, then it is refused the same way and nothing is stored', async () => {
    const res = await call('POST', `/api/sites/${siteId}/collar-import/commit`, { csv: `code,plot,${'('.repeat(60_000)}\nC1,P1,x\n` });
    expect(res.status).toBe(400);
    expect(await t.ds.query(`SELECT 1 FROM collar WHERE site_id = $1`, [siteId])).toEqual([]);
  });
});
