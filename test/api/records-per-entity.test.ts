import { randomUUID } from 'node:crypto';
import { ENTITY_PATHS, type EntityName } from '../../shared/model/entities';
import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

/** Every record type, through the same REST surface: create, read, filter, edit with rev bump, tombstone. */
describe('each record type over REST', () => {
  let t: TestApp;
  let sessions: Record<'crew' | 'lead' | 'lab' | 'admin', Session>;
  let w: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  let visitId: string;
  beforeAll(async () => {
    t = await startTestApp();
    const admin = await signIn(t.app, demoEmail('admin'));
    const lead = await signIn(t.app, demoEmail('lead'));
    w = await makeSiteWithCollar(admin, lead, LEAD_ID);
    sessions = { admin, lead, crew: await signIn(t.app, demoEmail('crew')), lab: await signIn(t.app, demoEmail('lab')) };
    visitId = (
      await lead.post('/api/visits', {
        siteId: w.site.id,
        campaignId: w.campaign.id,
        round: 1,
        collarId: w.collar.id,
        arrivedAt: '2026-06-01T08:00:00Z',
      })
    ).body.record.id;
  });
  afterAll(() => t.close());

  const tS = Array.from({ length: 60 }, (_, i) => i);
  /** A valid new record, who may write it, and one field to edit. */
  const cases = (): [EntityName, 'admin' | 'lead' | 'lab', Record<string, unknown>, Record<string, unknown>][] => {
    const at = { siteId: w.site.id, visitId, collarId: w.collar.id, campaignId: w.campaign.id };
    return [
      ['site', 'admin', { name: `S-${randomUUID().slice(0, 6)}`, timezone: 'Europe/Berlin', elevationM: 100 }, { elevationM: 150 }],
      ['block', 'admin', { siteId: w.site.id, code: 'B9' }, { name: 'north block' }],
      ['treatment', 'admin', { siteId: w.site.id, code: 'TRN', level: 'collar' }, { name: 'trenched' }],
      ['plot', 'admin', { siteId: w.site.id, code: 'P9', blockId: w.block.id }, { treatmentId: w.treatment.id }],
      ['collar', 'lead', { siteId: w.site.id, code: `K-${randomUUID().slice(0, 6)}`, plotId: w.plot.id, diameterCm: 10 }, { heightCm: 8 }],
      [
        'collarEvent',
        'lead',
        { siteId: w.site.id, collarId: w.collar.id, kind: 'clipped', date: '2026-06-02' },
        { note: 'grass cut to 2 cm' },
      ],
      [
        'chamberProfile',
        'admin',
        { siteId: w.site.id, name: 'C', validFrom: '2026-01-01', chamberVolumeCm3: 4000, loopVolumeCm3: 100 },
        { settleS: 25 },
      ],
      ['analyzer', 'admin', { siteId: w.site.id, name: 'A1', serial: 'X-1' }, { precisionPpm: 0.5 }],
      ['analyzerCheck', 'lead', { siteId: w.site.id, kind: 'ambient', at: '2026-06-01T07:00:00Z', co2Ppm: 425 }, { note: 'windy' }],
      ['route', 'lead', { siteId: w.site.id, name: 'R', collarIds: [w.collar.id] }, { name: 'R north' }],
      ['campaign', 'lead', { siteId: w.site.id, name: 'C2', startsOn: '2026-07-01', endsOn: '2026-07-01', rounds: 1 }, { rounds: 2 }],
      [
        'visit',
        'lead',
        { siteId: w.site.id, campaignId: w.campaign.id, round: 1, collarId: w.collar.id, arrivedAt: '2026-06-01T09:00:00Z' },
        { skipped: true, skipReason: 'flooded' },
      ],
      ['offsetSet', 'lead', { ...at, takenAt: '2026-06-01T08:01:00Z', readingsCm: [2, 2.5, 3] }, {}],
      [
        'probeReading',
        'lead',
        { ...at, takenAt: '2026-06-01T08:02:00Z', moistureRaw: 20, moistureKind: 'permittivity' },
        { probeId: 'TDR-2' },
      ],
      [
        'closure',
        'lead',
        {
          ...at,
          startedAt: '2026-06-01T08:03:00Z',
          settleS: 20,
          series: { tS, co2Ppm: tS.map((s) => 420 + s), tempC: tS.map(() => 15), pressureKpa: tS.map(() => 98) },
        },
        { chamberOffAt: '2026-06-01T08:04:00Z' },
      ],
      [
        'attachment',
        'lead',
        {
          siteId: w.site.id,
          ownerEntity: 'collar',
          ownerId: w.collar.id,
          mediaType: 'image/jpeg',
          sizeBytes: 1000,
          sha256: 'a'.repeat(64),
        },
        { fileName: 'rim.jpg' },
      ],
      [
        'temperatureLog',
        'lab',
        { siteId: w.site.id, plotId: w.plot.id, depthCm: 5, series: { t: ['2026-06-01T00:00:00Z'], tempC: [11.5] } },
        { source: 'logger 7' },
      ],
    ];
  };

  it('when each record type goes through create, read, filter, edit and delete, then rev and tombstone behave the same', async () => {
    const seen: string[] = [];
    for (const [entity, who, create, edit] of cases()) {
      const s = sessions[who];
      const path = `/api/${ENTITY_PATHS[entity]}`;
      const made = await s.post(path, create);
      expect([entity, made.status, made.body.error]).toEqual([entity, 201, undefined]);
      const rec = made.body.record;
      expect(rec).toMatchObject({ rev: 1, deleted: false });
      expect((await s.get(`${path}/${rec.id}`)).body.record.id).toBe(rec.id);
      const filter = entity === 'site' ? `siteId=${rec.id}` : `siteId=${w.site.id}`;
      expect((await s.get(`${path}?${filter}&limit=1000`)).body.items.map((x: { id: string }) => x.id)).toContain(rec.id);
      if (Object.keys(edit).length) {
        const changed = await s.patch(`${path}/${rec.id}`, { rev: 1, ...edit });
        expect([entity, changed.status]).toEqual([entity, 200]);
        expect(changed.body.record).toMatchObject({ ...edit, rev: 2 });
      }
      const del = await s.delete(`${path}/${rec.id}?rev=${Object.keys(edit).length ? 2 : 1}`);
      expect([entity, del.status, del.body.record?.deleted]).toEqual([entity, 200, true]);
      const [{ deleted }] = await t.ds.query(`SELECT deleted FROM ${tableOf(entity)} WHERE id = $1`, [rec.id]);
      expect(deleted).toBe(true);
      seen.push(entity);
    }
    expect(seen).toHaveLength(Object.keys(ENTITY_PATHS).length);
  });

  it('when a pushed-style closure is created, then the engine results and flags are stored with it at once', async () => {
    const c = (
      await sessions.lead.post('/api/closures', {
        siteId: w.site.id,
        visitId,
        collarId: w.collar.id,
        campaignId: w.campaign.id,
        startedAt: '2026-06-01T08:10:00Z',
        settleS: 20,
        series: { tS, co2Ppm: tS.map((s) => 420 + 0.5 * s), tempC: tS.map(() => 15) },
      })
    ).body.record;
    expect(c.results.raw).toBeTruthy();
    expect(Array.isArray(c.flags)).toBe(true);
  });
});

function tableOf(entity: EntityName): string {
  return entity.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
}
