/**
 * Choosing between the straight line and the exponential so that noise is not rewarded.
 *
 * AICc (Hurvich, C.M., Tsai, C.-L. 1989, Regression and time series model selection in small
 * samples, Biometrika 76:297–307) in the Gaussian least-squares form
 *   AICc = −2·ln L + 2K + 2K(K+1)/(n − K − 1),   −2·ln L = n·(ln(2π·RSS/n) + 1),
 * with K = regression parameters + 1 for the error variance (Burnham, K.P., Anderson, D.R. 2002,
 * Model Selection and Multimodel Inference, 2nd ed., Springer, §2.4 — from memory). The value is
 * the one statsmodels' `eval_measures.aicc(llf, nobs, K)` gives (checked on a fixture).
 *
 * Rule: the exponential wins only when it saturates (p3 < 0, the curvature guard) and its AICc is
 * lower than the line's by more than SELECTION_MARGIN = 2. Models within 2 AIC units both have
 * "substantial support" (Burnham & Anderson 2002, §2.6, from memory), so the simpler one stays.
 *
 * Autocorrelated analyzer noise. A continuous analyzer smooths its output, so neighbouring
 * residuals are correlated and n samples carry the information of fewer independent ones; the
 * likelihood ratio then grows with the noise and a curved model wins on straight closures. The
 * comparison therefore uses the effective sample size of an AR(1) series,
 *   n_eff = n·(1 − ρ)/(1 + ρ),   ρ = lag-1 autocorrelation of the exponential fit's residuals
 * (clamped to [0, 0.95]), in both the likelihood term and the small-sample correction:
 *   Δ = n_eff·ln(RSS_lin/RSS_exp) − [pen(4) − pen(3)],  pen(K) = 2K + 2K(K+1)/(n_eff − K − 1).
 * The n_eff formula is the usual variance inflation of a mean of an AR(1) process (e.g. Wilks,
 * D.S., Statistical Methods in the Atmospheric Sciences, Academic Press — from memory); using it
 * in the model comparison is our own choice, measured in model-selection.spec.ts. For white
 * noise ρ ≈ 0 and Δ is the plain AICc difference.
 */

/** AICc units by which the exponential must beat the line (Burnham & Anderson 2002: Δ ≤ 2 is a tie). */
export const SELECTION_MARGIN = 2;
/**
 * AICc units beyond which the line has "essentially no support" (Burnham & Anderson 2002, §2.6,
 * Δ > 10 — from memory): a convex rise (p3 > 0) that strong is flagged, a weaker one is noise.
 */
export const CONVEX_FLAG_MARGIN = 10;
const RHO_MAX = 0.95;

/** Gaussian AICc of a least-squares fit with `params` regression parameters (K = params + 1). */
export function aiccOf(rss: number, n: number, params: number): number {
  const k = params + 1;
  const floored = Math.max(rss, 1e-12 * n);
  const correction = n - k - 1 > 0 ? (2 * k * (k + 1)) / (n - k - 1) : Infinity;
  return n * (Math.log((2 * Math.PI * floored) / n) + 1) + 2 * k + correction;
}

/** Lag-1 autocorrelation of residuals (sum of lagged products over the sum of squares). */
export function lag1Autocorrelation(residuals: ArrayLike<number>, n: number): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    den += residuals[i] * residuals[i];
    if (i > 0) num += residuals[i] * residuals[i - 1];
  }
  return den > 0 ? num / den : 0;
}

/** n·(1 − ρ)/(1 + ρ) with ρ clamped to [0, 0.95]. */
export function effectiveSampleSize(n: number, rho: number): number {
  const r = Math.min(RHO_MAX, Math.max(0, Number.isFinite(rho) ? rho : 0));
  return (n * (1 - r)) / (1 + r);
}

/**
 * How many AICc units the exponential (3 parameters) is better than the line (2), on the effective
 * sample size; positive favours the exponential. −Infinity when n_eff is too small for AICc.
 */
export function exponentialAdvantage(rssLinear: number, rssExponential: number, nEff: number): number {
  const pen = (params: number) => {
    const k = params + 1;
    return nEff - k - 1 > 0 ? 2 * k + (2 * k * (k + 1)) / (nEff - k - 1) : Infinity;
  };
  const floor = 1e-12;
  const ratio = Math.max(rssLinear, floor) / Math.max(rssExponential, floor);
  const penalty = pen(3) - pen(2);
  return Number.isFinite(penalty) ? nEff * Math.log(ratio) - penalty : -Infinity;
}
