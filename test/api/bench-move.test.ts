import { randomUUID } from 'node:crypto';
import { buildWorld, type World, type Wire } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/** A crew tapped the wrong collar: the lab moves the closure to the right visit of the same campaign. */
describe('Bench: moving a closure to another visit', () => {
  let t: TestApp;
  let lab: Session, admin: Session, crew: Session, lead: Session;
  let w: World, other: World;
  let collar2: Wire, visit2: Wire;
  const tS = Array.from({ length: 80 }, (_, i) => i);
  const series = { tS, co2Ppm: tS.map((s) => 418 + 0.9 * s - 0.002 * s * s), tempC: tS.map(() => 16), pressureKpa: tS.map(() => 97.5) };

  const post = async (s: Session, path: string, body: Record<string, unknown>): Promise<Wire> => {
    const res = await s.post(path, body);
    if (res.status !== 201) throw new Error(`${path}: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.record;
  };
  const closureAt = (visit: Wire, collarId: string) =>
    post(lead, '/api/closures', {
      id: randomUUID(),
      siteId: visit['siteId'],
      visitId: visit.id,
      collarId,
      campaignId: visit['campaignId'],
      startedAt: '2026-06-01T08:20:00Z',
      settleS: 20,
      series,
    });

  beforeAll(async () => {
    t = await startTestApp();
    [lab, admin, crew, lead] = await Promise.all((['lab', 'admin', 'crew', 'lead'] as const).map((r) => signIn(t.app, demoEmail(r))));
    w = await buildWorld({ admin, lead, lab }, LEAD_ID, `mv${randomUUID().slice(0, 6)}`);
    other = await buildWorld({ admin, lead, lab }, LEAD_ID, `mo${randomUUID().slice(0, 6)}`);
    // The right collar: wider than the tapped one and set deeper, so area and volume differ.
    collar2 = await post(lead, '/api/collars', {
      siteId: w.site.id,
      code: `R${randomUUID().slice(0, 4)}`,
      plotId: w.plot.id,
      diameterCm: 25,
    });
    visit2 = await post(lead, '/api/visits', {
      siteId: w.site.id,
      campaignId: w.campaign.id,
      round: 1,
      collarId: collar2.id,
      arrivedAt: '2026-06-01T08:15:00Z',
    });
    await post(lead, '/api/offset-sets', {
      siteId: w.site.id,
      visitId: visit2.id,
      collarId: collar2.id,
      campaignId: w.campaign.id,
      takenAt: '2026-06-01T08:16:00Z',
      readingsCm: [4.5, 5, 5.5],
    });
  });
  afterAll(() => t.close());

  it("when the lab moves a closure to the right collar's visit, then it belongs there and its flux is the one a closure recorded there has", async () => {
    const c = await closureAt(w.visit, w.collar.id);
    const res = await lab.post(`/api/bench/closures/${c.id}/move`, { visitId: visit2.id });
    expect(res.status).toBe(200);
    const moved = res.body.record;
    expect(moved).toMatchObject({ visitId: visit2.id, collarId: collar2.id, campaignId: w.campaign.id, series: c['series'] });
    // The same series recorded at the right visit from the start: the engine's answer for that collar.
    const there = await closureAt(visit2, collar2.id);
    const { engineVersion: _a, ...movedResults } = moved.results;
    const { engineVersion: _b, ...thereResults } = there['results'] as Record<string, unknown>;
    expect(movedResults).toEqual(thereResults);
    expect(moved.fluxUmolM2S).toBe(there['fluxUmolM2S']);
    expect(moved.results.areaCm2).not.toBe((c['results'] as { areaCm2: number }).areaCm2);
    expect(moved.fluxUmolM2S).not.toBe(c['fluxUmolM2S']);
    const h = (await lab.get(`/api/bench/closures/${c.id}/history`)).body.items;
    expect(
      h.map((e: { kind: string; field: string; oldValue: unknown; newValue: unknown }) => [e.kind, e.field, e.oldValue, e.newValue]),
    ).toEqual([
      ['move', 'visitId', w.visit.id, visit2.id],
      ['move', 'collarId', w.collar.id, collar2.id],
    ]);
    expect(h[0]).toMatchObject({ userName: expect.any(String), oldFluxUmolM2S: c['fluxUmolM2S'], newFluxUmolM2S: moved.fluxUmolM2S });
    expect((await lab.get(`/api/bench/closures/${c.id}`)).body.closure.visitId).toBe(visit2.id);
  });

  it('when crew or a lead ask for a move, then 403 and nothing changes; a plain edit of the visit stays refused', async () => {
    const c = await closureAt(w.visit, w.collar.id);
    for (const s of [crew, lead]) expect((await s.post(`/api/bench/closures/${c.id}/move`, { visitId: visit2.id })).status).toBe(403);
    const patch = await lab.patch(`/api/closures/${c.id}`, { rev: c.rev, visitId: visit2.id, collarId: collar2.id });
    expect(patch.status).toBe(400);
    expect((await lab.get(`/api/closures/${c.id}`)).body.record).toMatchObject({ rev: c.rev, visitId: w.visit.id });
  });

  it('when the target is at another site, in another campaign, the same visit or no visit, then 400/404 with the reason and nothing changes', async () => {
    const c = await closureAt(w.visit, w.collar.id);
    const camp2 = await post(lead, '/api/campaigns', {
      siteId: w.site.id,
      name: `Other ${randomUUID().slice(0, 4)}`,
      startsOn: '2026-07-01',
      endsOn: '2026-07-02',
      rounds: 1,
    });
    const visitElsewhere = await post(lead, '/api/visits', {
      siteId: w.site.id,
      campaignId: camp2.id,
      round: 1,
      collarId: collar2.id,
      arrivedAt: '2026-07-01T08:00:00Z',
    });
    const tries: [Record<string, unknown>, number, RegExp][] = [
      [{ visitId: other.visit.id }, 400, /another site/],
      [{ visitId: visitElsewhere.id }, 400, /same campaign/],
      [{ visitId: w.visit.id }, 400, /already/],
      [{ visitId: randomUUID() }, 404, /No visit/],
      [{ visitId: 'nope' }, 400, /UUID/],
      [{}, 400, /visit/i],
    ];
    for (const [body, status, message] of tries) {
      const res = await lab.post(`/api/bench/closures/${c.id}/move`, body);
      expect([res.status, JSON.stringify(res.body.error)]).toEqual([status, expect.stringMatching(message)]);
    }
    expect((await lab.get(`/api/closures/${c.id}`)).body.record).toMatchObject({ rev: c.rev, visitId: w.visit.id, collarId: w.collar.id });
  });

  it('when the closure is one of a redo pair, then neither is moved alone', async () => {
    const first = await closureAt(w.visit, w.collar.id);
    const redo = await post(lead, '/api/closures', {
      id: randomUUID(),
      siteId: w.site.id,
      visitId: w.visit.id,
      collarId: w.collar.id,
      campaignId: w.campaign.id,
      startedAt: '2026-06-01T08:30:00Z',
      settleS: 20,
      series,
      redoOfId: first.id,
    });
    for (const c of [first, redo]) {
      const res = await lab.post(`/api/bench/closures/${c.id}/move`, { visitId: visit2.id });
      expect([res.status, res.body.error.message]).toEqual([409, expect.stringMatching(/redo/)]);
      expect((await lab.get(`/api/closures/${c.id}`)).body.record).toMatchObject({ rev: c.rev, visitId: w.visit.id });
    }
  });

  it('when the campaign is locked, then the move is refused and nothing changes', async () => {
    const c = await closureAt(w.visit, w.collar.id);
    expect((await lead.post(`/api/campaigns/${w.campaign.id}/lock`)).status).toBe(200);
    try {
      const res = await admin.post(`/api/bench/closures/${c.id}/move`, { visitId: visit2.id });
      expect(res.status).toBe(423);
      expect((await lab.get(`/api/closures/${c.id}`)).body.record).toMatchObject({ rev: c.rev, visitId: w.visit.id });
    } finally {
      await lead.post(`/api/campaigns/${w.campaign.id}/unlock`);
    }
  });
});
