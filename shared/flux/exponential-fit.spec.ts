import { fitExponentialRaw } from './exponential-fit';
import { fitLinearRaw } from './linear-fit';
import { readFileSync } from 'fs';
import { join } from 'path';

interface RefClosure {
  u_true: number;
  slope_true: number;
  tau: number[];
  y: number[];
  scipy: { converged: boolean; stalled?: boolean; slope?: number; rss?: number; linear_slope: number };
}

const closures: RefClosure[] = JSON.parse(readFileSync(join(__dirname, 'fixtures', 'scipy-exponential.json'), 'utf8')).closures;

function exactExponential(u: number, slope: number, n = 150, tauMax = 149) {
  const p3 = u / tauMax;
  const tau = Array.from({ length: n }, (_, i) => (i * tauMax) / (n - 1));
  const y = tau.map((t) => (p3 === 0 ? 420 + slope * t : 420 + (slope * Math.expm1(p3 * t)) / p3));
  return { tau, y, tauMax };
}

describe('exponential closure model by variable projection (Kutzbach et al. 2007, Biogeosciences 4)', () => {
  it.each([-30, -12, -4, -1, -0.2, 0.4, 3])('returns the generating initial slope within 0.1 %% on noise-free data (p3·τmax = %f)', (u) => {
    const { tau, y, tauMax } = exactExponential(u, 2.3);
    const out = fitExponentialRaw(tau, y, tau.length, tauMax);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(Math.abs(out.fit.slope / 2.3 - 1)).toBeLessThan(1e-3);
    expect(out.fit.u).toBeCloseTo(u, 4);
  });

  it('gives the same optimum for irregular sampling (per-sample exponentials instead of the equal-spacing recurrence)', () => {
    const tau = Array.from({ length: 120 }, (_, i) => i + (i > 0 && i < 119 ? 0.3 * Math.sin(i * 1.7) : 0));
    const p3 = -3 / 119;
    const y = tau.map((t) => 400 + (1.8 * Math.expm1(p3 * t)) / p3);
    const out = fitExponentialRaw(tau, y, tau.length, 119);
    if (!out.ok) throw new Error(out.reason);
    expect(out.fit.slope).toBeCloseTo(1.8, 8);
    expect(out.fit.p3).toBeCloseTo(p3, 10);
  });

  it('agrees with scipy.optimize.curve_fit (scipy 1.17, fixture from tools/flux-reference) wherever scipy converged', () => {
    const converged = closures.filter((c) => c.scipy.converged);
    expect(converged.length).toBeGreaterThan(30);
    for (const c of converged) {
      const out = fitExponentialRaw(c.tau, c.y, c.tau.length, c.tau[c.tau.length - 1]);
      expect(out.ok).toBe(true);
      if (!out.ok) continue;
      expect(out.fit.rss).toBeLessThanOrEqual(c.scipy.rss! * (1 + 1e-8));
      expect(Math.abs(out.fit.slope - c.scipy.slope!)).toBeLessThan(1e-4 * Math.abs(c.scipy.slope!) + 1e-6);
    }
  });

  it('finds a strictly lower residual sum of squares on the closures where scipy stalled at p3 ≈ 0', () => {
    const stalled = closures.filter((c) => c.scipy.stalled);
    expect(stalled.length).toBeGreaterThan(0);
    for (const c of stalled) {
      const out = fitExponentialRaw(c.tau, c.y, c.tau.length, c.tau[c.tau.length - 1]);
      if (!out.ok) throw new Error(out.reason);
      expect(out.fit.rss).toBeLessThan(c.scipy.rss! * (1 - 1e-6));
    }
  });

  it('the linear slope agrees with scipy.stats.linregress on every fixture closure', () => {
    for (const c of closures) {
      const lin = fitLinearRaw(c.tau, c.y, c.tau.length)!;
      expect(lin.slope).toBeCloseTo(c.scipy.linear_slope, 10);
    }
  });

  it('refuses fewer than 4 points', () => {
    const out = fitExponentialRaw([0, 1, 2], [1, 2, 3], 3, 2);
    expect(out).toEqual({ ok: false, reason: 'fewer than 4 points' });
  });

  it('rejects a closure whose optimum lies beyond p3·τmax = −40 (a step at the first sample)', () => {
    const tau = Array.from({ length: 60 }, (_, i) => i * 2);
    const y = tau.map((t) => (t === 0 ? 400 : 450));
    const out = fitExponentialRaw(tau, y, tau.length, 118);
    expect(out.ok).toBe(false);
  });
});
