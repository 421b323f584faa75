/**
 * Dilution correction: CO2 per mole of dry air.
 * χ = χwet / (1 − χw), χw = H2O [mmol mol⁻¹] / 1000.
 * Using dry mole fractions follows Webb, Pearman & Leuning (1980) Q. J. R. Meteorol. Soc.
 * 106:85–100: the soil is no source of dry air, so only the dry mole fraction obeys the simple
 * headspace mass balance.
 */
export function dryMoleFractionPpm(wetPpm: number, h2oMmolMol: number): number {
  return wetPpm / (1 - h2oMmolMol / 1000);
}

/** Water-vapour mole fraction (mol mol⁻¹) from mmol mol⁻¹. */
export function waterMoleFraction(h2oMmolMol: number): number {
  return h2oMmolMol / 1000;
}
