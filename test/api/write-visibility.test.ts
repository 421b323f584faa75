import { randomUUID } from 'node:crypto';
import { buildWorld, createBody, deleteWorld, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * The write path answers a record only to someone who may read it: every branch that can hand a
 * stored record back (an edit that changes nothing, a stale-rev conflict, a deleted record, a
 * create over a known id, a delete of a tombstone, lock and unlock) sits behind the role and
 * membership checks, and a record the caller cannot read gets the read's own 404.
 */
describe('writes never answer a record the caller may not read', () => {
  let t: TestApp;
  let admin: Session, lab: Session, homeCrew: Session, homeLead: Session, foreignLead: Session;
  let home: World, foreign: World, gone: World;
  const device = randomUUID();
  const push = (s: Session, ops: unknown[]) => s.post('/api/sync/push', { deviceId: device, outboxSize: ops.length, ops });
  /** Nothing of the foreign record may appear in an answer: no code, no notes, no coordinates, no ids of its neighbours. */
  const leaks = (body: unknown, w: World) => {
    const text = JSON.stringify(body);
    return [
      String(w.collar['code']),
      String(w.collar['notes']),
      String(w.collar['latitude']),
      w.site.id,
      w.plot.id,
      String(w.campaign['name']),
    ].filter((needle) => text.includes(needle));
  };

  beforeAll(async () => {
    t = await startTestApp();
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const fl = await makeUser(admin, ['lead'], []);
    const hl = await makeUser(admin, ['lead'], []);
    foreignLead = await signIn(t.app, fl.email);
    homeLead = await signIn(t.app, hl.email);
    foreign = await buildWorld({ admin, lead: foreignLead, lab }, fl.id, `zx${randomUUID().slice(0, 6)}`);
    gone = await deleteWorld(
      { admin, lead: foreignLead, lab },
      await buildWorld({ admin, lead: foreignLead, lab }, fl.id, `zd${randomUUID().slice(0, 6)}`),
    );
    home = await buildWorld({ admin, lead: homeLead, lab }, hl.id, `hm${randomUUID().slice(0, 6)}`);
    const hc = await makeUser(admin, ['crew'], [home.site.id]);
    homeCrew = await signIn(t.app, hc.email);
  });
  afterAll(() => t.close());

  it("when a crew member edits another site's collar without changing anything, then the answer is the read's 404", async () => {
    const read = await homeCrew.get(`/api/collars/${foreign.collar.id}`);
    expect(read.status).toBe(404);
    const noOp = await homeCrew.patch(`/api/collars/${foreign.collar.id}`, { rev: 1 });
    expect([noOp.status, noOp.body.error?.message]).toEqual([404, read.body.error.message]);
    expect(leaks(noOp.body, foreign)).toEqual([]);
    const stale = await homeCrew.patch(`/api/collars/${foreign.collar.id}`, { rev: 1, notes: 'mine' });
    expect([stale.status, stale.body.error?.message]).toEqual([404, read.body.error.message]);
    expect(leaks(stale.body, foreign)).toEqual([]);
  });

  it('when a crew member creates a record over an id used at another site, then 404 and no conflict copy', async () => {
    const res = await homeCrew.post('/api/collars', {
      ...createBody(home.collar),
      code: `X${randomUUID().slice(0, 6)}`,
      id: foreign.collar.id,
    });
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe((await homeCrew.get(`/api/collars/${foreign.collar.id}`)).body.error.message);
    expect(res.body.error.conflict).toBeUndefined();
    expect(leaks(res.body, foreign)).toEqual([]);
  });

  it("when a sync push names another site's record, then each op is rejected with the read's message and carries no record", async () => {
    const message = (await homeCrew.get(`/api/collars/${foreign.collar.id}`)).body.error.message;
    const ops = [
      {
        opId: randomUUID(),
        entity: 'collar',
        id: foreign.collar.id,
        baseRev: null,
        op: 'upsert',
        fields: { ...createBody(home.collar), code: 'Q1' },
      },
      { opId: randomUUID(), entity: 'collar', id: foreign.collar.id, baseRev: 1, op: 'upsert', fields: {} },
      { opId: randomUUID(), entity: 'collar', id: foreign.collar.id, baseRev: 1, op: 'upsert', fields: { notes: 'x' } },
      { opId: randomUUID(), entity: 'collar', id: foreign.collar.id, baseRev: null, op: 'delete', fields: {} },
    ];
    const res = await push(homeCrew, ops);
    expect(res.status).toBe(200);
    for (const r of res.body.results) {
      expect([r.status, r.error?.message, r.record, r.conflict]).toEqual(['rejected', message, undefined, undefined]);
    }
    expect(leaks(res.body, foreign)).toEqual([]);
  });

  it("when a lead edits, re-creates or deletes another site's deleted record, then the read's 404 and nothing of it", async () => {
    const read = await homeLead.get(`/api/collars/${gone.collar.id}`);
    expect(read.status).toBe(404);
    for (const res of [
      await homeLead.patch(`/api/collars/${gone.collar.id}`, { rev: 1, notes: 'revive' }),
      await homeLead.delete(`/api/collars/${gone.collar.id}`),
      await homeLead.post('/api/collars', { ...createBody(home.collar), code: `Y${randomUUID().slice(0, 6)}`, id: gone.collar.id }),
    ]) {
      expect([res.status, res.body.error?.message]).toEqual([404, read.body.error.message]);
      expect(leaks(res.body, gone)).toEqual([]);
    }
    const synced = await push(homeLead, [
      { opId: randomUUID(), entity: 'collar', id: gone.collar.id, baseRev: null, op: 'delete', fields: {} },
    ]);
    expect(synced.body.results[0]).toMatchObject({ status: 'rejected', error: { message: read.body.error.message } });
    expect(synced.body.results[0].record).toBeUndefined();
  });

  it("when a lead locks or unlocks another site's campaign, then the read's 404 and the campaign is untouched", async () => {
    const read = await homeLead.get(`/api/campaigns/${foreign.campaign.id}`);
    expect(read.status).toBe(404);
    for (const path of ['lock', 'unlock']) {
      const res = await homeLead.post(`/api/campaigns/${foreign.campaign.id}/${path}`);
      expect([path, res.status, res.body.error?.message]).toEqual([path, 404, read.body.error.message]);
      expect(leaks(res.body, foreign)).toEqual([]);
    }
    for (const path of ['lock', 'unlock']) {
      const res = await homeLead.post(`/api/campaigns/${gone.campaign.id}/${path}`);
      expect([path, res.status]).toEqual([path, 404]);
      expect(leaks(res.body, gone)).toEqual([]);
    }
    expect((await admin.get(`/api/campaigns/${foreign.campaign.id}`)).body.record.rev).toBe(foreign.campaign.rev);
  });

  it("when an id exists nowhere, then edits and deletes answer as for another site's record, so the answer does not tell them apart", async () => {
    const nowhere = randomUUID();
    const strip = (res: { status: number; body: { error?: { message: string } } }, id: string) => [
      res.status,
      res.body.error?.message.replace(id, '<id>'),
    ];
    expect(strip(await homeLead.patch(`/api/collars/${nowhere}`, { rev: 1, notes: 'x' }), nowhere)).toEqual(
      strip(await homeLead.patch(`/api/collars/${foreign.collar.id}`, { rev: 1, notes: 'x' }), foreign.collar.id),
    );
    expect(strip(await homeLead.delete(`/api/collars/${nowhere}`), nowhere)).toEqual(
      strip(await homeLead.delete(`/api/collars/${foreign.collar.id}`), foreign.collar.id),
    );
    expect(strip(await homeLead.get(`/api/collars/${nowhere}`), nowhere)).toEqual([404, 'No collar <id>']);
  });

  it('when a role that may not edit a record sends an edit that changes nothing, then it is refused for the role', async () => {
    const current = (await lab.get(`/api/collars/${home.collar.id}`)).body.record;
    const res = await push(lab, [
      { opId: randomUUID(), entity: 'collar', id: home.collar.id, baseRev: current.rev, op: 'upsert', fields: {} },
    ]);
    expect(res.body.results[0]).toMatchObject({ status: 'rejected', error: { message: 'Your role may not update a collar' } });
    expect(res.body.results[0].record).toBeUndefined();
    const crewDelete = await push(homeCrew, [
      { opId: randomUUID(), entity: 'collar', id: home.collar.id, baseRev: null, op: 'delete', fields: {} },
    ]);
    expect(crewDelete.body.results[0]).toMatchObject({ status: 'rejected', error: { message: 'Your role may not delete a collar' } });
  });

  it("when the site's own members write the same way, then they still get their records back", async () => {
    const noOp = await homeCrew.patch(`/api/collars/${home.collar.id}`, { rev: home.collar.rev });
    expect([noOp.status, noOp.body.record?.id]).toEqual([200, home.collar.id]);
    const again = await homeLead.post('/api/collars', { ...createBody(home.collar), id: home.collar.id });
    expect([again.status < 300, again.body.record?.id]).toEqual([true, home.collar.id]);
  });
});
