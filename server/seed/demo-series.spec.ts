import { fitClosure } from '../../shared/flux/closure-fit';
import type { QcFlag } from '../../shared/flux/qc-flags';
import { synthesizeClosure, respirationUmolM2S, type ClosureKind, type SeriesInput } from './demo-series';
import { Rng } from './prng';

// A 20 cm collar (A = π·20²/4 cm²) under a 4000 cm³ chamber with a 150 cm³ loop and 2.5 cm offset.
const AREA = (Math.PI * 20 * 20) / 4;
const VOLUME = 4000 + 150 + AREA * 2.5;

function input(kind: ClosureKind, flux: number): SeriesInput {
  return {
    kind,
    fluxUmolM2S: flux,
    ambientPpm: 421,
    pressureKpa: 96.4,
    airTempC: 15,
    h2oMmolMol: 12,
    volumeCm3: VOLUME,
    areaCm2: AREA,
    settleS: 20,
    durationS: 120,
    noisePpm: 0.5,
  };
}

function fit(kind: ClosureKind, flux: number, seed: number) {
  const s = synthesizeClosure(input(kind, flux), new Rng(seed));
  const result = fitClosure({
    tS: s.tS,
    co2Ppm: s.co2Ppm,
    h2oMmolMol: s.h2oMmolMol,
    pressureKpa: s.pressureKpa,
    tempC: s.tempC,
    volumeCm3: VOLUME,
    areaCm2: AREA,
    settleS: 20,
    ambientPpm: 421,
    precisionPpm: 1,
  });
  return { s, result };
}

describe('synthetic demo closures', () => {
  it('when a normal closure is made at 1 Hz for 120 s, then it has 121 samples starting near ambient', () => {
    const { s } = fit('normal', 3, 1);
    expect(s.tS).toHaveLength(121);
    expect(s.tS[120]).toBe(120);
    expect(s.co2Ppm[0]).toBeGreaterThan(415);
    expect(s.co2Ppm[0]).toBeLessThan(440);
    // 3 µmol m⁻² s⁻¹ under this chamber is ≈ 0.5 ppm s⁻¹: tens of ppm over the closure.
    expect(s.co2Ppm[120] - s.co2Ppm[0]).toBeGreaterThan(25);
    expect(s.h2oMmolMol[120]).toBeGreaterThan(s.h2oMmolMol[0]);
  });

  it.each([0.8, 3, 7])(
    'when the engine fits a normal closure made with %p µmol m⁻² s⁻¹, then it gives that flux back within 12 %',
    (flux) => {
      for (const seed of [11, 12, 13]) {
        const { result } = fit('normal', flux, seed);
        expect(result.error).toBeNull();
        // A line, chosen when the gentle curvature is within the AICc margin of noise, measures the
        // mean slope over the window: below the slope at closure by up to 1 − e^(−k·(settle + window/2))
        // ≈ 20 % for the demo's k ≤ 0.004 s⁻¹ (the linear underestimate of Kutzbach et al. 2007).
        expect(result.selected!.fluxUmolM2S).toBeGreaterThan(flux * (result.selected!.model === 'linear' ? 0.8 : 0.88));
        expect(result.selected!.fluxUmolM2S).toBeLessThan(flux * 1.12);
        expect(result.flags).not.toContain('negative-flux');
        expect(result.flags).not.toContain('spike');
      }
    },
  );

  it('when a flat closure is fitted, then its linear flux is below the minimum detectable flux', () => {
    for (const seed of [21, 22, 23, 24]) {
      const { result } = fit('flat', 3, seed);
      expect(Math.abs(result.linear!.fluxUmolM2S)).toBeLessThan(result.minDetectableFluxUmolM2S!);
    }
    // Where the line is selected the engine says so; an exponential may chase the noise (seed 23).
    expect(fit('flat', 3, 21).result.flags).toContain('flat');
    expect(fit('flat', 3, 22).result.flags).toContain('flat');
  });

  it.each<[ClosureKind, QcFlag]>([
    ['uptake', 'negative-flux'],
    ['start-above', 'start-above-ambient'],
    ['spike', 'spike'],
    ['leak', 'exp-linear-ratio-high'],
  ])('when a %s closure is fitted, then the engine raises the %s flag the lab screen shows', (kind, flag) => {
    for (const seed of [21, 22, 23]) {
      expect(fit(kind, 3, seed).result.flags).toContain(flag);
    }
  });

  it('when the same seed is used twice, then the series are identical', () => {
    expect(fit('normal', 2, 5).s).toEqual(fit('normal', 2, 5).s);
    expect(fit('normal', 2, 6).s.co2Ppm).not.toEqual(fit('normal', 2, 5).s.co2Ppm);
  });
});

describe('demo soil respiration', () => {
  it('when soil is 10 °C and moist, then the flux is R10 times the collar factor', () => {
    expect(respirationUmolM2S({ r10: 2.3, q10: 2.2, soilTempC: 10, vwcPct: 30, factor: 1 })).toBeCloseTo(2.3, 10);
    expect(respirationUmolM2S({ r10: 2.3, q10: 2.2, soilTempC: 10, vwcPct: 30, factor: 0.6 })).toBeCloseTo(1.38, 10);
  });

  it('when soil warms by 10 °C, then the flux rises by Q10 (van ’t Hoff form, common practice)', () => {
    expect(respirationUmolM2S({ r10: 2, q10: 2.2, soilTempC: 20, vwcPct: 30, factor: 1 })).toBeCloseTo(4.4, 10);
  });

  it('when the soil dries to 10 % VWC, then the flux is damped to 77.5 %', () => {
    expect(respirationUmolM2S({ r10: 2, q10: 2.2, soilTempC: 10, vwcPct: 10, factor: 1 })).toBeCloseTo(2 * 0.775, 10);
  });

  it('when the model would leave 0.3–9 µmol m⁻² s⁻¹, then it is held inside that plausible range', () => {
    expect(respirationUmolM2S({ r10: 2, q10: 2.2, soilTempC: 45, vwcPct: 30, factor: 1 })).toBe(9);
    expect(respirationUmolM2S({ r10: 2, q10: 2.2, soilTempC: -20, vwcPct: 30, factor: 1 })).toBe(0.3);
  });
});
