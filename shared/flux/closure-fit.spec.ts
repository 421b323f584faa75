import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';
import { TYPICAL_SETTLE_TIME_S } from './constants';
import { seededRandom, syntheticClosure } from './test-closures';

function closure(overrides: Partial<ClosureInput> & { slope?: number; p3?: number; noise?: number; seed?: number } = {}): ClosureInput {
  const { slope = 1.2, p3 = 0, noise = 0, seed = 1, ...rest } = overrides;
  const s = syntheticClosure({ points: 150, dtS: 1, settleS: 20, c0: 430, slope, p3, noise, rand: seededRandom(seed) });
  return {
    tS: s.tS,
    co2Ppm: s.co2Ppm,
    h2oMmolMol: 12,
    pressureKpa: 98.5,
    tempC: 14,
    volumeCm3: 4800,
    areaCm2: 317.8,
    settleS: 20,
    ...rest,
  };
}

describe('fitClosure: window and models', () => {
  it('uses a settle time of about 20 s by default in the synthetic closures (common practice, no citation)', () => {
    expect(TYPICAL_SETTLE_TIME_S).toBe(20);
  });

  it('a straight line gives the line’s slope, and the exponential is rejected or equal', () => {
    const r = fitClosure(closure({ slope: 1.2, h2oMmolMol: null }));
    expect(r.error).toBeNull();
    expect(r.linear!.slopePpmS).toBeCloseTo(1.2, 10);
    expect(r.selected!.model).toBe('linear');
    if (r.exponential) expect(r.exponential.slopePpmS).toBeCloseTo(1.2, 6);
    expect(r.exponentialRejectedReason).not.toBeNull();
  });

  it('a saturating closure selects the exponential and returns its initial slope', () => {
    const r = fitClosure(closure({ slope: 2, p3: -0.02, noise: 0.3, seed: 4 }));
    expect(r.selected!.model).toBe('exponential');
    expect(r.exponentialRejectedReason).toBeNull();
    expect(r.exponential!.p3).toBeLessThan(0);
    expect(r.exponential!.slopePpmS / (2 / (1 - 12 / 1000))).toBeCloseTo(1, 1);
    expect(r.selected!.reason).toMatch(/AIC/);
  });

  it('selects the exponential for uptake too (p3 < 0 with a negative slope)', () => {
    const r = fitClosure(closure({ slope: -1.5, p3: -0.02, noise: 0.2, seed: 9 }));
    expect(r.selected!.model).toBe('exponential');
    expect(r.selected!.fluxUmolM2S).toBeLessThan(0);
    expect(r.flags).toContain('negative-flux');
  });

  it('scaling the volume scales every flux by the same factor', () => {
    const a = fitClosure(closure({ p3: -0.01, noise: 0.5, seed: 3 }));
    const b = fitClosure(closure({ p3: -0.01, noise: 0.5, seed: 3, volumeCm3: 4800 * 2.5 }));
    expect(b.linear!.fluxUmolM2S / a.linear!.fluxUmolM2S).toBeCloseTo(2.5, 12);
    expect(b.exponential!.fluxUmolM2S / a.exponential!.fluxUmolM2S).toBeCloseTo(2.5, 12);
    expect(b.selected!.fluxUmolM2S / a.selected!.fluxUmolM2S).toBeCloseTo(2.5, 12);
  });

  it('a longer settle time drops exactly the early samples', () => {
    const base = closure({ noise: 0.5, seed: 5 });
    const r20 = fitClosure(base);
    const r35 = fitClosure({ ...base, settleS: 35 });
    expect(r20.window!.n - r35.window!.n).toBe(15);
    expect(r35.window!.firstTS).toBe(35);
    // Same as fitting the remaining samples with t0 = 35 directly.
    const cut = base.tS.findIndex((t) => (t as number) >= 35);
    const direct = fitClosure({ ...base, tS: base.tS.slice(cut), co2Ppm: base.co2Ppm.slice(cut), settleS: 35 });
    expect(r35.linear!.slopePpmS).toBe(direct.linear!.slopePpmS);
  });

  it('starts the window at t0 even when the first usable sample comes later', () => {
    const base = closure();
    const co2 = base.co2Ppm.map((c, i) => (i < 25 ? null : c));
    const r = fitClosure({ ...base, co2Ppm: co2 });
    expect(r.window!.t0S).toBe(20);
    expect(r.window!.firstTS).toBe(25);
    expect(r.flags).toContain('gaps-dropped');
  });

  it('fits dry mole fractions: dry CO2 flat while water rises gives zero flux, though the wet slope is negative', () => {
    const t = Array.from({ length: 120 }, (_, i) => i);
    const h2o = t.map((s) => 10 + 0.05 * s);
    const wet = h2o.map((w) => 420 * (1 - w / 1000)); // dry χ constant at 420 ppm
    const r = fitClosure({ ...closure(), tS: t, co2Ppm: wet, h2oMmolMol: h2o });
    expect(r.linear!.slopePpmS).toBeCloseTo(0, 10);
    expect(r.flags).toContain('flat');
  });
});

describe('fitClosure: CO2 that the logger already reports dry', () => {
  // Dry χ rising 1 ppm/s while water vapour rises 10 → 16 mmol/mol (Webb et al. 1980: only the dry
  // mole fraction obeys the headspace balance; dividing dry values by 1 − χw again would add a false rise).
  const t = Array.from({ length: 120 }, (_, i) => i);
  const h2o = t.map((s) => 10 + 0.05 * s);
  const dry = t.map((s) => 420 + s);
  const base = { ...closure(), tS: t, h2oMmolMol: h2o, pressureKpa: 100, tempC: 20, volumeCm3: 4000, areaCm2: 300 };

  it('is not corrected a second time when the series says co2IsDry', () => {
    const r = fitClosure({ ...base, co2Ppm: dry, co2IsDry: true });
    expect(r.linear!.slopePpmS).toBeCloseTo(1, 10);
    // χw of the first sample used (t = 20 s: 11 mmol/mol) still counts the moles of dry air.
    expect(r.fluxPerSlope).toBeCloseTo((10 * 100 * 4000 * (1 - 0.011)) / (8.31446261815324 * 293.15 * 300), 10);
  });

  it('is corrected (wrongly, a second time) when the flag is missing: the slope is larger', () => {
    const r = fitClosure({ ...base, co2Ppm: dry });
    expect(r.linear!.slopePpmS).toBeGreaterThan(1.02);
  });

  it('reproduces the worked value of REFERENCES.md §1 from dry input (5.41564 µmol m⁻² s⁻¹)', () => {
    const r = fitClosure({ ...base, h2oMmolMol: 10, co2Ppm: dry, co2IsDry: true });
    expect(r.selected!.fluxUmolM2S).toBeCloseTo(5.41564, 5);
  });
});

describe('fitClosure: invalid input never throws', () => {
  it.each([
    ['unequal array lengths', { co2Ppm: [1, 2] }],
    ['missing settle time', { settleS: undefined as unknown as number }],
    ['missing pressure', { pressureKpa: null as unknown as number }],
    ['missing temperature', { tempC: Number.NaN }],
    ['missing volume', { volumeCm3: 0 }],
    ['missing area', { areaCm2: -3 }],
    ['no usable points', { settleS: 10000 }],
  ])('%s → invalid-input with an error message', (message, patch) => {
    const r = fitClosure({ ...closure(), ...patch });
    expect(r.flags).toContain('invalid-input');
    expect(r.error).toContain(message);
    expect(r.linear).toBeNull();
    expect(r.exponential).toBeNull();
    expect(r.selected).toBeNull();
  });

  it('drops null and non-numeric samples and flags the gaps', () => {
    const base = closure();
    const co2 = base.co2Ppm.slice() as unknown[];
    co2[50] = null;
    co2[60] = 'n/a';
    const r = fitClosure({ ...base, co2Ppm: co2 as number[] });
    expect(r.window!.n).toBe(128);
    expect(r.flags).toContain('gaps-dropped');
    expect(r.linear!.slopePpmS).toBeCloseTo(1.2 / (1 - 0.012), 9);
  });
});

describe('fitClosure: QC flags', () => {
  it('flags too-few-points and short-window for a 3-sample, 30 s closure', () => {
    const r = fitClosure({ ...closure(), tS: [20, 35, 50], co2Ppm: [430, 440, 450], h2oMmolMol: null });
    expect(r.flags).toEqual(expect.arrayContaining(['too-few-points', 'short-window', 'no-water-data', 'exp-rejected']));
    expect(r.exponentialRejectedReason).toBe('fewer than 4 points');
    expect(r.linear!.slopePpmS).toBeCloseTo(2 / 3, 12);
  });

  it('flags flat when the change over the window is below the analyzer precision (Parkin et al. 2012, J. Environ. Qual. 41)', () => {
    // 129 s window: 0.005 ppm s⁻¹ → 0.65 ppm change < 1 ppm precision; with 0.2 ppm precision it is detectable.
    const flat = fitClosure(closure({ slope: 0.005 }));
    expect(flat.flags).toContain('flat');
    const fine = fitClosure(closure({ slope: 0.005, precisionPpm: 0.2 }));
    expect(fine.flags).not.toContain('flat');
    expect(flat.minDetectableFluxUmolM2S).toBeCloseTo((1 / 129) * flat.fluxPerSlope!, 12);
  });

  it('flags a single-sample spike but not a clean noisy closure', () => {
    const clean = closure({ noise: 0.5, seed: 2 });
    expect(fitClosure(clean).flags).not.toContain('spike');
    const spiked = { ...clean, co2Ppm: clean.co2Ppm.slice() };
    spiked.co2Ppm[80] = (spiked.co2Ppm[80] as number) + 25;
    expect(fitClosure(spiked).flags).toContain('spike');
  });

  it('flags start-above-ambient with the default 100 ppm margin and honours a custom margin', () => {
    expect(fitClosure(closure({ ambientPpm: 300 })).flags).toContain('start-above-ambient');
    expect(fitClosure(closure({ ambientPpm: 420 })).flags).not.toContain('start-above-ambient');
    expect(fitClosure(closure({ ambientPpm: 420, ambientMarginPpm: 5 })).flags).toContain('start-above-ambient');
  });

  it('flags exp-linear-ratio-high when the exponential slope exceeds 1.5 × the linear slope', () => {
    const r = fitClosure(closure({ slope: 3, p3: -0.03, noise: 0.2, seed: 8 }));
    expect(r.exponential!.slopePpmS / r.linear!.slopePpmS).toBeGreaterThan(1.5);
    expect(r.flags).toContain('exp-linear-ratio-high');
  });

  it('flags low-r2 for a noisy near-zero flux but keeps its value (information only)', () => {
    const r = fitClosure(closure({ slope: 0.01, noise: 1, seed: 6 }));
    expect(r.flags).toContain('low-r2');
    expect(r.selected).not.toBeNull();
    expect(Number.isFinite(r.selected!.fluxUmolM2S)).toBe(true);
  });

  it('uses the collar’s area and flags a chamber footprint that differs by more than 0.5 % (317.8 cm² on a 20 cm collar: 1.2 %)', () => {
    const collar = Math.PI * 10 * 10; // 314.159 cm², REFERENCES.md §8
    const r = fitClosure(closure({ areaCm2: collar, footprintAreaCm2: 317.8 }));
    expect(r.flags).toContain('footprint-area-differs');
    expect(r.fluxPerSlope! / fitClosure(closure({ areaCm2: 317.8 })).fluxPerSlope!).toBeCloseTo(317.8 / collar, 12);
    expect(fitClosure(closure({ areaCm2: collar, footprintAreaCm2: 314.2 })).flags).not.toContain('footprint-area-differs');
    expect(fitClosure(closure({ areaCm2: collar, footprintAreaCm2: null })).flags).not.toContain('footprint-area-differs');
  });

  it('passes offset-after and default-pressure through from the caller', () => {
    const r = fitClosure(closure({ offsetAfter: true, pressureIsDefault: true }));
    expect(r.flags).toEqual(expect.arrayContaining(['offset-after', 'default-pressure']));
  });

  it('honours a requested model', () => {
    const r = fitClosure(closure({ p3: -0.02, noise: 0.3, seed: 4, model: 'linear' }));
    expect(r.selected!.model).toBe('linear');
    expect(r.selected!.reason).toBe('linear model requested');
    const q = fitClosure(closure({ p3: -0.02, noise: 0.3, seed: 4, model: 'quadratic' }));
    expect(q.selected!.model).toBe('quadratic');
    expect(q.selected!.basis).toBe('closure');
    expect(q.selected!.slopePpmS).toBe(q.quadratic!.slopeAtClosurePpmS);
  });

  it('uses p, T and χw of the first sample used when they are series', () => {
    const base = closure();
    const n = base.tS.length;
    const r = fitClosure({
      ...base,
      pressureKpa: Array.from({ length: n }, (_, i) => (i < 20 ? 50 : 98.5)),
      tempC: Array.from({ length: n }, (_, i) => (i < 20 ? -5 : 14)),
    });
    const ref = fitClosure(base);
    expect(r.fluxPerSlope).toBeCloseTo(ref.fluxPerSlope!, 12);
  });
});

describe('fitClosure: analyzer precision behind the detection limit', () => {
  it('says when the 1 ppm default was used instead of the analyzer record’s precision', () => {
    const def = fitClosure(closure());
    expect([def.precisionPpm, def.precisionIsDefault]).toEqual([1, true]);
    const own = fitClosure(closure({ precisionPpm: 0.3 }));
    expect([own.precisionPpm, own.precisionIsDefault]).toEqual([0.3, false]);
    expect(own.minDetectableFluxUmolM2S! / def.minDetectableFluxUmolM2S!).toBeCloseTo(0.3, 12);
  });
});
