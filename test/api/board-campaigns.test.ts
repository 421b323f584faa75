import { randomUUID } from 'node:crypto';
import { CURRENT_CAMPAIGN_ID } from '../../server/seed/demo-current';
import { buildLayout } from '../../server/seed/demo-layout';
import { DEMO_SITE_ID } from '../support/fixtures';
import { isolatedDatabase } from '../support/isolated-database';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';
import { NOT_DUE_WORDS, PROGRESS_STATE_WORDS } from '../../shared/model/progress-state';

const CREW_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a01';
type Collar = {
  collarId: string;
  code: string;
  routeId: string;
  state: string;
  skipReason: string | null;
  items: Record<string, { state: string; done: number; needed: number }>;
};

describe('Board: planning, progress and closing a campaign', () => {
  let t: TestApp;
  let lead: Session;
  let crew: Session;
  const layout = buildLayout();
  const [west, east] = layout.routes;
  beforeAll(async () => {
    t = await startTestApp({ databaseUrl: await isolatedDatabase('board') });
    lead = await signIn(t.app, demoEmail('lead'));
    crew = await signIn(t.app, demoEmail('crew'));
  });
  afterAll(() => t.close());

  it('when the seeded December campaign is asked per round, then the counts match the seed plan counted by hand', async () => {
    // The seed plan: round 1 walked the first 7 stops of the west loop — 5 complete, the 6th without its
    // closure (battery flat), the 7th skipped for standing water. Both loops hold 24 collars; round 2 untouched.
    const r1 = (await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress?round=1`)).body;
    expect(r1.collars).toHaveLength(48);
    expect(r1.totals.byRoute[west.id]).toEqual({ due: 17, partial: 1, complete: 5, skipped: 1 });
    expect(r1.totals.byRoute[east.id]).toEqual({ due: 24, partial: 0, complete: 0, skipped: 0 });
    const byId = new Map<string, Collar>(r1.collars.map((c: Collar) => [c.collarId, c]));
    const sixth = byId.get(west.collarIds[5])!;
    expect(sixth.items).toEqual({
      offset: { state: 'complete', done: 1, needed: 1 },
      closures: { state: 'due', done: 0, needed: 1 },
      probes: { state: 'complete', done: 1, needed: 1 },
    });
    expect(byId.get(west.collarIds[6])).toMatchObject({
      state: 'skipped',
      skipReason: 'Standing water over the collar rim after overnight rain',
    });
    const r2 = (await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress?round=2`)).body;
    expect(r2.totals.byRoute[west.id]).toEqual({ due: 24, partial: 0, complete: 0, skipped: 0 });
    // Both rounds: the 5 walked collars and the 6th are half done; the skipped one still has round 2 to do.
    const all = (await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress`)).body;
    expect(all.totals.byRoute[west.id]).toEqual({ due: 18, partial: 6, complete: 0, skipped: 0 });
    expect(all.collars.find((c: Collar) => c.collarId === west.collarIds[0]).items.closures).toEqual({
      state: 'partial',
      done: 1,
      needed: 2,
    });
  });

  it('when the progress is exported, then the CSV has one row per collar with route, plot and item counts', async () => {
    const res = await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress.csv?round=1`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const lines = res.text.trim().split('\r\n');
    expect(lines).toHaveLength(49);
    expect(lines[0]).toBe(
      'collar,route,plot,treatment,round,state,skip_reason,offset_state,offset_done,offset_needed,' +
        'closures_state,closures_done,closures_needed,probes_state,probes_done,probes_needed',
    );
    const first = layout.collars.find((c) => c.id === west.collarIds[0])!;
    expect(lines.find((l) => l.startsWith(`${first.code},`))).toMatch(
      new RegExp(`^${first.code},West loop \\(blocks 1–2\\),${first.plotCode},[A-Z ]+,1,complete,,complete,1,1,complete,1,1,complete,1,1$`),
    );
    expect(
      lines
        .slice(1)
        .map((l) => l.split(',')[5])
        .sort()
        .join(' '),
    ).toBe([...Array(41).fill('due'), ...Array(5).fill('complete'), 'partial', 'skipped'].sort().join(' '));
    // Every state cell is a word of the shared table (the Board, Walk and the digest show the same words).
    const words = new Set(Object.values(PROGRESS_STATE_WORDS));
    for (const l of lines.slice(1)) {
      const cells = l.split(',');
      expect(words.has(cells[5])).toBe(true);
      for (const i of [7, 10, 13]) expect([...words, NOT_DUE_WORDS]).toContain(cells[i]);
    }
  });

  it('when the progress CSV is asked for a spreadsheet (?bom=1), then it starts with the UTF-8 byte order mark; without, it does not', async () => {
    const bytes = async (q: string) =>
      (
        await lead
          .get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress.csv${q}`)
          .buffer(true)
          .parse((res, cb) => {
            const c: Buffer[] = [];
            res.on('data', (x: Buffer) => c.push(x));
            res.on('end', () => cb(null, Buffer.concat(c)));
          })
      ).body as Buffer;
    const withBom = await bytes('?round=1&bom=1');
    const plain = await bytes('?round=1');
    // EF BB BF is U+FEFF in UTF-8 (Unicode Standard, ch. 23.8).
    expect([...withBom.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(withBom.subarray(3).equals(plain)).toBe(true);
    expect(plain[0]).toBe('c'.charCodeAt(0));
    expect((await lead.get(`/api/campaigns/${CURRENT_CAMPAIGN_ID}/progress.csv?bom=yes`)).status).toBe(400);
  });

  it('when the lead reorders a route and assigns crews, then both are saved; the crew user gets 403 for each', async () => {
    const collars = west.collarIds.slice(0, 4);
    const route = (
      await lead.post('/api/routes', { siteId: DEMO_SITE_ID, name: `Reorder ${randomUUID().slice(0, 6)}`, collarIds: collars })
    ).body.record;
    const camp = (
      await lead.post('/api/campaigns', {
        siteId: DEMO_SITE_ID,
        name: 'Plan test',
        startsOn: '2026-12-10',
        endsOn: '2026-12-10',
        rounds: 2,
        routes: [{ routeId: route.id, crewIds: [] }],
      })
    ).body.record;
    const reversed = [...collars].reverse();
    const reordered = await lead.patch(`/api/routes/${route.id}`, { rev: route.rev, collarIds: reversed });
    expect(reordered.status).toBe(200);
    expect(reordered.body.record.collarIds).toEqual(reversed);
    const progress = (await lead.get(`/api/campaigns/${camp.id}/progress`)).body;
    expect(progress.collars.map((c: Collar) => c.collarId)).toEqual(reversed); // walking order follows the route

    const assigned = await lead.patch(`/api/campaigns/${camp.id}`, {
      rev: camp.rev,
      routes: [{ routeId: route.id, crewIds: [CREW_ID], direction: 'forward' }],
    });
    expect(assigned.status).toBe(200);
    expect(assigned.body.record.routes).toEqual([{ routeId: route.id, crewIds: [CREW_ID], direction: 'forward' }]);

    const crewReorder = await crew.patch(`/api/routes/${route.id}`, { rev: reordered.body.record.rev, collarIds: collars });
    expect(crewReorder.status).toBe(403);
    const crewAssign = await crew.patch(`/api/campaigns/${camp.id}`, { rev: assigned.body.record.rev, routes: [] });
    expect(crewAssign.status).toBe(403);
    expect((await lead.get(`/api/routes/${route.id}`)).body.record.collarIds).toEqual(reversed);
    // Whom the lead can assign: the site's crew and leads, never lab or admin.
    const members = (await lead.get(`/api/sites/${DEMO_SITE_ID}/field-members`)).body.items;
    expect(members.map((m: { email: string }) => m.email).sort()).toEqual(['crew@fluxwalk.example', 'lead@fluxwalk.example']);
    expect((await crew.get(`/api/sites/${DEMO_SITE_ID}/field-members`)).status).toBe(403);
  });

  it('when a campaign is locked, then a pushed offset set is rejected with a readable message until the lead unlocks it', async () => {
    const collarId = east.collarIds[0];
    const route = (
      await lead.post('/api/routes', { siteId: DEMO_SITE_ID, name: `Lock ${randomUUID().slice(0, 6)}`, collarIds: [collarId] })
    ).body.record;
    const camp = (
      await lead.post('/api/campaigns', {
        siteId: DEMO_SITE_ID,
        name: 'Lock test',
        startsOn: '2026-12-11',
        endsOn: '2026-12-11',
        rounds: 1,
        routes: [{ routeId: route.id, crewIds: [CREW_ID] }],
      })
    ).body.record;
    // Still due: closing is refused and says which collar.
    const early = await lead.post(`/api/campaigns/${camp.id}/lock`);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/1 collar\(s\) are still due or partial: .*\(due\)/);
    const visit = (
      await crew.post('/api/visits', {
        siteId: DEMO_SITE_ID,
        campaignId: camp.id,
        round: 1,
        collarId,
        arrivedAt: '2026-12-11T09:00:00Z',
        skipped: true,
        skipReason: 'Fallen tree across the collar',
      })
    ).body.record;
    expect((await crew.post(`/api/campaigns/${camp.id}/lock`)).status).toBe(403);
    const locked = await lead.post(`/api/campaigns/${camp.id}/lock`);
    expect(locked.status).toBe(200);
    expect(locked.body.record.locked).toBe(true);

    const offsetSet = {
      siteId: DEMO_SITE_ID,
      visitId: visit.id,
      collarId,
      campaignId: camp.id,
      takenAt: '2026-12-11T09:05:00Z',
      readingsCm: [2.1, 2.3, 2.2, 2.0],
    };
    const op = { opId: randomUUID(), entity: 'offsetSet', id: randomUUID(), baseRev: null, op: 'upsert', fields: offsetSet };
    const push = await crew.post('/api/sync/push', { deviceId: randomUUID(), outboxSize: 1, ops: [op] });
    expect(push.status).toBe(200);
    expect(push.body.results).toEqual([
      expect.objectContaining({
        opId: op.opId,
        status: 'rejected',
        error: { message: 'Campaign "Lock test" is locked: field records cannot change until a lead unlocks it' },
      }),
    ]);
    expect((await crew.post('/api/offset-sets', offsetSet)).status).toBe(423);

    const reopened = await lead.post(`/api/campaigns/${camp.id}/unlock`);
    expect(reopened.body.record.locked).toBe(false);
    const again = await crew.post('/api/sync/push', { deviceId: randomUUID(), outboxSize: 1, ops: [{ ...op, opId: randomUUID() }] });
    expect(again.body.results[0].status).toBe('applied');
  });
});
