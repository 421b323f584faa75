import { GAS_CONSTANT_J_PER_MOL_K, ZERO_CELSIUS_K } from './constants';

/**
 * Closed-chamber flux from the ideal gas law and the dry-air mass balance of the headspace:
 *
 *   flux = p · V · (1 − χw) / (R · T · A) · dχ/dt
 *
 * (Webb, Pearman & Leuning 1980, QJRMS 106 for the dry-air principle; the equation itself is
 * derived in REFERENCES.md §1). This is the ONE place where units are converted.
 *
 * Unit derivation, from the units people type to SI and back:
 *   p  [kPa]          → Pa      × 10³
 *   V  [cm³]          → m³      × 10⁻⁶
 *   1/A [cm⁻²]        → m⁻²     × 10⁴
 *   dχ/dt [µmol mol⁻¹ s⁻¹] → mol mol⁻¹ s⁻¹ × 10⁻⁶
 *   flux [mol m⁻² s⁻¹] → µmol m⁻² s⁻¹ × 10⁶
 * The last two cancel, so flux[µmol m⁻² s⁻¹] = 10 · p[kPa]·V[cm³]·(1 − χw) / (R·T[K]·A[cm²]) · slope[ppm s⁻¹].
 */
const KPA_CM3_PER_CM2_TO_SI = 1e3 * 1e-6 * 1e4; // = 10, see the derivation above

/**
 * Flux (µmol m⁻² s⁻¹) per unit of dry-mole-fraction slope (µmol mol⁻¹ s⁻¹).
 * Multiply any model's initial slope by this factor to obtain its flux.
 */
export function fluxPerSlope(pressureKpa: number, tempC: number, volumeCm3: number, areaCm2: number, waterMolFraction: number): number {
  const tempK = tempC + ZERO_CELSIUS_K;
  return (KPA_CM3_PER_CM2_TO_SI * pressureKpa * volumeCm3 * (1 - waterMolFraction)) / (GAS_CONSTANT_J_PER_MOL_K * tempK * areaCm2);
}

/** Flux density in µmol m⁻² s⁻¹ from a dry-mole-fraction slope in ppm s⁻¹. */
export function chamberFluxUmolM2S(
  slopePpmS: number,
  pressureKpa: number,
  tempC: number,
  volumeCm3: number,
  areaCm2: number,
  waterMolFraction: number,
): number {
  return slopePpmS * fluxPerSlope(pressureKpa, tempC, volumeCm3, areaCm2, waterMolFraction);
}
