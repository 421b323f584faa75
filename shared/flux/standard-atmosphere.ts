/**
 * Default station pressure from elevation, U.S. Standard Atmosphere 1976 (= ICAO Doc 7488),
 * troposphere layer with a constant lapse rate:
 *   P(H) = P0 · [1 − L·H/T0]^(g0·M / (R*·L)),  H geopotential height.
 * The standard deliberately uses R* = 8.31432 J mol⁻¹ K⁻¹, not CODATA R; we keep it so that
 * the published tables are reproduced. Weather moves real pressure by several kPa, so callers
 * flag every value that comes from here (`default-pressure`).
 */
const P0_KPA = 101.325;
const T0_K = 288.15;
const LAPSE_K_PER_M = 0.0065;
const G0_M_PER_S2 = 9.80665;
const MOLAR_MASS_AIR_KG_PER_MOL = 0.0289644;
const R_STAR_1976 = 8.31432;
const EARTH_RADIUS_M = 6356766;
const TROPOPAUSE_M = 11000;

const EXPONENT = (G0_M_PER_S2 * MOLAR_MASS_AIR_KG_PER_MOL) / (R_STAR_1976 * LAPSE_K_PER_M);

/** Geopotential height from geometric elevation (U.S. Std Atm 1976, r0 = 6 356 766 m). */
export function geopotentialHeightM(geometricM: number): number {
  return (EARTH_RADIUS_M * geometricM) / (EARTH_RADIUS_M + geometricM);
}

/**
 * Pressure in kPa at an elevation in metres. Map and GPS elevations are geometric, which is
 * the default; pass `geopotential: true` to use the value as H directly. Valid to 11 km.
 */
export function pressureFromElevationKpa(elevationM: number, options: { geopotential?: boolean } = {}): number {
  if (!Number.isFinite(elevationM)) return NaN;
  const h = options.geopotential ? elevationM : geopotentialHeightM(elevationM);
  if (h > TROPOPAUSE_M || h < -5000) return NaN;
  return P0_KPA * Math.pow(1 - (LAPSE_K_PER_M * h) / T0_K, EXPONENT);
}
