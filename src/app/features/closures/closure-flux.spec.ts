import { chamberFluxUmolM2S, fitClosure } from '../../../../shared/flux';
import { deviceRecord } from '../../core/db/testing/test-db';
import { fluxOnTheSpot } from './closure-flux';
import { ambientChecks } from './closure-scene';
import { readManualSeries } from './manual-series';

const S = '11111111-1111-4111-8111-111111111111';
const K = '33333333-3333-4333-8333-333333333333';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const VISIT = '55555555-5555-4555-8555-555555555555';
const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const B = 'bbbbbbbb-bbbb-4bbb-8bbb-bbbbbbbbbbbb';
const C = 'cccccccc-cccc-4ccc-8ccc-cccccccccccc';
const site = deviceRecord('site', { id: S, name: 'Test site', timezone: 'Europe/Berlin', elevationM: 450, ambientMarginPpm: 100 });
const collar = deviceRecord('collar', { id: K, siteId: S, code: 'K-1', plotId: S, diameterCm: 20, shape: 'round' });
const profile = deviceRecord('chamberProfile', {
  id: 'p',
  siteId: S,
  name: 'Opaque',
  validFrom: '2025-01-01',
  chamberVolumeCm3: 4000,
  loopVolumeCm3: 50,
  settleS: 10,
});
const offsets = deviceRecord('offsetSet', {
  id: 'o',
  siteId: S,
  visitId: VISIT,
  collarId: K,
  campaignId: CAMPAIGN,
  takenAt: '2025-06-12T06:50:00Z',
  readingsCm: [2, 2, 2, 2],
});
/** A closure of the visit with the given fields. */
const closureWith = (fields: Record<string, unknown>) =>
  deviceRecord('closure', { id: 'c', siteId: S, visitId: VISIT, collarId: K, campaignId: CAMPAIGN, ...fields });

describe('flux on the spot', () => {
  it('when a closure has a series, then the device gets the engine result with the volume chamber + loop + area × offset', () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
    const closure = closureWith({
      startedAt: '2025-06-12T07:00:00Z',
      settleS: 10,
      analyzerId: A,
      series: { tS, co2Ppm: tS.map((t) => 420 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
    });
    const spot = fluxOnTheSpot(closure, {
      site,
      collar,
      profiles: [profile],
      offsetSets: [offsets],
      analyzer: null,
      visitAirTempC: null,
      ambientChecks: [{ id: 'a', analyzerId: A, at: '2025-06-12T06:30:00Z', co2Ppm: 415 }],
    })!;
    const area = (Math.PI * 20 * 20) / 4;
    expect(spot.volumeCm3).toBeCloseTo(4000 + 50 + area * 2, 6);
    // The same call the server makes, so the crew sees the lab's number.
    const direct = fitClosure({
      tS,
      co2Ppm: tS.map((t) => 420 + 0.5 * t),
      h2oMmolMol: null,
      pressureKpa: tS.map(() => 96),
      tempC: tS.map(() => 20),
      volumeCm3: spot.volumeCm3!,
      areaCm2: area,
      settleS: 10,
      ambientPpm: 415,
      ambientMarginPpm: 100,
      pressureIsDefault: false,
      offsetAfter: false,
    });
    expect(spot.fit.selected!.fluxUmolM2S).toBeCloseTo(direct.selected!.fluxUmolM2S, 10);
    expect(spot.fit.linear!.slopePpmS).toBeCloseTo(0.5, 6);
    expect(spot.fit.linear!.fluxUmolM2S).toBeCloseTo(chamberFluxUmolM2S(0.5, 96, 20, spot.volumeCm3!, area, 0), 6);
    // By hand, ideal gas law F = p·V/(R·T·A)·dχ/dt (R = 8.314462618, CODATA 2018):
    // 96 000 Pa × 4.6783e-3 m³ / (8.314462618 × 293.15 K × 0.0314159 m²) × 0.5e-6 s⁻¹ = 2.932 µmol m⁻² s⁻¹.
    expect(spot.fit.linear!.fluxUmolM2S).toBeCloseTo(2.932, 2);
    expect(spot.startAboveAmbientPpm).toBe(5);
  });

  it('when there is no offset set for the collar, then no flux is made up and the reason is shown', () => {
    const closure = closureWith({
      startedAt: '2025-06-12T07:00:00Z',
      settleS: 10,
      series: { tS: [0, 10, 20, 30], co2Ppm: [420, 425, 430, 435], tempC: [20, 20, 20, 20] },
    });
    const spot = fluxOnTheSpot(closure, {
      site,
      collar,
      profiles: [profile],
      offsetSets: [],
      analyzer: null,
      ambientChecks: [],
      visitAirTempC: null,
    })!;
    expect(spot.fit.selected).toBeNull();
    expect(spot.fit.flags).toEqual(['invalid-input']);
    expect(spot.fit.error).toMatch(/offset/i);
  });

  it('when a short series is typed with decimal commas, then it is read; a line out of order is named', () => {
    const ok = readManualSeries('0 415,2\n10 418,9\n20 422,4', 18.5, null);
    expect(ok).toEqual({
      ok: true,
      series: { tS: [0, 10, 20], co2Ppm: [415.2, 418.9, 422.4], h2oMmolMol: null, pressureKpa: null, tempC: [18.5, 18.5, 18.5] },
    });
    expect(readManualSeries('0 415\n10 416\n5 417', 18, null)).toEqual({ ok: false, message: 'Line 3: time must increase' });
  });

  it('when two analyzers took ambient readings, then the closure is compared with its own analyzer’s reading nearest in time', () => {
    const check = (id: string, analyzerId: string, at: string, co2Ppm: number, extra: Record<string, unknown> = {}) =>
      deviceRecord('analyzerCheck', { id, siteId: S, kind: 'ambient', analyzerId, at, co2Ppm, ...extra });
    const checks = ambientChecks([
      check('a', A, '2025-06-12T05:00:00Z', 412),
      check('b', B, '2025-06-12T06:55:00Z', 440),
      check('c', A, '2025-06-12T06:50:00Z', 900, { skipped: true, skipReason: 'warming up' }),
      check('d', A, '2025-06-12T20:00:00Z', 470),
    ]);
    expect(checks.map((c) => c.id)).toEqual(['a', 'b', 'd']);
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
    const closure = closureWith({
      startedAt: '2025-06-12T07:00:00Z',
      settleS: 10,
      analyzerId: A,
      series: { tS, co2Ppm: tS.map((t) => 430 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
    });
    const inputs = { site, collar, profiles: [profile], offsetSets: [offsets], analyzer: null, ambientChecks: checks, visitAirTempC: null };
    expect(fluxOnTheSpot(closure, inputs)!.startAboveAmbientPpm).toBe(18);
    expect(fluxOnTheSpot({ ...closure, startedAt: '2025-06-12T19:00:00Z' }, inputs)!.startAboveAmbientPpm).toBe(-40);
    expect(fluxOnTheSpot({ ...closure, analyzerId: C }, inputs)!.startAboveAmbientPpm).toBeNull();
  });

  it('when the file has no chamber temperature, then the visit’s air temperature gives the flux and says so', () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
    const closure = closureWith({
      startedAt: '2025-06-12T07:00:00Z',
      settleS: 10,
      series: { tS, co2Ppm: tS.map((t) => 420 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: null },
    });
    const inputs = { site, collar, profiles: [profile], offsetSets: [offsets], analyzer: null, ambientChecks: [], visitAirTempC: 8 };
    const spot = fluxOnTheSpot(closure, inputs)!;
    expect(spot.airTempSource).toBe('visit');
    expect(spot.fit.flags).toContain('temp-from-visit');
    const area = (Math.PI * 20 * 20) / 4;
    expect(spot.fit.linear!.fluxUmolM2S).toBeCloseTo(chamberFluxUmolM2S(0.5, 96, 8, spot.volumeCm3!, area, 0), 6);
    const none = fluxOnTheSpot(closure, { ...inputs, visitAirTempC: null })!;
    expect(none.airTempSource).toBe('site-default');
    expect(none.fit.flags).toContain('temp-site-default');
  });
});
