import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';

/**
 * Flux at chamber closure (t = 0) rather than at the end of the settle time: the initial slope of
 * the exponential model "at closure time" (Kutzbach et al. 2007, Biogeosciences 4:1005–1025) and
 * of the quadratic (Wagner, Reicosky & Alessi 1997, Agron. J. 89:279–284). Expected values are the
 * derivatives of the generating functions at t = 0 and t = 20 s (calculus, not the engine).
 */
const t = Array.from({ length: 151 }, (_, i) => i);
const base: Omit<ClosureInput, 'co2Ppm'> = {
  tS: t,
  h2oMmolMol: 0,
  pressureKpa: 100,
  tempC: 20,
  volumeCm3: 4000,
  areaCm2: 300,
  settleS: 20,
};

describe('slope basis: chamber closure (default) or end of the settle time', () => {
  // C(t) = 400 + 60·(1 − e^(−0.01 t)): dC/dt = 0.6·e^(−0.01 t) → 0.6 at t = 0, 0.6·e^(−0.2) at t = 20 s.
  const expCo2 = t.map((x) => 400 + 60 * (1 - Math.exp(-0.01 * x)));
  const atClosure = 0.6;
  const atSettleEnd = 0.6 * Math.exp(-0.2);

  it('gives the exponential’s slope at closure beside its slope at the start of the fit window', () => {
    const r = fitClosure({ ...base, co2Ppm: expCo2 });
    expect(r.exponential!.slopePpmS).toBeCloseTo(atSettleEnd, 6);
    expect(r.exponential!.slopeAtClosurePpmS).toBeCloseTo(atClosure, 6);
    expect(r.exponential!.fluxAtClosureUmolM2S / r.exponential!.slopeAtClosurePpmS).toBeCloseTo(r.fluxPerSlope!, 12);
  });

  it('selects on the closure basis by default and on the settle end when asked', () => {
    const byDefault = fitClosure({ ...base, co2Ppm: expCo2 });
    expect(byDefault.selected!.model).toBe('exponential');
    expect(byDefault.selected!.basis).toBe('closure');
    expect(byDefault.selected!.slopePpmS).toBeCloseTo(atClosure, 6);
    expect(byDefault.selected!.fluxUmolM2S).toBeCloseTo(atClosure * byDefault.fluxPerSlope!, 6);
    const settle = fitClosure({ ...base, co2Ppm: expCo2, slopeAt: 'settle_end' });
    expect(settle.selected!.basis).toBe('settle_end');
    expect(settle.selected!.slopePpmS).toBeCloseTo(atSettleEnd, 6);
    // With p3 = −0.01 s⁻¹ and 20 s settle time the two bases differ by e^0.2 − 1 = 22 %.
    expect(byDefault.selected!.fluxUmolM2S / settle.selected!.fluxUmolM2S).toBeCloseTo(Math.exp(0.2), 6);
  });

  it('gives the quadratic’s derivative at t = 0 (b1 − 2·b2·t0 in the window’s time)', () => {
    // C(t) = 410 + 1.1 t − 0.003 t²: dC/dt = 1.1 at t = 0 and 1.1 − 0.006·20 = 0.98 at t = 20 s.
    const co2 = t.map((x) => 410 + 1.1 * x - 0.003 * x * x);
    const r = fitClosure({ ...base, co2Ppm: co2, model: 'quadratic' });
    expect(r.quadratic!.slopePpmS).toBeCloseTo(0.98, 8);
    expect(r.quadratic!.slopeAtClosurePpmS).toBeCloseTo(1.1, 8);
    expect(r.selected!.slopePpmS).toBeCloseTo(1.1, 8);
    expect(fitClosure({ ...base, co2Ppm: co2, model: 'quadratic', slopeAt: 'settle_end' }).selected!.slopePpmS).toBeCloseTo(0.98, 8);
  });

  it('leaves a straight closure’s flux the same on both bases', () => {
    const co2 = t.map((x) => 420 + 0.8 * x);
    const a = fitClosure({ ...base, co2Ppm: co2 });
    const b = fitClosure({ ...base, co2Ppm: co2, slopeAt: 'settle_end' });
    expect(a.selected!.model).toBe('linear');
    expect(a.selected!.basis).toBe('closure');
    expect(a.selected!.fluxUmolM2S).toBe(b.selected!.fluxUmolM2S);
  });
});
