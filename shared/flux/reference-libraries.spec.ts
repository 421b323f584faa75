import { readFileSync } from 'fs';
import { join } from 'path';
import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';
import { fitQuadraticRaw } from './quadratic-fit';

/**
 * Checks against general-purpose libraries (Debian python3-numpy 1.24, python3-scipy 1.10,
 * python3-statsmodels 0.13), fixtures written by tools/flux-reference/make-selection-fixtures.py:
 * the quadratic against numpy.polyfit/polyder (Wagner et al. 1997, Agron. J. 89: slope at closure
 * is the derivative of the fitted polynomial at t = 0), AICc against statsmodels'
 * eval_measures.aicc (Hurvich & Tsai 1989, Biometrika 76), and the model choice against the
 * documented rule computed there from those values.
 */
const fixture = (name: string) => JSON.parse(readFileSync(join(__dirname, 'fixtures', name), 'utf8')).closures;

interface Case {
  t_s: number[];
  co2_ppm: number[];
  settle_s: number;
}
const input = (c: Case): ClosureInput => ({
  tS: c.t_s,
  co2Ppm: c.co2_ppm,
  h2oMmolMol: null,
  pressureKpa: 100,
  tempC: 20,
  volumeCm3: 4000,
  areaCm2: 300,
  settleS: c.settle_s,
});
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1e-12, Math.abs(b));

describe('quadratic fit against numpy.polyfit (fixture numpy-quadratic.json)', () => {
  const cases = fixture('numpy-quadratic.json') as (Case & {
    b0: number;
    b1: number;
    b2: number;
    rss: number;
    slope_at_settle_end: number;
    slope_at_closure: number;
  })[];

  it.each(cases.map((c, i) => [i, c] as const))('closure %i: coefficients, RSS and both slopes agree', (_i, c) => {
    const tau = c.t_s.map((t) => t - c.settle_s);
    const q = fitQuadraticRaw(tau, c.co2_ppm, tau.length, tau[tau.length - 1])!;
    expect(rel(q.b1, c.b1)).toBeLessThan(1e-8);
    expect(Math.abs(q.b2 - c.b2)).toBeLessThan(1e-10 + 1e-8 * Math.abs(c.b2));
    expect(rel(q.b0, c.b0)).toBeLessThan(1e-10);
    expect(Math.abs(q.rss - c.rss)).toBeLessThan(1e-8 * Math.max(1, c.rss));
    const r = fitClosure({ ...input(c), model: 'quadratic' });
    expect(rel(r.quadratic!.slopePpmS, c.slope_at_settle_end)).toBeLessThan(1e-8);
    expect(rel(r.quadratic!.slopeAtClosurePpmS, c.slope_at_closure)).toBeLessThan(1e-8);
    expect(r.selected!.slopePpmS).toBe(r.quadratic!.slopeAtClosurePpmS);
  });
});

describe('AICc and the model choice against statsmodels (fixture statsmodels-aicc.json)', () => {
  const cases = fixture('statsmodels-aicc.json') as (Case & {
    aicc_linear: number;
    aicc_exponential: number;
    near_margin: boolean;
    choice: string;
    p3_true: number;
  })[];

  it('has straight and curved closures of 6 to 130 samples, and both choices', () => {
    expect(cases.length).toBeGreaterThanOrEqual(60);
    expect(new Set(cases.map((c) => c.choice))).toEqual(new Set(['linear', 'exponential']));
    expect(new Set(cases.map((c) => c.t_s.length))).toEqual(new Set([6, 10, 30, 130]));
  });

  it('gives the line’s AICc of statsmodels OLS on every closure', () => {
    for (const c of cases)
      expect(Math.abs(fitClosure(input(c)).linear!.aicc - c.aicc_linear)).toBeLessThan(1e-8 * Math.abs(c.aicc_linear) + 1e-9);
  });

  it('gives the exponential’s AICc (scipy fit, statsmodels aicc) wherever both fits exist', () => {
    let compared = 0;
    for (const c of cases) {
      const e = fitClosure(input(c)).exponential;
      if (!e || !Number.isFinite(c.aicc_exponential)) continue;
      compared++;
      // The same least-squares optimum to rounding of the optimisers.
      expect(e.aicc).toBeLessThan(c.aicc_exponential + 1e-4);
      expect(e.aicc).toBeGreaterThan(c.aicc_exponential - 1e-4);
    }
    expect(compared).toBeGreaterThan(40);
  });

  it('makes the choice the documented rule makes from those values (exponential only if p3 < 0 and AICc better by > 2)', () => {
    const clear = cases.filter((c) => !c.near_margin);
    const disagreements = clear.filter((c) => fitClosure(input(c)).selected!.model !== c.choice);
    expect(disagreements.map((c) => [c.t_s.length, c.p3_true])).toEqual([]);
  });
});
