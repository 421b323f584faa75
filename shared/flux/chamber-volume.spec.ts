import { chamberVolumeFor, roundCollarAreaCm2 } from './chamber-volume';

const profiles = [
  { validFrom: '2024-03-01', chamberVolumeCm3: 4000, loopVolumeCm3: 60, areaCm2: 317.8 },
  { validFrom: '2024-06-15', chamberVolumeCm3: 4100, loopVolumeCm3: 75, areaCm2: 317.8 },
];
const offsets = [
  { takenOn: '2024-04-02', offsetsCm: [3.0, 3.4, 3.2, 3.4] },
  { takenOn: '2024-07-01T09:30:00Z', offsetsCm: [2.0, 2.2, null, 2.4] },
];

describe('chamberVolumeFor (V = chamber + loop + A × mean offset, plain geometry)', () => {
  it('uses the profile valid on the day and the latest offset set on or before it', () => {
    const r = chamberVolumeFor('2024-05-10', profiles, offsets);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.meanOffsetCm).toBeCloseTo(3.25, 12);
    expect(r.value.volumeCm3).toBeCloseTo(4000 + 60 + 317.8 * 3.25, 9);
    expect(r.value.flags).toEqual([]);
  });

  it('counts an offset set taken later on the closure day as on that day, and switches profile on validFrom', () => {
    const r = chamberVolumeFor('2024-07-01T14:00:00', profiles, offsets);
    if (!r.ok) throw new Error(r.error);
    expect(r.value.profile.validFrom).toBe('2024-06-15');
    expect(r.value.meanOffsetCm).toBeCloseTo(2.2, 12); // the null reading is ignored
    expect(r.value.volumeCm3).toBeCloseTo(4100 + 75 + 317.8 * 2.2, 9);
  });

  it('falls back to the earliest later offset set and flags offset-after', () => {
    const r = chamberVolumeFor('2024-03-20', profiles, offsets);
    if (!r.ok) throw new Error(r.error);
    expect(r.value.offsetSet.takenOn).toBe('2024-04-02');
    expect(r.value.flags).toEqual(['offset-after']);
  });

  it('takes A from the collar (the profile’s footprint is only reported beside it)', () => {
    const r = chamberVolumeFor('2024-05-10', [{ ...profiles[0], areaCm2: 314.159, footprintAreaCm2: 317.8 }], offsets);
    if (!r.ok) throw new Error(r.error);
    expect(r.value.areaCm2).toBe(314.159);
    expect(r.value.volumeCm3).toBeCloseTo(4000 + 60 + 314.159 * 3.25, 9);
    expect(r.value.footprintAreaCm2).toBe(317.8);
  });

  it('refuses when no profile is valid yet, or the collar has no offset set', () => {
    expect(chamberVolumeFor('2024-01-01', profiles, offsets)).toEqual({ ok: false, error: 'no chamber profile valid on 2024-01-01' });
    expect(chamberVolumeFor('2024-05-01', profiles, [])).toEqual({ ok: false, error: 'no offset set for this collar' });
  });

  it('collar area π d²/4: 20 cm → 314.159 cm², so a 3.5 cm offset adds 1099.557 cm³ (REFERENCES.md §8)', () => {
    expect(roundCollarAreaCm2(20)).toBeCloseTo(314.159, 3);
    expect(roundCollarAreaCm2(20) * 3.5).toBeCloseTo(1099.557, 3);
  });
});
