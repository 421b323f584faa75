import { planClosureFit, withCollarArea, type FitContext } from './closure-fit-plan';

// Invented closure: 121 s at 1 Hz rising 0.3 ppm/s, measured pressure and temperature.
const tS = Array.from({ length: 121 }, (_, i) => i);
const series = { tS, co2Ppm: tS.map((t) => 420 + 0.3 * t), pressureKpa: tS.map(() => 97.5), tempC: tS.map(() => 18) };
const profile = { id: 'p1', name: 'Chamber A', validFrom: '2026-01-01', chamberVolumeCm3: 4000, loopVolumeCm3: 150, footprintAreaCm2: 300 };
const ctx = (over: Partial<FitContext> = {}): FitContext => ({
  timezone: 'Europe/Berlin',
  elevationM: 400,
  ambientMarginPpm: 100,
  slopeBasis: 'closure',
  defaultProfileId: null,
  defaultAirTempC: 15,
  profiles: withCollarArea([profile], 314.16),
  offsetSets: [{ takenOn: '2026-06-01', offsetsCm: [2, 2, 2, 2] }],
  precisionPpm: null,
  ambientPpm: null,
  visitAirTempC: null,
  ...over,
});
const closure = { startedAt: '2026-06-01T07:00:00Z', profileId: 'p1', series };

describe('one assembly of a closure fit (device and server)', () => {
  it('when the collar has its own inside area, then the fit uses it; the profile footprint stands in only without one', () => {
    expect(withCollarArea([profile], 314.16)[0].areaCm2).toBe(314.16);
    expect(withCollarArea([profile], null)[0].areaCm2).toBe(300);
    expect(planClosureFit(closure, ctx()).volume).toMatchObject({ ok: true, value: { areaCm2: 314.16 } });
  });

  it("when the collar has no offset set, then the fit is refused with the volume rule's reason", () => {
    const plan = planClosureFit(closure, ctx({ offsetSets: [] }));
    expect(plan.fit({ settleS: 20 }).error).toBe('no offset set for this collar');
  });

  it('when the series has no pressure, then the standard atmosphere at the site elevation stands in and is marked as a default', () => {
    const plan = planClosureFit({ ...closure, series: { ...series, pressureKpa: null } }, ctx());
    expect(plan.pressureIsDefault).toBe(true);
    expect(plan.fit({ settleS: 20 }).selected).not.toBeNull();
  });

  it('when the closure starts before midnight UTC but after it in the site zone, then the site-local day picks the offset set', () => {
    // 23:30 UTC on 31 May is 01:30 on 1 June in Berlin (CEST): the set of 1 June applies, not the later one.
    const plan = planClosureFit(
      { ...closure, startedAt: '2026-05-31T23:30:00Z' },
      ctx({
        offsetSets: [
          { takenOn: '2026-06-01', offsetsCm: [2, 2, 2, 2] },
          { takenOn: '2026-06-02', offsetsCm: [5, 5, 5, 5] },
        ],
      }),
    );
    expect(plan.day).toBe('2026-06-01');
    expect(plan.volume).toMatchObject({ ok: true, value: { meanOffsetCm: 2 } });
  });

  it('when review settings are given, then the same plan fits again with them (raw and review share every input)', () => {
    const plan = planClosureFit(closure, ctx());
    const raw = plan.fit({ settleS: 20 });
    const review = plan.fit({ settleS: 40, windowEndS: 100, model: 'linear' });
    expect(review.window).toMatchObject({ firstTS: 40, lastTS: 100 });
    expect(raw.window?.firstTS).toBe(20);
    expect(review.linear!.slopePpmS).toBeCloseTo(raw.linear!.slopePpmS, 6);
  });
});
