import { chamberFluxUmolM2S, fluxPerSlope } from './chamber-flux';
import { GAS_CONSTANT_J_PER_MOL_K } from './constants';
import { dryMoleFractionPpm } from './dry-mole-fraction';
import { fitLinearRaw } from './linear-fit';

describe('chamber flux (ideal gas law, dry-air mass balance)', () => {
  it('uses R = N_A·k = 8.314 462 618 153 24 J mol⁻¹ K⁻¹ (CODATA 2018, Tiesinga et al. 2021, Rev. Mod. Phys. 93)', () => {
    expect(GAS_CONSTANT_J_PER_MOL_K).toBeCloseTo(8.31446261815324, 13);
  });

  it('reproduces the worked value 5.41564 µmol m⁻² s⁻¹ (REFERENCES.md §1: 4000 cm³, 100 kPa, 20 °C, 300 cm², 10 mmol mol⁻¹, 1 ppm s⁻¹)', () => {
    const flux = chamberFluxUmolM2S(1, 100, 20, 4000, 300, 0.01);
    expect(flux).toBeCloseTo(5.41564, 5);
  });

  it('is the SI computation converted once: Pa, m³, m², K and mol mol⁻¹ s⁻¹ give the same number', () => {
    const si = ((100e3 * 4000e-6 * (1 - 0.01)) / (GAS_CONSTANT_J_PER_MOL_K * 293.15 * 300e-4)) * 1e-6; // mol m⁻² s⁻¹
    expect(fluxPerSlope(100, 20, 4000, 300, 0.01)).toBeCloseTo(si * 1e6, 10);
  });

  it('with constant water vapour, the dry-corrected flux equals the uncorrected flux (identity of Webb, Pearman & Leuning 1980, QJRMS 106)', () => {
    const t = Array.from({ length: 50 }, (_, i) => i * 2);
    const w = 18; // mmol mol⁻¹, constant during the closure
    const wet = t.map((s) => 410 + 1.7 * s);
    const dry = wet.map((c) => dryMoleFractionPpm(c, w));
    const wetSlope = fitLinearRaw(t, wet, t.length)!.slope;
    const drySlope = fitLinearRaw(t, dry, t.length)!.slope;
    const uncorrected = chamberFluxUmolM2S(wetSlope, 98, 15, 5000, 315, 0);
    const corrected = chamberFluxUmolM2S(drySlope, 98, 15, 5000, 315, w / 1000);
    expect(corrected).toBeCloseTo(uncorrected, 12);
  });
});
