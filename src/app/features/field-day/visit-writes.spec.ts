import { TestBed } from '@angular/core/testing';
import { visitConditionsSchema } from '../../../../shared/model/field-records';
import { signedInDevice, TEST_SITE } from '../../core/db/testing/signed-in-device';
import { VisitWrites, type VisitTarget } from './visit-writes';

const target: VisitTarget = {
  siteId: TEST_SITE,
  campaignId: '44444444-4444-4444-8444-444444444444',
  round: 1,
  collarId: '33333333-3333-4333-8333-333333333333',
};
const reading = (moistureRaw: number) => ({
  soilTemps: [{ depthCm: 5, tempC: 11.5 }],
  moistureRaw,
  moistureKind: 'vwc' as const,
  rodLengthCm: 12,
  probeId: 'TDR-2',
});

describe('VisitWrites probe replicates on the device', () => {
  afterEach(() => localStorage.clear());

  it('when two replicates are saved and the first corrected, then two records and two create ops exist, each taken by the signed-in user', async () => {
    const { db, userId } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    const a = 'aaaaaaaa-0000-4000-8000-000000000001',
      b = 'bbbbbbbb-0000-4000-8000-000000000002';
    await Promise.all([writes.saveProbe(target, null, reading(23.4), a), writes.saveProbe(target, null, reading(23.5), a)]);
    await writes.saveProbe(target, null, reading(25.1), b);
    const records = await db.records('probeReading').toArray();
    expect(records.map((r) => [r.id, r.moistureRaw, r.takenById]).sort()).toEqual([
      [a, 23.5, userId],
      [b, 25.1, userId],
    ]);
    const ops = (await db.outbox.toArray()).filter((o) => o.entity === 'probeReading');
    // An unsent create takes the correction in (the device never conflicts with itself); the replicates stay apart.
    expect(ops.map((o) => [o.id, o.baseRev, o.fields['moistureRaw']]).sort()).toEqual([
      [a, null, 23.5],
      [b, null, 25.1],
    ]);
    expect(new Set(records.map((r) => r.visitId)).size).toBe(1);
  });

  it('when a replicate is deleted, then it leaves the device and the other stays', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    const a = 'aaaaaaaa-0000-4000-8000-000000000003',
      b = 'bbbbbbbb-0000-4000-8000-000000000004';
    await writes.saveProbe(target, null, reading(20), a);
    await writes.saveProbe(target, null, reading(99), b);
    await writes.deleteProbe(b);
    expect((await db.records('probeReading').toArray()).map((r) => r.id)).toEqual([a]);
  });

  it('when a replicate is out of range, then it is refused with the schema message and nothing is stored', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    await expect(writes.saveProbe(target, null, reading(150), 'cccccccc-0000-4000-8000-000000000005')).rejects.toThrow(
      'VWC must be between 0 and 100 %',
    );
    expect(await db.records('probeReading').count()).toBe(0);
  });
});

describe('VisitWrites when saves at one collar overlap', () => {
  afterEach(() => localStorage.clear());
  const conditions = visitConditionsSchema.parse({ rain24h: true });

  it('when the last offset keypress and the autosave both save the same set before the screen has caught up, then one visit and one offset set are stored', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    // Both callers hold the screen's copy from before either save: no visit, no set.
    await Promise.all([writes.saveOffsetSet(target, null, [2.0, 2.1, 1.9, 5.0]), writes.saveOffsetSet(target, null, [2.0, 2.1, 1.9, 5.0])]);
    expect(await db.records('visit').count()).toBe(1);
    const sets = await db.records('offsetSet').toArray();
    expect(sets.map((s) => [s.readingsCm, s.supersedesId])).toEqual([[[2.0, 2.1, 1.9, 5.0], null]]);
  });

  it('when a corrected set is saved while the screen still shows none, then the correction supersedes the stored set', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    await Promise.all([writes.saveOffsetSet(target, null, [2.0, 2.1, 1.9, 5.0]), writes.saveOffsetSet(target, null, [2.0, 2.1, 1.9, 2.0])]);
    const sets = (await db.records('offsetSet').toArray()).sort((a, b) => a.takenAt.localeCompare(b.takenAt) || (a.supersedesId ? 1 : -1));
    expect(sets.map((s) => s.readingsCm)).toEqual([
      [2.0, 2.1, 1.9, 5.0],
      [2.0, 2.1, 1.9, 2.0],
    ]);
    expect(sets[1].supersedesId).toBe(sets[0].id);
  });

  it('when conditions and a skip arrive at a collar with no visit yet, then one visit holds both', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    await Promise.all([writes.saveConditions(target, null, conditions), writes.skip(target, null, 'Fallen tree across the plot')]);
    const visits = await db.records('visit').toArray();
    expect(visits.map((v) => [v.conditions.rain24h, v.skipped, v.skipReason])).toEqual([[true, true, 'Fallen tree across the plot']]);
  });

  it('when a visit was made by an earlier save long ago and the screen has not shown it, then the next save uses it', async () => {
    const { db } = await signedInDevice();
    const writes = TestBed.inject(VisitWrites);
    await writes.saveConditions(target, null, conditions);
    // Longer than any in-memory "recently created" window: the device itself must be asked.
    await new Promise((r) => setTimeout(r, 2_100));
    await writes.saveOffsetSet(target, null, [1.6, 1.7, 1.5, 1.6]);
    const [visit] = await db.records('visit').toArray();
    expect(await db.records('visit').count()).toBe(1);
    expect((await db.records('offsetSet').toArray()).map((s) => s.visitId)).toEqual([visit.id]);
  });
});
