import { toppVwc } from '../../shared/flux/soil-moisture';
import { airH2oMmolMol, permittivityForVwc, pressureKpa, saturationVapourKpa, soilTempC, soilVwcPct } from './demo-climate';

const at = (iso: string) => Date.parse(iso);

describe('invented demo weather', () => {
  it('when mid-April and late July are compared, then 5 cm soil is about 10 °C warmer in summer', () => {
    const april = soilTempC(at('2026-04-15T12:00:00Z'));
    const july = soilTempC(at('2026-07-27T12:00:00Z'));
    expect(april).toBeGreaterThan(4);
    expect(april).toBeLessThan(12);
    expect(july - april).toBeGreaterThan(7);
    expect(july).toBeLessThan(25);
  });

  it('when a summer day is sampled hourly, then 5 cm soil peaks in the afternoon and 15 cm swings less, later', () => {
    const hours = Array.from({ length: 24 }, (_, h) => at(`2026-07-10T${String(h).padStart(2, '0')}:00:00Z`));
    const at5 = hours.map((ms) => soilTempC(ms));
    const at15 = hours.map((ms) => soilTempC(ms, undefined, 15));
    const peak5 = at5.indexOf(Math.max(...at5));
    const peak15 = at15.indexOf(Math.max(...at15));
    expect(peak5).toBeGreaterThanOrEqual(12);
    expect(peak5).toBeLessThanOrEqual(15);
    expect(peak15).toBeGreaterThan(peak5);
    expect(Math.max(...at15) - Math.min(...at15)).toBeLessThan(Math.max(...at5) - Math.min(...at5));
  });

  it('when a warmed plot is compared with a neutral one, then it is warmer by its offset', () => {
    const ms = at('2026-06-01T06:00:00Z');
    expect(soilTempC(ms, { offsetC: 1.8, dailyAmplitudeFactor: 1 }) - soilTempC(ms)).toBeCloseTo(1.8, 10);
  });

  it('when pressure is read over the season, then it stays within ±2 kPa of 96.4 kPa (420 m, US Standard Atmosphere 1976)', () => {
    for (let d = 0; d < 200; d += 3) {
      const p = pressureKpa(at('2026-04-01T00:00:00Z') + d * 86_400_000);
      expect(Math.abs(p - 96.4)).toBeLessThan(2);
    }
  });

  it('when water vapour is read through the season, then it stays within 5–18.5 mmol/mol', () => {
    for (let d = 0; d < 240; d += 2) {
      const h = airH2oMmolMol(at('2026-04-01T10:00:00Z') + d * 86_400_000);
      expect(h).toBeGreaterThanOrEqual(5);
      expect(h).toBeLessThanOrEqual(18.5);
    }
    expect(soilVwcPct(at('2026-08-20T08:00:00Z'))).toBeLessThan(soilVwcPct(at('2026-04-10T08:00:00Z')) + 5);
  });

  it('when saturation vapour pressure is computed at 20 °C, then it is 2.34 kPa (Tetens 1930; FAO-56, Allen et al. 1998, Annex 2 Table 2.3 — from memory)', () => {
    expect(saturationVapourKpa(20)).toBeCloseTo(2.338, 2);
  });

  it('when a water content is turned into permittivity, then Topp et al. (1980, WRR 16) gives it back', () => {
    // Topp at Ka = 25: −0.053 + 0.73 − 0.34375 + 0.0671875 = 0.4004375 m³/m³.
    expect(permittivityForVwc(40.04375)).toBeCloseTo(25, 3);
    for (const vwc of [10, 20, 30, 40]) expect(toppVwc(permittivityForVwc(vwc)) * 100).toBeCloseTo(vwc, 4);
  });
});
