/**
 * Volumetric water content (m³ m⁻³) from apparent dielectric permittivity Ka, Topp, G.C.,
 * Davis, J.L., Annan, A.P. (1980) Water Resour. Res. 16(3):574–582:
 *   θv = −5.3×10⁻² + 2.92×10⁻² Ka − 5.5×10⁻⁴ Ka² + 4.3×10⁻⁶ Ka³
 * Empirical for mineral soils (Ka ≈ 3–40). Below Ka ≈ 1.88 it turns negative, so it is clamped
 * at 0. Not meant for organic soils or peat: use a site calibration there.
 */
export function toppVwc(ka: number): number {
  if (!Number.isFinite(ka)) return NaN;
  const theta = -5.3e-2 + ka * (2.92e-2 + ka * (-5.5e-4 + ka * 4.3e-6));
  return Math.max(0, theta);
}

/**
 * Site calibration polynomial θv = c0 + c1·x + c2·x² + … (coefficients in ascending order),
 * x being whatever the probe reports (Ka, √Ka, a raw count). Water content cannot be negative,
 * so the result is clamped at 0 like Topp's equation.
 */
export function polynomialVwc(x: number, coefficients: readonly number[]): number {
  if (!Number.isFinite(x) || coefficients.length === 0) return NaN;
  let acc = 0;
  for (let i = coefficients.length - 1; i >= 0; i--) acc = acc * x + coefficients[i];
  return Math.max(0, acc);
}
