/**
 * Single-sample spikes (a pump or tubing disturbance, a breath at the inlet): each inner
 * sample is compared with the straight line through its two neighbours. On equally spaced
 * samples that deviation is half the second difference, d = x[i] − (x[i−1] + x[i+1])/2; for white
 * noise of SD σ the second difference x[i−1] − 2x[i] + x[i+1] has SD √6·σ, so d has SD √6/2·σ =
 * √1.5·σ ≈ 1.22σ. The scale is robust: 1.4826 × the median of |d| estimates SD(d) (the median
 * absolute deviation about d's zero median; 1.4826 makes it consistent for Gaussian data — Hampel
 * 1974, J. Am. Stat. Assoc. 69:383–393), so one spike cannot hide itself by inflating the scale.
 * The limit of 8 × SD(d) is therefore 8·√1.5 ≈ 9.8 σ of the analyzer noise, in the units of the
 * spike itself (a spike of height h at sample i gives d = h).
 * The precision floor keeps noise-free or very smooth series from flagging rounding.
 * Thresholds are our own rule of thumb (documented in qc-flags.ts).
 */
let scratch = new Float64Array(256);

export function hasSpike(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  n: number,
  precisionPpm: number,
  robustSigmas: number,
  precisionMultiple: number,
): boolean {
  if (n < 5) return false;
  if (scratch.length < n) scratch = new Float64Array(n * 2);
  const m = n - 2;
  let maxAbs = 0;
  for (let i = 1; i < n - 1; i++) {
    const span = t[i + 1] - t[i - 1];
    const w = span > 0 ? (t[i] - t[i - 1]) / span : 0.5;
    const d = Math.abs(y[i] - (y[i - 1] + (y[i + 1] - y[i - 1]) * w));
    scratch[i - 1] = d;
    if (d > maxAbs) maxAbs = d;
  }
  const floor = precisionMultiple * precisionPpm;
  if (maxAbs <= floor) return false; // cheap exit for the common, clean closure
  return maxAbs > Math.max(robustSigmas * robustScaleOfDeviations(m), floor);
}

/** 1.4826 × median |d| of the first m deviations in the scratch buffer: SD(d) = √1.5·σ for white noise. */
function robustScaleOfDeviations(m: number): number {
  return 1.4826 * median(scratch, m);
}

/**
 * The robust SD of the deviations from the neighbours' line (for tests and review tools):
 * √1.5·σ for white noise of SD σ on equally spaced samples.
 */
export function neighbourDeviationScale(t: ArrayLike<number>, y: ArrayLike<number>, n: number): number {
  if (n < 3) return NaN;
  if (scratch.length < n) scratch = new Float64Array(n * 2);
  for (let i = 1; i < n - 1; i++) {
    const span = t[i + 1] - t[i - 1];
    const w = span > 0 ? (t[i] - t[i - 1]) / span : 0.5;
    scratch[i - 1] = Math.abs(y[i] - (y[i - 1] + (y[i + 1] - y[i - 1]) * w));
  }
  return robustScaleOfDeviations(n - 2);
}

/** Median of the first m values by quickselect (reorders the buffer; O(m) on average). */
function median(a: Float64Array, m: number): number {
  const k = m >> 1;
  let lo = 0;
  let hi = m - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const tmp = a[i];
        a[i] = a[j];
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  if (m % 2 === 1) return a[k];
  // Even count: the lower middle is the maximum of the part left of k.
  let lower = -Infinity;
  for (let i = 0; i < k; i++) if (a[i] > lower) lower = a[i];
  return (lower + a[k]) / 2;
}
