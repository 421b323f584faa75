/**
 * Minimum detectable slope and flux of a closure.
 *
 * Source. The closed form is that of Christiansen, J.R., Outhwaite, J., Smukler, S.M. (2015)
 * Comparison of CO2, CH4 and N2O soil-atmosphere exchange measured in static chambers with cavity
 * ring-down spectroscopy and gas chromatography. Agric. For. Meteorol. 211–212:48–57, who give it
 * "after Parkin et al. 2012":
 *
 *   MDF = (A_a / t_c) · p·V·(1 − χw) / (R·T·A)      i.e. minimum slope = A_a / t_c,
 *
 * with A_a the analyzer precision (ppm) and t_c the closure length used for the fit (s); the
 * (1 − χw) factor is ours, the same dry-air factor as the flux itself. The idea it rests on — the
 * smallest resolvable flux is set by analytical precision, closure time and sampling, turned into
 * a flux limit by the chamber's ideal-gas factor — is Parkin, T.B., Venterea, R.T., Hargreaves,
 * S.K. (2012) Calculating the detection limits of chamber-based soil greenhouse gas flux
 * measurements. J. Environ. Qual. 41:705–715. Both citations from memory (not re-read here).
 * A closure whose CO2 changes by less than the analyzer precision over the whole window is
 * therefore not distinguishable from zero and is flagged `flat`.
 *
 * Precision: the analyzer record's own value; without one the engine uses 1 ppm and says so
 * (`precisionIsDefault`), because a default is not a property of the instrument.
 *
 * Why not the regression form t·σ·√(12/n)/t_c: it assumes n independent errors, but a
 * continuous analyzer reports smoothed, autocorrelated values at 1 Hz or faster, so the
 * nominal n overstates what the data can resolve. The A_a / t_c form does not depend on the
 * sampling rate and is conservative, which is what a review flag should be.
 */
export function minimumDetectableSlopePpmS(precisionPpm: number, windowLengthS: number): number {
  return windowLengthS > 0 ? precisionPpm / windowLengthS : Infinity;
}
