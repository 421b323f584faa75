import type { PullAnswer } from '../../../../shared/sync/sync-wire';
import { applyPullPage } from './pull-apply';
import { lacksDefault, pulledRecord } from './pulled-record';
import { PLOT, SITE, collar, testDb } from './testing/test-db';

const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const V = 'dddddddd-dddd-4ddd-8ddd-dddddddddddd';
const CAMPAIGN = 'eeeeeeee-eeee-4eee-8eee-eeeeeeeeeeee';
const ROUTE = 'ffffffff-ffff-4fff-8fff-ffffffffffff';

const page = (changes: PullAnswer['changes']): PullAnswer => ({ changes, cursor: 9, more: false });

describe('pulled records through the shared schema', () => {
  it('when a pulled collar lacks defaulted fields, then it arrives in Dexie with their defaults and keeps derived fields and meta', async () => {
    const db = testDb();
    // A copy written before these fields existed: no status, shape, notes, positions.
    const old = {
      siteId: SITE,
      code: 'OLD-1',
      plotId: PLOT,
      diameterCm: 20,
      areaCm2: 314.16,
      updatedAt: '2025-01-01T00:00:00.000Z',
      updatedBy: null,
      deleted: false,
    };
    await applyPullPage(db, page([{ seq: 1, entity: 'collar', id: A, rev: 3, deleted: false, record: old }]));

    const stored = await db.records('collar').get(A);
    expect(stored).toMatchObject({
      id: A,
      rev: 3,
      code: 'OLD-1',
      status: 'active',
      shape: 'round',
      notes: '',
      latitude: null,
      statusReason: null,
      areaCm2: 314.16,
      updatedAt: '2025-01-01T00:00:00.000Z',
      deleted: false,
    });
  });

  it('when a pulled visit lacks a nested default (a condition added later), then the nested default is filled', async () => {
    const db = testDb();
    const visit = {
      siteId: SITE,
      campaignId: CAMPAIGN,
      round: 1,
      collarId: A,
      crewId: null,
      arrivedAt: '2025-05-01T08:00:00.000Z',
      conditions: { rainNow: true, rain24h: false, standingWater: false, frostSnow: false, trampled: false, animal: false, other: '' },
      skipped: false,
      skipReason: null,
    };
    await applyPullPage(db, page([{ seq: 1, entity: 'visit', id: V, rev: 1, deleted: false, record: visit }]));

    const stored = await db.records('visit').get(V);
    expect(stored?.conditions).toEqual({ ...visit.conditions, airTempC: null });
  });

  it('when a campaign route entry lacks its direction, then the entry gets the default inside the list', () => {
    const campaign = {
      siteId: SITE,
      name: 'Spring',
      startsOn: '2025-04-01',
      endsOn: '2025-06-30',
      rounds: 3,
      dueOffset: true,
      dueClosures: 1,
      dueProbes: true,
      routes: [{ routeId: ROUTE, crewIds: [] }],
      roundWindows: [],
      locked: false,
    };
    expect(lacksDefault('campaign', campaign)).toBe(true);
    expect(pulledRecord('campaign', { ...campaign, id: CAMPAIGN, rev: 1 }).routes).toEqual([
      { routeId: ROUTE, crewIds: [], direction: 'alternate' },
    ]);
  });

  it('when a pulled record has every defaulted field, then it is stored as sent (no parse on the bulk path)', () => {
    const full = collar(A, 2, {
      latitude: null,
      longitude: null,
      accuracyM: null,
      sideACm: null,
      sideBCm: null,
      heightCm: null,
      insertionCm: null,
      installedOn: null,
    });
    expect(lacksDefault('collar', full)).toBe(false);
    expect(lacksDefault('collar', { ...full, status: undefined })).toBe(true);
    expect(pulledRecord('collar', full)).toBe(full);
  });

  it('when a pulled record fails the device schema, then nothing the server sent is lost and missing defaults are still filled', () => {
    // An older rule let this code through; the device's schema refuses an empty code.
    const odd = { id: A, rev: 4, siteId: SITE, code: '', plotId: PLOT, diameterCm: 20, areaCm2: 314.16, newerServerField: 'kept' };
    const stored = pulledRecord('collar', odd);
    expect(stored).toMatchObject({ ...odd, status: 'active', notes: '', shape: 'round' });
  });
});
