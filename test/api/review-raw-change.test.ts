import { randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { makeUser } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';
type Rec = Record<string, any> & { id: string; rev: number };

/**
 * A review judges the raw data it saw: a raw change to a reviewed closure sends it back to
 * `unreviewed`, the review history says who changed which raw field, and the Bench shows it.
 */
describe('raw changes after review', () => {
  let t: TestApp;
  let lab: Session, lead: Session, crew: Session;
  let crewName: string;
  let w: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  let visit: Rec;
  const tS = Array.from({ length: 90 }, (_, i) => i);

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    lab = await signIn(t.app, demoEmail('lab'));
    w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    const c = await makeUser(admin, ['crew'], [w.site.id]);
    crew = await signIn(t.app, c.email);
    crewName = (await crew.get('/api/auth/me')).body.user.displayName;
    visit = (
      await lead.post('/api/visits', {
        siteId: w.site.id,
        campaignId: w.campaign.id,
        round: 1,
        collarId: w.collar.id,
        arrivedAt: '2026-06-01T08:00:00Z',
      })
    ).body.record;
    // Volume from a chamber profile and the visit's offsets, so the flux is a number.
    await admin.post('/api/chamber-profiles', {
      siteId: w.site.id,
      name: 'P',
      validFrom: '2026-01-01',
      chamberVolumeCm3: 4000,
      loopVolumeCm3: 100,
    });
    await lead.post('/api/offset-sets', {
      siteId: w.site.id,
      visitId: visit.id,
      collarId: w.collar.id,
      campaignId: w.campaign.id,
      takenAt: '2026-06-01T08:01:00Z',
      readingsCm: [2, 2, 2],
    });
  });
  afterAll(() => t.close());

  /** A closure whose flux depends on the settle time (a curved rise), then reviewed by the lab. */
  async function reviewed(decision: Record<string, unknown>): Promise<Rec> {
    const made = (
      await crew.post('/api/closures', {
        siteId: w.site.id,
        visitId: visit.id,
        collarId: w.collar.id,
        campaignId: w.campaign.id,
        startedAt: `2026-06-01T08:${String(10 + Math.floor(Math.random() * 40)).padStart(2, '0')}:00Z`,
        settleS: 10,
        series: { tS, co2Ppm: tS.map((s) => 420 + 2 * s - 0.008 * s * s), tempC: tS.map(() => 15), pressureKpa: tS.map(() => 98) },
      })
    ).body.record;
    const res = await lab.patch(`/api/closures/${made.id}`, { rev: made.rev, ...decision });
    expect(res.status).toBe(200);
    return res.body.record;
  }

  it('when the crew changes settleS of an accepted closure, then it is unreviewed again, recomputed, and the history names the change', async () => {
    const c = await reviewed({ reviewState: 'accepted' });
    const res = await crew.patch(`/api/closures/${c.id}`, { rev: c.rev, settleS: 30 });
    expect(res.status).toBe(200);
    expect(res.body.record).toMatchObject({ settleS: 30, reviewState: 'unreviewed', reviewReason: null });
    expect(res.body.record.fluxUmolM2S).not.toBe(c.fluxUmolM2S);
    const history = (await lab.get(`/api/bench/closures/${c.id}/history`)).body.items;
    const raw = history.filter((h: { kind: string }) => h.kind === 'raw-change');
    expect(raw.map((h: Rec) => [h.field, h.oldValue, h.newValue, h.userName])).toEqual([
      ['settleS', 10, 30, crewName],
      ['reviewState', 'accepted', 'unreviewed', crewName],
    ]);
    expect(raw[0].oldFluxUmolM2S).toBe(c.fluxUmolM2S);
    expect(raw[0].newFluxUmolM2S).toBe(res.body.record.fluxUmolM2S);
    // The Bench shows it as changed since review, and a new decision clears the mark.
    const detail = (await lab.get(`/api/bench/closures/${c.id}`)).body;
    expect(detail.context.changedSinceReview).toMatchObject({ fields: ['settleS'], previousState: 'accepted', userName: crewName });
    const queue = (await lab.get(`/api/bench/queue?siteId=${w.site.id}&reviewState=unreviewed&limit=200`)).body.items;
    expect(queue.find((i: Rec) => i.id === c.id).changedSinceReview).toMatchObject({ fields: ['settleS'] });
    const again = await lab.patch(`/api/closures/${c.id}`, { rev: res.body.record.rev, reviewState: 'accepted' });
    expect(again.status).toBe(200);
    expect((await lab.get(`/api/bench/closures/${c.id}`)).body.context.changedSinceReview).toBeNull();
  });

  it('when a device pushes a new series for a rejected closure, then it is unreviewed with the reason cleared', async () => {
    const c = await reviewed({ reviewState: 'rejected', reviewReason: 'chamber not sealed' });
    const series = { ...c.series, co2Ppm: tS.map((s) => 421 + 2 * s - 0.008 * s * s) };
    const res = await crew.post('/api/sync/push', {
      deviceId: randomUUID(),
      outboxSize: 1,
      ops: [{ opId: randomUUID(), entity: 'closure', id: c.id, baseRev: c.rev, op: 'upsert', fields: { series } }],
    });
    expect(res.body.results[0]).toMatchObject({ status: 'applied', record: { reviewState: 'unreviewed', reviewReason: null } });
    const history = (await lab.get(`/api/bench/closures/${c.id}/history`)).body.items.filter((h: Rec) => h.kind === 'raw-change');
    expect(history.map((h: Rec) => [h.field, h.oldValue, h.newValue])).toEqual([
      ['series', { samples: 90 }, { samples: 90 }],
      ['reviewState', 'rejected', 'unreviewed'],
      ['reviewReason', 'chamber not sealed', null],
    ]);
  });

  it("when an unreviewed closure's raw data changes, or the lab only moves its window, then no raw-change history is written", async () => {
    const made = (
      await crew.post('/api/closures', {
        siteId: w.site.id,
        visitId: visit.id,
        collarId: w.collar.id,
        campaignId: w.campaign.id,
        startedAt: '2026-06-01T09:00:00Z',
        settleS: 10,
        series: { tS, co2Ppm: tS.map((s) => 420 + s), tempC: tS.map(() => 15) },
      })
    ).body.record;
    const edited = (await crew.patch(`/api/closures/${made.id}`, { rev: made.rev, settleS: 12 })).body.record;
    expect(edited.reviewState).toBe('unreviewed');
    const accepted = (await lab.patch(`/api/closures/${made.id}`, { rev: edited.rev, reviewState: 'accepted', reviewSettleS: 20 })).body
      .record;
    const moved = await lab.patch(`/api/closures/${made.id}`, { rev: accepted.rev, reviewSettleS: 25 });
    expect(moved.body.record.reviewState).toBe('accepted');
    const kinds = (await lab.get(`/api/bench/closures/${made.id}/history`)).body.items.map((h: Rec) => h.kind);
    expect(kinds.every((k: string) => k === 'decision')).toBe(true);
  });
});
