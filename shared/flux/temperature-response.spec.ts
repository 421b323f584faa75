import { readFileSync } from 'fs';
import { join } from 'path';
import { studentTQuantile } from './student-t';
import { fitLloydTaylor, fitQ10, lloydTaylorModel, q10Model, type LloydTaylorFit, type Q10Fit } from './temperature-response';

const fixture = JSON.parse(readFileSync(join(__dirname, 'fixtures', 'scipy-temperature.json'), 'utf8'));

describe('temperature response models: published check values', () => {
  it.each([
    [0, 0.5],
    [20, 2],
    [30, 4],
  ])('Q10 = 2, R10 = 1: %d °C gives %f (generic Q10 form; Davidson, Janssens & Luo 2006, Global Change Biol. 12)', (t, r) => {
    expect(q10Model(t, 1, 2)).toBeCloseTo(r, 12);
  });

  it.each([
    [0, 0.30214],
    [5, 0.58287],
    [15, 1.5704],
    [20, 2.3032],
    [25, 3.20061],
    [30, 4.25928],
  ])('Lloyd & Taylor (1994, Funct. Ecol. 8, Eq. 11), E0 = 308.56 K, T0 = 227.13 K, R10 = 1: %d °C gives %f', (t, r) => {
    expect(lloydTaylorModel(t, 1)).toBeCloseTo(r, 5);
  });
});

describe('Student t quantiles', () => {
  it('match scipy.stats.t.ppf (fixture) and the textbook t(0.975, 10) = 2.228139 (Abramowitz & Stegun 1964, Table 26.10)', () => {
    for (const q of fixture.student_t) expect(studentTQuantile(q.p, q.df)).toBeCloseTo(q.t, 8);
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228139, 6);
  });
});

describe('fitQ10 and fitLloydTaylor (non-linear least squares on the fluxes)', () => {
  it('recover the generating parameters from noise-free data', () => {
    const t = [2, 5, 8, 11, 14, 17, 20, 23];
    const q = fitQ10(
      t,
      t.map((x) => q10Model(x, 1.7, 2.4)),
    ) as Q10Fit;
    expect(q.ok).toBe(true);
    expect(q.q10.value).toBeCloseTo(2.4, 8);
    expect(q.r10.value).toBeCloseTo(1.7, 8);
    const lt = fitLloydTaylor(
      t,
      t.map((x) => lloydTaylorModel(x, 0.9, 308.56)),
    ) as LloydTaylorFit;
    expect(lt.e0K.value).toBeCloseTo(308.56, 5);
    expect(lt.r10AtPublishedE0).toBeCloseTo(0.9, 10);
  });

  it('agree with scipy.optimize.curve_fit, including the 95 % confidence intervals (fixture)', () => {
    for (const set of fixture.sets) {
      const s = set.scipy;
      const q = fitQ10(set.temp_c, set.flux) as Q10Fit;
      expect(q.ok).toBe(true);
      expect(q.q10.value).toBeCloseTo(s.q10.q10, 5);
      expect(q.q10.ciLow).toBeCloseTo(s.q10.q10_lo, 4);
      expect(q.q10.ciHigh).toBeCloseTo(s.q10.q10_hi, 4);
      expect(q.r10.ciLow).toBeCloseTo(s.q10.r10_lo, 5);
      expect(q.r10.ciHigh).toBeCloseTo(s.q10.r10_hi, 5);
      const lt = fitLloydTaylor(set.temp_c, set.flux) as LloydTaylorFit;
      expect(lt.e0K.value).toBeCloseTo(s.lloyd_taylor.e0, 2);
      expect(lt.e0K.ciLow).toBeCloseTo(s.lloyd_taylor.e0_lo, 2);
      expect(lt.e0K.ciHigh).toBeCloseTo(s.lloyd_taylor.e0_hi, 2);
      expect(lt.r10.value).toBeCloseTo(s.lloyd_taylor.r10, 5);
      expect(lt.publishedE0K).toBe(308.56);
    }
  });

  it('works with fluxes near zero and below it (no log transform)', () => {
    const t = [1, 4, 7, 10, 13, 16, 19, 22, 25];
    const y = [-0.02, 0.01, 0.03, 0.02, 0.06, 0.05, 0.09, 0.1, 0.14];
    const q = fitQ10(t, y) as Q10Fit;
    expect(q.ok).toBe(true);
    expect(q.q10.value).toBeGreaterThan(1);
  });

  it('refuses below 5 points or a 5 °C span', () => {
    expect(fitQ10([10, 12, 14, 16], [1, 1.1, 1.2, 1.3])).toEqual({ ok: false, reason: 'fewer than 5 points (4)' });
    expect(fitLloydTaylor([10, 11, 12, 13, 14], [1, 1.1, 1.2, 1.3, 1.4])).toEqual({
      ok: false,
      reason: 'temperature span 4.0 °C is below 5 °C',
    });
  });

  it('warns below 20 visit means, below a 10 °C span and when Q10 is outside 1–5 (common practice)', () => {
    const t = [10, 11.5, 13, 14.5, 16, 17];
    const q = fitQ10(
      t,
      t.map((x) => q10Model(x, 1, 7)),
    ) as Q10Fit;
    expect(q.warnings).toEqual([
      'only 6 visit means (fewer than 20)',
      'temperature span 7.0 °C is below 10 °C',
      'Q10 = 7.00 is outside 1–5',
    ]);
    const wide = Array.from({ length: 20 }, (_, i) => i * 1.2);
    const ok = fitQ10(
      wide,
      wide.map((x) => q10Model(x, 1, 2)),
    ) as Q10Fit;
    expect(ok.warnings).toEqual([]);
  });
});
