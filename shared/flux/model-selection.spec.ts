import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';
import { aiccOf, effectiveSampleSize, exponentialAdvantage, SELECTION_MARGIN } from './model-selection';
import { gaussian, seededRandom } from './test-closures';

/**
 * Model choice by AICc (Hurvich & Tsai 1989, Biometrika 76:297–307) with a margin of 2
 * (Burnham & Anderson 2002) on the effective sample size of AR(1) residuals. Simulated closures
 * (seeded, our own scenario): 150 s at 1 Hz, 20 s settle time, true slope at closure 1 ppm s⁻¹,
 * noise SD 1 ppm, white or smoothed (AR(1), φ = 0.8, scaled to the same SD).
 */
const N = 400;
const SETTLE = 20;

function noiseSeries(rand: () => number, n: number, phi: number): number[] {
  const out: number[] = [];
  let e = gaussian(rand);
  const scale = Math.sqrt(1 - phi * phi);
  for (let i = 0; i < n; i++) {
    if (i > 0) e = phi * e + scale * gaussian(rand);
    out.push(e);
  }
  return out;
}

/** C(t) = 420 + s0·(e^(p3 t) − 1)/p3 from closure on (a line when p3 = 0), slope s0 = 1 at t = 0. */
function closures(p3: number, phi: number, seed: number): ClosureInput[] {
  const rand = seededRandom(seed);
  const t = Array.from({ length: 150 }, (_, i) => i);
  return Array.from({ length: N }, () => {
    const noise = noiseSeries(rand, t.length, phi);
    const co2 = t.map((x, i) => 420 + (p3 === 0 ? x : Math.expm1(p3 * x) / p3) + noise[i]);
    return { tS: t, co2Ppm: co2, h2oMmolMol: null, pressureKpa: 100, tempC: 20, volumeCm3: 4000, areaCm2: 300, settleS: SETTLE };
  });
}

interface Outcome {
  expShare: number;
  meanBiasPct: number;
}

function simulate(p3: number, phi: number, seed: number): Outcome {
  let exp = 0;
  let bias = 0;
  for (const c of closures(p3, phi, seed)) {
    const r = fitClosure(c);
    if (r.selected!.model === 'exponential') exp++;
    bias += r.selected!.slopePpmS - 1; // true slope at closure is 1 ppm s⁻¹ (dry air, χw = 0)
  }
  return { expShare: exp / N, meanBiasPct: (100 * bias) / N };
}

const measured: Record<string, Outcome> = {};
afterAll(() => {
  // The numbers quoted in docs/flux-engine.md.
  console.log(
    Object.entries(measured)
      .map(([k, v]) => `${k}: exponential ${(100 * v.expShare).toFixed(1)} %, mean bias ${v.meanBiasPct.toFixed(2)} %`)
      .join('\n'),
  );
});

describe('model choice that does not reward noise (simulation, seeded)', () => {
  it('rarely takes the exponential for straight closures with white noise, and leaves their flux unbiased', () => {
    const o = (measured['straight, white noise'] = simulate(0, 0, 11));
    expect(o.expShare).toBeLessThan(0.04);
    expect(Math.abs(o.meanBiasPct)).toBeLessThan(0.3);
  });

  it('rarely takes the exponential for straight closures with smoothed AR(1) noise (φ = 0.8)', () => {
    const o = (measured['straight, AR(1) noise'] = simulate(0, 0.8, 12));
    expect(o.expShare).toBeLessThan(0.08);
    expect(Math.abs(o.meanBiasPct)).toBeLessThan(0.5);
  });

  it('takes the exponential for curved closures (p3 = −0.01 s⁻¹) and recovers the slope at closure', () => {
    const white = (measured['curved p3 = −0.01, white noise'] = simulate(-0.01, 0, 13));
    expect(white.expShare).toBeGreaterThan(0.95);
    expect(Math.abs(white.meanBiasPct)).toBeLessThan(3);
    const smooth = (measured['curved p3 = −0.01, AR(1) noise'] = simulate(-0.01, 0.8, 14));
    expect(smooth.expShare).toBeGreaterThan(0.8);
    expect(Math.abs(smooth.meanBiasPct)).toBeLessThan(8);
  });

  it('does not raise exp-rejected or exp-linear-ratio-high on healthy closures (at most 1 of 300)', () => {
    const healthy = [...closures(0, 0, 21).slice(0, 100), ...closures(0, 0.8, 22).slice(0, 100), ...closures(-0.01, 0, 23).slice(0, 100)];
    const flagged = healthy
      .map((c) => fitClosure(c).flags)
      .filter((f) => f.includes('exp-rejected') || f.includes('exp-linear-ratio-high'));
    expect(flagged.length).toBeLessThanOrEqual(1);
    // A noise-free p3 = −0.01 closure has an exponential/linear slope ratio of 1.8: ordinary curvature.
    const clean = { ...closures(-0.01, 0, 24)[0] };
    clean.co2Ppm = clean.tS.map((x) => 420 + Math.expm1(-0.01 * (x as number)) / -0.01);
    expect(fitClosure({ ...clean, h2oMmolMol: 0 }).flags).toEqual([]);
  });
});

describe('AICc and the margin', () => {
  it('scores a 6-sample closure that plain AIC prefers as exponential by 27.8 as a tie, so the line stays', () => {
    // AIC difference 6·ln(RSS_lin/RSS_exp) − 2 = 27.8; AICc adds 2K(K+1)/(n−K−1) with K = 3 and 4.
    const logRatio = (27.8 + 2) / 6;
    const advantage = exponentialAdvantage(Math.exp(logRatio), 1, 6);
    expect(advantage).toBeCloseTo(27.8 - 28, 10);
    expect(advantage).toBeLessThan(SELECTION_MARGIN);
  });

  it('uses the effective sample size n(1 − ρ)/(1 + ρ) with ρ clamped to [0, 0.95]', () => {
    expect(effectiveSampleSize(130, 0)).toBe(130);
    expect(effectiveSampleSize(130, -0.3)).toBe(130);
    expect(effectiveSampleSize(130, 0.8)).toBeCloseTo(130 / 9, 10);
    expect(effectiveSampleSize(130, 0.99)).toBeCloseTo((130 * 0.05) / 1.95, 10);
  });

  it('flags a clearly convex rise (p3 > 0, AICc advantage above 10) as exp-rejected', () => {
    const c = closures(0, 0, 31)[0];
    c.co2Ppm = c.tS.map((x, i) => 420 + Math.expm1(0.01 * (x as number)) / 0.01 + ((c.co2Ppm[i] as number) - 420 - (x as number)));
    const r = fitClosure(c);
    expect(r.exponential!.p3).toBeGreaterThan(0);
    expect(r.selected!.model).toBe('linear');
    expect(r.flags).toContain('exp-rejected');
  });

  it('is infinite when n is too small for the correction', () => {
    expect(aiccOf(1, 4, 3)).toBe(Infinity);
    expect(Number.isFinite(aiccOf(1, 6, 3))).toBe(true);
  });
});
