import { MOLAR_MASS_C_G_PER_MOL, MOLAR_MASS_CO2_G_PER_MOL, SECONDS_PER_DAY, SECONDS_PER_HOUR } from './constants';

/** Units a CO2 flux can be shown in. The engine always computes µmol m⁻² s⁻¹. */
export type FluxUnit = 'umol_m2_s' | 'g_c_m2_d' | 'g_co2_m2_h' | 'mg_co2_m2_h';

/**
 * Factor from 1 µmol CO2 m⁻² s⁻¹ to each unit: 10⁻⁶ mol × molar mass × seconds per period.
 * Molar masses: IUPAC conventional values (C 12.011, CO2 44.009 g mol⁻¹).
 */
const FACTOR_FROM_UMOL_M2_S: Record<FluxUnit, number> = {
  umol_m2_s: 1,
  g_c_m2_d: 1e-6 * MOLAR_MASS_C_G_PER_MOL * SECONDS_PER_DAY,
  g_co2_m2_h: 1e-6 * MOLAR_MASS_CO2_G_PER_MOL * SECONDS_PER_HOUR,
  mg_co2_m2_h: 1e-3 * MOLAR_MASS_CO2_G_PER_MOL * SECONDS_PER_HOUR,
};

export const FLUX_UNIT_LABELS: Record<FluxUnit, string> = {
  umol_m2_s: 'µmol CO₂ m⁻² s⁻¹',
  g_c_m2_d: 'g C m⁻² d⁻¹',
  g_co2_m2_h: 'g CO₂ m⁻² h⁻¹',
  mg_co2_m2_h: 'mg CO₂ m⁻² h⁻¹',
};

/** Converts a flux given in µmol CO2 m⁻² s⁻¹ to another unit. */
export function convertFlux(fluxUmolM2S: number, to: FluxUnit): number {
  return fluxUmolM2S * FACTOR_FROM_UMOL_M2_S[to];
}
