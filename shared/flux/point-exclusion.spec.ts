import { readFileSync } from 'fs';
import { join } from 'path';
import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';
import { exclusionProblems, usablePointCount } from './point-exclusion';
import { QC_THRESHOLDS } from './qc-flags';

/**
 * Points the lab leaves out of a fit. Reference: numpy 1.24 (Debian python3-numpy) `polyfit` of
 * the remaining samples, degree 1 and 2 (ordinary least squares), R² = 1 − RSS/TSS; fixtures
 * written by tools/flux-reference/make-exclusion-fixtures.py (shared/flux/fixtures/numpy-exclusions.json).
 */
interface Case {
  t_s: number[];
  co2_ppm: number[];
  settle_s: number;
  excluded: number[];
  n_used: number;
  linear: { slope: number; intercept: number; rss: number; r2: number };
  quadratic: { b0: number; b1: number; b2: number; rss: number; r2: number };
}
const cases = JSON.parse(readFileSync(join(__dirname, 'fixtures', 'numpy-exclusions.json'), 'utf8')).closures as Case[];
const input = (c: Case, over: Partial<ClosureInput> = {}): ClosureInput => ({
  tS: c.t_s,
  co2Ppm: c.co2_ppm,
  h2oMmolMol: null,
  pressureKpa: 100,
  tempC: 20,
  volumeCm3: 4000,
  areaCm2: 300,
  settleS: c.settle_s,
  ...over,
});
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1e-12, Math.abs(b));

describe('a fit with points left out (fixture numpy-exclusions.json)', () => {
  it('has closures with a spike and single bad points to leave out', () => {
    expect(cases.length).toBe(5);
    expect(cases.every((c) => c.excluded.length >= 2)).toBe(true);
  });

  it.each(cases.map((c, i) => [i, c] as const))('closure %i: line and quadratic equal numpy.polyfit of the remaining samples', (_i, c) => {
    const r = fitClosure(input(c, { excludedIndices: c.excluded }));
    expect(r.linear!.n).toBe(c.n_used);
    expect(rel(r.linear!.slopePpmS, c.linear.slope)).toBeLessThan(1e-9);
    expect(rel(r.linear!.interceptPpm, c.linear.intercept)).toBeLessThan(1e-10);
    expect(Math.abs(r.linear!.r2 - c.linear.r2)).toBeLessThan(1e-10);
    expect(rel(r.quadratic!.b1, c.quadratic.b1)).toBeLessThan(1e-8);
    expect(Math.abs(r.quadratic!.b2 - c.quadratic.b2)).toBeLessThan(1e-10 + 1e-8 * Math.abs(c.quadratic.b2));
    expect(Math.abs(r.quadratic!.r2 - c.quadratic.r2)).toBeLessThan(1e-9);
  });

  it.each(cases.map((c, i) => [i, c] as const))(
    'closure %i: the whole result equals the fit of a series without those samples',
    (_i, c) => {
      const drop = new Set(c.excluded);
      const kept = { ...c, t_s: c.t_s.filter((_t, i) => !drop.has(i)), co2_ppm: c.co2_ppm.filter((_v, i) => !drop.has(i)) };
      expect(fitClosure(input(c, { excludedIndices: c.excluded }))).toEqual(fitClosure(input(kept)));
    },
  );

  it('differs from the fit with every point, and the spike flag goes once the spike is left out', () => {
    const c = cases[0];
    const all = fitClosure(input(c));
    const without = fitClosure(input(c, { excludedIndices: c.excluded }));
    expect(all.flags).toContain('spike');
    expect(without.flags).not.toContain('spike');
    expect(without.linear!.slopePpmS).not.toBe(all.linear!.slopePpmS);
    expect(without.flags).not.toContain('gaps-dropped');
  });
});

describe('which exclusions a closure can take', () => {
  const c = cases[4]; // 25 samples, settle 20 s at 5 s steps: samples 4…24 are in the window
  const series = { tS: c.t_s, co2Ppm: c.co2_ppm, h2oMmolMol: null };

  it('counts the usable points of the fit window without the excluded ones', () => {
    expect(usablePointCount({ ...series, settleS: 20, windowEndS: null, excludedIndices: [] })).toBe(21);
    expect(usablePointCount({ ...series, settleS: 20, windowEndS: null, excludedIndices: [0, 1, 5, 6] })).toBe(19);
    expect(usablePointCount({ ...series, settleS: 20, windowEndS: 40, excludedIndices: [5] })).toBe(4);
  });

  it('refuses an index outside the series and a point named twice, naming each', () => {
    expect(exclusionProblems(series, 20, null, [3, 25, -1, 3])).toEqual([
      { index: 1, message: 'Point 25 is not in this closure: its samples are numbered 0 to 24' },
      { index: 2, message: 'Point -1 is not in this closure: its samples are numbered 0 to 24' },
      { index: 3, message: 'Point 3 is excluded twice' },
    ]);
  });

  it('refuses exclusions that leave too few points for a fit, and accepts one that leaves exactly enough', () => {
    const min = QC_THRESHOLDS.minPointsLinear;
    const window = Array.from({ length: 21 }, (_v, k) => k + 4);
    expect(exclusionProblems(series, 20, null, window.slice(0, 21 - min))).toEqual([]);
    expect(exclusionProblems(series, 20, null, window.slice(0, 22 - min))).toEqual([
      { index: null, message: `Leaving out these points keeps ${min - 1} usable points in the fit window; a fit needs at least ${min}` },
    ]);
  });
});
