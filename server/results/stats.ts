import { studentTQuantile } from '../../shared/flux/student-t';

/** Plain descriptive statistics used by the aggregation (sample SD with n − 1). */
export function mean(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/** Mean of the values present; null when none is. */
export function meanOrNull(xs: readonly (number | null)[]): number | null {
  const ok = xs.filter((x): x is number => x !== null && Number.isFinite(x));
  return ok.length ? mean(ok) : null;
}

/** Sample standard deviation (denominator n − 1). */
export function sd(xs: readonly number[]): number {
  const m = mean(xs);
  let ss = 0;
  for (const x of xs) ss += (x - m) ** 2;
  return Math.sqrt(ss / (xs.length - 1));
}

/**
 * 95 % Student t interval of a mean over independent replicates: mean ± t(0.975, n − 1)·s/√n
 * (Student 1908, Biometrika 6:1–25). Exact for normally distributed replicates, so its coverage holds
 * at 3–6 plots, where a percentile bootstrap of the mean is far too narrow (it uses the plug-in SD,
 * biased low by √((n − 1)/n), and normal rather than t quantiles).
 */
export function tMeanInterval(values: readonly number[], level = 0.95): [number, number] | null {
  const n = values.length;
  if (n < 2) return null;
  const m = mean(values);
  const half = studentTQuantile(1 - (1 - level) / 2, n - 1) * (sd(values) / Math.sqrt(n));
  return [m - half, m + half];
}
