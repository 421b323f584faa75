/**
 * Single-sample spikes (a pump or tubing disturbance, a breath at the inlet): each inner
 * sample is compared with the straight line through its two neighbours. The noise scale is
 * robust (1.4826 × median absolute deviation, which equals σ for Gaussian noise — Hampel 1974,
 * J. Am. Stat. Assoc. 69:383–393), so one spike cannot hide itself by inflating the scale.
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
  const sigma = 1.4826 * median(scratch, m);
  return maxAbs > Math.max(robustSigmas * sigma, floor);
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
