import { aiccOf } from './model-selection';

/**
 * Goodness-of-fit numbers shared by every closure model, so the models stay comparable:
 *   R² = 1 − RSS/TSS, RMSE = √(RSS/n), AIC = n·ln(RSS/n) + 2k (least-squares form, Akaike 1974,
 *   IEEE Trans. Autom. Control 19:716–723, k = regression parameters), and AICc (Hurvich & Tsai
 *   1989, Biometrika 76; Gaussian form with the error variance counted, see model-selection.ts),
 *   the value the model choice uses.
 * RSS is floored at 1e−12·n for the AIC only: a noise-free series would otherwise give −∞ and
 * make every comparison meaningless.
 */
export interface FitStatistics {
  r2: number;
  rmse: number;
  aic: number;
  aicc: number;
  n: number;
}

export const RSS_FLOOR_PER_POINT = 1e-12;

export function fitStatistics(rss: number, tss: number, n: number, k: number): FitStatistics {
  const floored = Math.max(rss, RSS_FLOOR_PER_POINT * n);
  return {
    // A series flat to below 1e−6 ppm per point has no variance to explain: R² is undefined.
    r2: tss > RSS_FLOOR_PER_POINT * n ? 1 - rss / tss : NaN,
    rmse: Math.sqrt(rss / n),
    aic: n * Math.log(floored / n) + 2 * k,
    aicc: aiccOf(rss, n, k),
    n,
  };
}

/** Total sum of squares about the mean. */
export function totalSumOfSquares(y: ArrayLike<number>, n: number): number {
  let mean = 0;
  for (let i = 0; i < n; i++) mean += y[i];
  mean /= n;
  let tss = 0;
  for (let i = 0; i < n; i++) {
    const d = y[i] - mean;
    tss += d * d;
  }
  return tss;
}
