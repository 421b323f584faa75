/**
 * Physical constants of the flux engine, each with its source.
 * Every other file takes its numbers from here so that no constant is typed twice.
 */

/**
 * Molar gas constant R = N_A · k, exact since the 2019 SI redefinition.
 * CODATA 2018: Tiesinga, E., Mohr, P.J., Newell, D.B., Taylor, B.N. (2021)
 * Rev. Mod. Phys. 93:025010 (citation from memory; the value was read in the CRC Handbook).
 */
export const GAS_CONSTANT_J_PER_MOL_K = 6.02214076e23 * 1.380649e-23;

/** 0 °C in kelvin (definition of the Celsius scale). */
export const ZERO_CELSIUS_K = 273.15;

/**
 * Conventional atomic/molecular weights, g mol⁻¹ (IUPAC; Prohaska et al. 2022,
 * Pure Appl. Chem. 94:573–600 — citation from memory, values checked on secondary pages).
 */
export const MOLAR_MASS_C_G_PER_MOL = 12.011;
export const MOLAR_MASS_CO2_G_PER_MOL = 44.009;

export const SECONDS_PER_HOUR = 3600;
export const SECONDS_PER_DAY = 86400;

/**
 * Settle time most portable systems need after the chamber seats (headspace and loop mixing,
 * pressure pulse). Common practice, typically 10–30 s; no published constant is claimed.
 */
export const TYPICAL_SETTLE_TIME_S = 20;
