import { randomUUID } from 'node:crypto';
import type { SessionUser } from '../../shared/auth/roles';
import { pullChanges } from '../../server/sync/sync-pull';
import { pushOps } from '../../server/sync/sync-push';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/**
 * A pull's cursor never passes a change it did not send: a write that commits while a pull is
 * between reading its page and answering is sent by the next pull (a fleet of devices pushing
 * while others pull met this: one device ended without a record).
 */
describe('sync pull while others push', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('when a push commits right after a pull read its page, then the next pull from its cursor sends that record', async () => {
    const leadSession = await signIn(t.app, demoEmail('lead'));
    const world = await makeSiteWithCollar(await signIn(t.app, demoEmail('admin')), leadSession, LEAD_ID);
    const lead: SessionUser = (await leadSession.get('/api/auth/me')).body.user;
    const deviceId = randomUUID();
    // Up to date first (the shared test database may hold more than one page).
    let start = await pullChanges(t.ds, lead, deviceId, 0, 5000);
    for (let page = 0; start.more && page < 100; page++) start = await pullChanges(t.ds, lead, deviceId, start.cursor, 5000);
    expect(start.more).toBe(false);
    const id = randomUUID();
    const query = t.ds.query.bind(t.ds);
    let injected = false;
    const spy = jest.spyOn(t.ds, 'query').mockImplementation(async (...args: Parameters<typeof query>) => {
      const out = await query(...args);
      if (!injected && /FROM change_log\s+WHERE seq > \$1/.test(args[0])) {
        injected = true; // another device's push commits now, between the page and the answer
        const [r] = await pushOps(t.ds, lead, randomUUID(), 1, [
          {
            opId: randomUUID(),
            entity: 'collarEvent',
            id,
            baseRev: null,
            op: 'upsert',
            fields: { siteId: world.site.id, collarId: world.collar.id, kind: 'clipped', date: '2026-06-01', note: 'committed mid-pull' },
          },
        ]);
        expect(r.status).toBe('applied');
      }
      return out;
    });
    const first = await pullChanges(t.ds, lead, deviceId, start.cursor, 5000);
    spy.mockRestore();
    expect(injected).toBe(true);
    const second = await pullChanges(t.ds, lead, deviceId, first.cursor, 5000);
    const sent = [...first.changes, ...second.changes].filter((c) => c.id === id);
    expect(sent).toHaveLength(1);
  });
});
