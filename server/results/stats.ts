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

/** Linear-interpolated quantile of sorted values (type 7, the R default). */
export function quantileSorted(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.ceil(h);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
