/**
 * Minimum detectable slope and flux of a closure.
 *
 * Source and choice. Parkin, T.B., Venterea, R.T., Hargreaves, S.K. (2012) Calculating the
 * detection limits of chamber-based soil greenhouse gas flux measurements. J. Environ. Qual.
 * 41:705–715 (citation from memory, not re-read here) showed that the smallest flux a chamber
 * can resolve is set by the analytical precision of the concentration measurement, the closure
 * time and the sampling scheme, and that the chamber geometry turns that concentration limit
 * into a flux limit through the same ideal-gas factor as the flux itself. The widely used
 * closed form of that idea (e.g. Christiansen, Outhwaite & Smukler 2015, Agric. For. Meteorol.
 * 211–212:48–57, also from memory) is
 *
 *   MDF = (A_a / t_c) · p·V·(1 − χw) / (R·T·A)      i.e. minimum slope = A_a / t_c,
 *
 * with A_a the analyzer precision (ppm) and t_c the closure length used for the fit (s).
 * A closure whose CO2 changes by less than the analyzer precision over the whole window is
 * therefore not distinguishable from zero and is flagged `flat`.
 *
 * Why not the regression form t·σ·√(12/n)/t_c: it assumes n independent errors, but a
 * continuous analyzer reports smoothed, autocorrelated values at 1 Hz or faster, so the
 * nominal n overstates what the data can resolve. The A_a / t_c form does not depend on the
 * sampling rate and is conservative, which is what a review flag should be.
 */
export function minimumDetectableSlopePpmS(precisionPpm: number, windowLengthS: number): number {
  return windowLengthS > 0 ? precisionPpm / windowLengthS : Infinity;
}
