import { randomUUID } from 'node:crypto';
import { sourceFields, TABLES } from '../../server/results/export-schema';
import { closureRows } from '../../server/results/export-rows';
import { buildWorld, type World, type Wire } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
const SPIKE = [45, 46, 47, 48];

/** Ordinary least squares of y on x, written out (textbook normal equations), apart from the engine. */
function ols(x: number[], y: number[]) {
  const n = x.length,
    mx = x.reduce((a, b) => a + b, 0) / n,
    my = y.reduce((a, b) => a + b, 0) / n;
  const sxy = x.reduce((a, xi, i) => a + (xi - mx) * (y[i] - my), 0),
    sxx = x.reduce((a, xi) => a + (xi - mx) ** 2, 0);
  return { slope: sxy / sxx, intercept: my - (sxy / sxx) * mx, n };
}

/** The lab leaves points out of a closure's fit and puts them back; each step is recomputed, stored and in the history. */
describe('Bench: points left out of a fit', () => {
  let t: TestApp;
  let lab: Session, admin: Session, crew: Session, lead: Session;
  let w: World;
  const tS = Array.from({ length: 90 }, (_, i) => i);
  const co2Ppm = tS.map((s) => 420 + 0.6 * s + 0.3 * Math.sin(s * 1.7) + (SPIKE.includes(s) ? 35 : 0));

  const newClosure = async (): Promise<Wire> => {
    const res = await lead.post('/api/closures', {
      id: randomUUID(),
      siteId: w.site.id,
      visitId: w.visit.id,
      collarId: w.collar.id,
      campaignId: w.campaign.id,
      startedAt: '2026-06-01T08:10:00Z',
      settleS: 20,
      series: { tS, co2Ppm, tempC: tS.map(() => 15), pressureKpa: tS.map(() => 98) },
    });
    expect(res.status).toBe(201);
    return res.body.record;
  };
  const stored = async (id: string) => (await lab.get(`/api/closures/${id}`)).body.record;

  beforeAll(async () => {
    t = await startTestApp();
    [lab, admin, crew, lead] = await Promise.all((['lab', 'admin', 'crew', 'lead'] as const).map((r) => signIn(t.app, demoEmail(r))));
    w = await buildWorld({ admin, lead, lab }, LEAD_ID, `ex${randomUUID().slice(0, 6)}`);
  });
  afterAll(() => t.close());

  it('when the lab leaves a spike out, then flux, statistics and flags are those of the remaining points, and the series is kept', async () => {
    const c = await newClosure();
    expect(c['flags']).toContain('spike');
    const res = await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: SPIKE, reason: 'Spike' });
    expect(res.status).toBe(200);
    const after = res.body.record;
    expect(after.reviewExclusions).toEqual(SPIKE.map((index) => ({ index, reason: 'Spike' })));
    expect(after.series).toEqual(c['series']);
    expect(after.results.raw).toEqual((c['results'] as Record<string, unknown>)['raw']);
    const keep = tS.filter((s) => s >= 20 && !SPIKE.includes(s));
    const ref = ols(
      keep.map((s) => s - 20),
      keep.map((s) => co2Ppm[s]),
    );
    const review = after.results.review;
    expect(review.linear.n).toBe(ref.n);
    expect(review.linear.slopePpmS).toBeCloseTo(ref.slope, 10);
    expect(review.linear.interceptPpm).toBeCloseTo(ref.intercept, 8);
    expect(review.flags).not.toContain('spike');
    expect(after.flags).toEqual(review.flags);
    expect(after.fluxUmolM2S).toBe(review.selected.fluxUmolM2S);
    expect(after.fluxUmolM2S).not.toBe(c['fluxUmolM2S']);
    expect(await stored(c.id)).toMatchObject({ rev: after.rev, fluxUmolM2S: after.fluxUmolM2S, reviewExclusions: after.reviewExclusions });
    // The data package says which samples the review fit left out.
    const columns = sourceFields(TABLES.find((x) => x.name === 'closures')!).map((f) => f.name);
    const exported = [];
    for await (const row of closureRows(t.ds, w.site.id)) if (row[0] === c.id) exported.push(row);
    expect(exported).toHaveLength(1);
    expect(exported[0][columns.indexOf('review_excluded_samples')]).toBe('45;46;47;48');
    expect(exported[0][columns.indexOf('flux_umol_m2_s')]).toBe(after.fluxUmolM2S);
  });

  it('when the lab puts the points back, then the fit is the one of every point again, and both steps are in the history with who, when, which points and why', async () => {
    const c = await newClosure();
    const ex = (await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [46, 45], reason: 'Chamber knocked' })).body.record;
    const single = (await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [70], reason: 'Analyzer glitch' })).body.record;
    expect(single.reviewExclusions.map((e: { index: number }) => e.index)).toEqual([45, 46, 70]);
    const back = await lab.post(`/api/bench/closures/${c.id}/exclusions/restore`, { indices: [45, 46, 70] });
    expect(back.status).toBe(200);
    expect(back.body.record.reviewExclusions).toEqual([]);
    expect(back.body.record.fluxUmolM2S).toBe(c['fluxUmolM2S']);
    expect(back.body.record.flags).toEqual(c['flags']);
    const h = (await lab.get(`/api/bench/closures/${c.id}/history`)).body.items.filter(
      (e: { field: string }) => e.field === 'reviewExclusions',
    );
    expect(h.map((e: { newValue: unknown }) => e.newValue)).toEqual([
      [
        { index: 45, reason: 'Chamber knocked' },
        { index: 46, reason: 'Chamber knocked' },
      ],
      [
        { index: 45, reason: 'Chamber knocked' },
        { index: 46, reason: 'Chamber knocked' },
        { index: 70, reason: 'Analyzer glitch' },
      ],
      [],
    ]);
    expect(h.every((e: { userName: string | null; at: string }) => e.userName && !Number.isNaN(Date.parse(e.at)))).toBe(true);
    expect(h[0]).toMatchObject({ kind: 'decision', oldValue: [], oldFluxUmolM2S: c['fluxUmolM2S'], newFluxUmolM2S: ex.fluxUmolM2S });
    expect(h[2]).toMatchObject({ oldFluxUmolM2S: single.fluxUmolM2S, newFluxUmolM2S: c['fluxUmolM2S'] });
  });

  it('when crew or a lead try to leave points out, then 403 and nothing changes; an admin may', async () => {
    const c = await newClosure();
    for (const s of [crew, lead]) {
      expect((await s.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [50], reason: 'Spike' })).status).toBe(403);
      expect((await s.post(`/api/bench/closures/${c.id}/exclusions/restore`, { indices: [50] })).status).toBe(403);
    }
    // The lead is a member of the site: a plain edit of the field is refused by the closure's field rule too.
    const patch = await lead.patch(`/api/closures/${c.id}`, { rev: c.rev, reviewExclusions: [{ index: 50, reason: 'Spike' }] });
    expect([patch.status, patch.body.error.message]).toEqual([403, "Only the lab or an admin may leave points out of a closure's fit"]);
    expect((await stored(c.id)).rev).toBe(c.rev);
    const byAdmin = await admin.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [50], reason: 'Spike' });
    expect(byAdmin.status).toBe(200);
    expect((await admin.post(`/api/bench/closures/${c.id}/exclusions/restore`, { indices: [50] })).status).toBe(200);
    // Admins leave points out and nothing else of a closure.
    const latest = await stored(c.id);
    expect((await admin.patch(`/api/closures/${c.id}`, { rev: latest.rev, reviewState: 'accepted' })).status).toBe(403);
  });

  it('when the input is bad, then 400 with a clear message and nothing stored changes', async () => {
    const c = await newClosure();
    const tries: [Record<string, unknown>, RegExp, string?][] = [
      [{ indices: [90], reason: 'Spike' }, /numbered 0 to 89/, 'indices.0'],
      [{ indices: [-1], reason: 'Spike' }, /numbered 0 to 89/, 'indices.0'],
      [{ indices: [3.5], reason: 'Spike' }, /whole sample number/, 'indices.0'],
      [{ indices: [50, 50], reason: 'Spike' }, /excluded twice/, 'indices.1'],
      [{ indices: [50] }, /why/i, 'reason'],
      [{ indices: [50], reason: '   ' }, /why/i, 'reason'],
      [{ indices: [], reason: 'Spike' }, /at least one/, 'indices'],
      // 70 samples in the window from 20 s; leaving 68 out keeps 2, one short of a line.
      [{ indices: tS.slice(20, 88), reason: 'Spike' }, /keeps 2 usable points in the fit window; a fit needs at least 3/, 'indices'],
    ];
    for (const [body, message, path] of tries) {
      const res = await lab.post(`/api/bench/closures/${c.id}/exclusions`, body);
      expect([res.status, JSON.stringify(res.body.error)]).toEqual([400, expect.stringMatching(message)]);
      if (path) expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
    }
    expect((await lab.post(`/api/bench/closures/${c.id}/exclusions/restore`, { indices: [50] })).status).toBe(400);
    // The record rule holds on every write path, not only the Bench route.
    const patch = await lab.patch(`/api/closures/${c.id}`, { rev: c.rev, reviewExclusions: [{ index: 400, reason: 'Spike' }] });
    expect(patch.status).toBe(400);
    const after = await stored(c.id);
    expect(after).toMatchObject({ rev: c.rev, reviewExclusions: [], fluxUmolM2S: c['fluxUmolM2S'] });
    expect((await lab.get(`/api/bench/closures/${c.id}/history`)).body.items).toEqual([]);
    // Leaving exactly enough for a line is fine.
    expect((await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: tS.slice(20, 87), reason: 'Spike' })).status).toBe(200);
    const again = await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [20], reason: 'Spike' });
    expect([again.status, again.body.error.message]).toEqual([400, 'Some of these points are already left out of the fit']);
    expect((await lab.post(`/api/bench/closures/${randomUUID()}/exclusions`, { indices: [1], reason: 'Spike' })).status).toBe(404);
  });

  it('when the campaign is locked, then leaving points out or putting them back is refused and nothing changes', async () => {
    const c = await newClosure();
    const ex = (await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [50], reason: 'Spike' })).body.record;
    const camp = (await lead.get(`/api/campaigns/${w.campaign.id}`)).body.record;
    const lock = await lead.post(`/api/campaigns/${camp.id}/lock`);
    expect(lock.status).toBe(200);
    try {
      const res = await lab.post(`/api/bench/closures/${c.id}/exclusions`, { indices: [60], reason: 'Spike' });
      expect(res.status).toBe(423);
      expect(res.body.error.message).toMatch(/locked/);
      expect((await lab.post(`/api/bench/closures/${c.id}/exclusions/restore`, { indices: [50] })).status).toBe(423);
      expect(await stored(c.id)).toMatchObject({ rev: ex.rev, reviewExclusions: ex.reviewExclusions, fluxUmolM2S: ex.fluxUmolM2S });
      // A decision on the data as it stands is still taken in a locked campaign; a decision with new exclusions is not.
      const both = await lab.patch(`/api/closures/${c.id}`, { rev: ex.rev, reviewState: 'accepted', reviewExclusions: [] });
      expect(both.status).toBe(423);
      expect((await lab.patch(`/api/closures/${c.id}`, { rev: ex.rev, reviewState: 'accepted' })).status).toBe(200);
    } finally {
      await lead.post(`/api/campaigns/${camp.id}/unlock`);
    }
  });
});
