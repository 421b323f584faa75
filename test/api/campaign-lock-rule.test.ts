import { randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/** Locking a campaign has one rule (every collar complete or skipped with a reason), whatever door the lock comes through. */
describe('the campaign lock rule on every write path', () => {
  let t: TestApp;
  let lead: Session;
  let w: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    w = await makeSiteWithCollar(admin, lead, LEAD_ID);
  });
  afterAll(() => t.close());

  const newCampaign = async () =>
    (
      await lead.post('/api/campaigns', {
        siteId: w.site.id,
        name: `L ${randomUUID().slice(0, 6)}`,
        startsOn: '2026-06-01',
        endsOn: '2026-06-01',
        rounds: 1,
      })
    ).body.record;

  it("when a plain PATCH sets locked while a collar is still due, then 409 with the lock route's message and it stays open", async () => {
    const camp = await newCampaign();
    const viaRoute = await lead.post(`/api/campaigns/${camp.id}/lock`);
    const viaPatch = await lead.patch(`/api/campaigns/${camp.id}`, { rev: camp.rev, locked: true });
    expect([viaPatch.status, viaPatch.body.error?.message]).toEqual([409, viaRoute.body.error.message]);
    expect(viaPatch.body.error.message).toMatch(/C1 \(due\)/);
    const viaSync = await lead.post('/api/sync/push', {
      deviceId: randomUUID(),
      outboxSize: 1,
      ops: [{ opId: randomUUID(), entity: 'campaign', id: camp.id, baseRev: camp.rev, op: 'upsert', fields: { locked: true } }],
    });
    expect(viaSync.body.results[0]).toMatchObject({ status: 'rejected', error: { message: viaRoute.body.error.message } });
    expect((await lead.get(`/api/campaigns/${camp.id}`)).body.record).toMatchObject({ locked: false, rev: camp.rev });
  });

  it('when a campaign is created already locked, then it is refused with a field message', async () => {
    const res = await lead.post('/api/campaigns', {
      siteId: w.site.id,
      name: 'Born locked',
      startsOn: '2026-06-01',
      endsOn: '2026-06-01',
      rounds: 1,
      locked: true,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'locked', message: 'Create the campaign unlocked' }]);
  });

  it('when every collar is done or skipped, then a PATCH locks it and another unlocks it', async () => {
    const camp = await newCampaign();
    await lead.post('/api/visits', {
      siteId: w.site.id,
      campaignId: camp.id,
      round: 1,
      collarId: w.collar.id,
      arrivedAt: '2026-06-01T08:00:00Z',
      skipped: true,
      skipReason: 'flooded',
    });
    const locked = await lead.patch(`/api/campaigns/${camp.id}`, { rev: camp.rev, locked: true });
    expect([locked.status, locked.body.record?.locked]).toEqual([200, true]);
    const open = await lead.patch(`/api/campaigns/${camp.id}`, { rev: locked.body.record.rev, locked: false });
    expect([open.status, open.body.record?.locked]).toEqual([200, false]);
  });
});
