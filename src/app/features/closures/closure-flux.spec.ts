import { chamberFluxUmolM2S, fitClosure } from '../../../../shared/flux';
import type { LocalRecord } from '../../core/db/db-schema';
import { fluxOnTheSpot } from './closure-flux';
import { ambientByDay } from './closure-store';
import { readManualSeries } from './manual-series';

const rec = (id: string, fields: Record<string, unknown>): LocalRecord => ({ id, rev: 1, ...fields });
const site = rec('s', { timezone: 'Europe/Berlin', elevationM: 450, ambientMarginPpm: 100 });
const collar = rec('k', { siteId: 's', diameterCm: 20, shape: 'round' });
const profile = rec('p', { siteId: 's', validFrom: '2025-01-01', chamberVolumeCm3: 4000, loopVolumeCm3: 50, settleS: 10 });
const offsets = rec('o', { collarId: 'k', takenAt: '2025-06-12T06:50:00Z', readingsCm: [2, 2, 2, 2] });

describe('flux on the spot', () => {
  it('when a closure has a series, then the device gets the engine result with the volume chamber + loop + area × offset', () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
    const closure = rec('c', {
      startedAt: '2025-06-12T07:00:00Z', settleS: 10,
      series: { tS, co2Ppm: tS.map((t) => 420 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
    });
    const spot = fluxOnTheSpot(closure, { site, collar, profiles: [profile], offsetSets: [offsets], analyzer: null, ambientPpmByDay: { '2025-06-12': 415 } })!;
    const area = (Math.PI * 20 * 20) / 4;
    expect(spot.volumeCm3).toBeCloseTo(4000 + 50 + area * 2, 6);
    // The same call the server makes, so the crew sees the lab's number.
    const direct = fitClosure({ tS, co2Ppm: tS.map((t) => 420 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20),
      volumeCm3: spot.volumeCm3!, areaCm2: area, settleS: 10, ambientPpm: 415, ambientMarginPpm: 100, pressureIsDefault: false, offsetAfter: false });
    expect(spot.fit.selected!.fluxUmolM2S).toBeCloseTo(direct.selected!.fluxUmolM2S, 10);
    expect(spot.fit.linear!.slopePpmS).toBeCloseTo(0.5, 6);
    expect(spot.fit.linear!.fluxUmolM2S).toBeCloseTo(chamberFluxUmolM2S(0.5, 96, 20, spot.volumeCm3!, area, 0), 6);
    // By hand, ideal gas law F = p·V/(R·T·A)·dχ/dt (R = 8.314462618, CODATA 2018):
    // 96 000 Pa × 4.6783e-3 m³ / (8.314462618 × 293.15 K × 0.0314159 m²) × 0.5e-6 s⁻¹ = 2.932 µmol m⁻² s⁻¹.
    expect(spot.fit.linear!.fluxUmolM2S).toBeCloseTo(2.932, 2);
    expect(spot.startAboveAmbientPpm).toBe(5);
  });

  it('when there is no offset set for the collar, then no flux is made up and the reason is shown', () => {
    const closure = rec('c', { startedAt: '2025-06-12T07:00:00Z', settleS: 10, series: { tS: [0, 10, 20, 30], co2Ppm: [420, 425, 430, 435], tempC: [20, 20, 20, 20] } });
    const spot = fluxOnTheSpot(closure, { site, collar, profiles: [profile], offsetSets: [], analyzer: null, ambientPpmByDay: {} })!;
    expect(spot.fit.selected).toBeNull();
    expect(spot.fit.flags).toEqual(['invalid-input']);
    expect(spot.fit.error).toMatch(/offset/i);
  });

  it('when a short series is typed with decimal commas, then it is read; a line out of order is named', () => {
    const ok = readManualSeries('0 415,2\n10 418,9\n20 422,4', 18.5, null);
    expect(ok).toEqual({ ok: true, series: { tS: [0, 10, 20], co2Ppm: [415.2, 418.9, 422.4], h2oMmolMol: null, pressureKpa: null, tempC: [18.5, 18.5, 18.5] } });
    expect(readManualSeries('0 415\n10 416\n5 417', 18, null)).toEqual({ ok: false, message: 'Line 3: time must increase' });
  });

  it('when the series is brought in on a later day, then the start is compared with the ambient reading of the closure\'s own local day', () => {
    const check = (id: string, at: string, co2Ppm: number, extra: Record<string, unknown> = {}) => rec(id, { kind: 'ambient', at, co2Ppm, ...extra });
    const byDay = ambientByDay([
      // 22:30 UTC on the 11th is 00:30 on the 12th in Berlin (UTC+2 in June).
      check('a', '2025-06-11T22:30:00Z', 412),
      check('b', '2025-06-12T09:00:00Z', 418),
      check('c', '2025-06-12T10:00:00Z', 900, { skipped: true }),
      check('d', '2025-06-14T06:00:00Z', 440),
    ], 'Europe/Berlin');
    expect(byDay).toEqual({ '2025-06-12': 418, '2025-06-14': 440 });
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
    const closure = rec('c', { startedAt: '2025-06-12T07:00:00Z', settleS: 10,
      series: { tS, co2Ppm: tS.map((t) => 430 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) } });
    const spot = fluxOnTheSpot(closure, { site, collar, profiles: [profile], offsetSets: [offsets], analyzer: null, ambientPpmByDay: byDay })!;
    expect(spot.startAboveAmbientPpm).toBe(12);
    const noReading = fluxOnTheSpot({ ...closure, startedAt: '2025-06-13T07:00:00Z' }, { site, collar, profiles: [profile], offsetSets: [offsets], analyzer: null, ambientPpmByDay: byDay })!;
    expect(noReading.startAboveAmbientPpm).toBeNull();
  });
});
