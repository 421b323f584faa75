import { ambientForClosure, profileForClosure, type AmbientCheck, type NamedProfileVersion } from './chamber-system';
import { chamberVolumeFor } from './chamber-volume';

// Two chamber systems at one site (common practice: one closure's volume is its own chamber's
// geometry, V = chamber + loop + A × offset — plain geometry, REFERENCES.md §8).
const tall: NamedProfileVersion[] = [
  { id: 'tall-1', name: 'Tall', validFrom: '2026-03-01', chamberVolumeCm3: 6000, loopVolumeCm3: 150, areaCm2: 314.16 },
  { id: 'tall-2', name: 'Tall', validFrom: '2026-07-01', chamberVolumeCm3: 6000, loopVolumeCm3: 210, areaCm2: 314.16 },
];
const short: NamedProfileVersion[] = [
  { id: 'short-1', name: 'Short', validFrom: '2026-05-01', chamberVolumeCm3: 2500, loopVolumeCm3: 90, areaCm2: 314.16 },
];
const all = [...tall, ...short];

describe('profileForClosure: the chamber a closure was made with', () => {
  it('when two chambers run on one day, then each closure gets the version of its own chamber, not the newest of any name', () => {
    expect(profileForClosure(all, 'tall-1', '2026-06-10', null)).toEqual({ ok: true, profile: tall[0], source: 'closure' });
    expect(profileForClosure(all, 'short-1', '2026-06-10', null)).toEqual({ ok: true, profile: short[0], source: 'closure' });
    // The old rule (latest validFrom ≤ day of any name) gave the short chamber to both.
    const v = chamberVolumeFor(
      '2026-06-10',
      [profileForClosure(all, 'tall-1', '2026-06-10', null).ok ? tall[0] : short[0]],
      [{ takenOn: '2026-06-01', offsetsCm: [2, 2, 2] }],
    );
    expect(v.ok && v.value.volumeCm3).toBeCloseTo(6000 + 150 + 314.16 * 2, 9);
  });

  it('when the closure names an older version of its chamber, then the version of that chamber valid on the closure day is used', () => {
    const r = profileForClosure(all, 'tall-1', '2026-07-15', null);
    expect(r.ok && r.profile.id).toBe('tall-2');
  });

  it('when a closure names no profile, then the site default chamber, else the only chamber, else a clear refusal', () => {
    expect(profileForClosure(all, null, '2026-06-10', 'short-1')).toMatchObject({
      ok: true,
      source: 'site-default',
      profile: { id: 'short-1' },
    });
    expect(profileForClosure(tall, null, '2026-06-10', null)).toMatchObject({
      ok: true,
      source: 'only-chamber',
      profile: { id: 'tall-1' },
    });
    const refused = profileForClosure(all, null, '2026-06-10', null);
    expect(refused.ok).toBe(false);
    expect(!refused.ok && refused.error).toMatch(/names no chamber profile.*2 chambers/);
  });

  it('when the chamber has no version valid that day or the named profile is gone, then it is refused with the reason', () => {
    expect(profileForClosure(all, 'short-1', '2026-04-01', null)).toEqual({
      ok: false,
      error: 'no version of chamber profile “Short” valid on 2026-04-01',
    });
    expect(profileForClosure(all, 'gone', '2026-06-10', null).ok).toBe(false);
  });
});

describe('ambientForClosure: the same analyzer, the nearest reading in time', () => {
  const checks: AmbientCheck[] = [
    { id: 'a-morning', analyzerId: 'A', at: '2026-06-10T07:00:00Z', co2Ppm: 418 },
    { id: 'b-morning', analyzerId: 'B', at: '2026-06-10T07:30:00Z', co2Ppm: 431 },
    { id: 'a-night', analyzerId: 'A', at: '2026-06-10T22:00:00Z', co2Ppm: 455 },
    { id: 'a-old', analyzerId: 'A', at: '2026-06-08T10:00:00Z', co2Ppm: 400 },
  ];

  it('when two analyzers took ambient readings, then a closure is compared with its own analyzer’s reading', () => {
    expect(ambientForClosure(checks, 'A', '2026-06-10T08:00:00Z')).toMatchObject({ ppm: 418, checkId: 'a-morning', gapMin: 60 });
    expect(ambientForClosure(checks, 'B', '2026-06-10T08:00:00Z')).toMatchObject({ ppm: 431, checkId: 'b-morning', gapMin: 30 });
  });

  it('when a night round has its own reading, then night closures use it, not the morning one', () => {
    expect(ambientForClosure(checks, 'A', '2026-06-10T23:10:00Z')).toMatchObject({ ppm: 455, checkId: 'a-night' });
  });

  it('when the nearest reading is over 12 h away or the closure names no analyzer, then there is no ambient', () => {
    expect(ambientForClosure(checks, 'B', '2026-06-11T08:00:00Z')).toBeNull();
    expect(ambientForClosure(checks, null, '2026-06-10T08:00:00Z')).toBeNull();
  });
});
