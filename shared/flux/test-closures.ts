/**
 * Synthetic closures for tests and the benchmark: an invented field scenario (our own), with a
 * seeded generator so every run sees the same numbers.
 */
export function seededRandom(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => {
    // xorshift32: fast, deterministic, good enough for synthetic noise
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 4294967296;
  };
}

/** Approximately normal noise (sum of 12 uniforms, σ = 1). */
export function gaussian(rand: () => number): number {
  let sum = 0;
  for (let i = 0; i < 12; i++) sum += rand();
  return sum - 6;
}

export interface SyntheticClosure {
  tS: number[];
  co2Ppm: number[];
}

/**
 * χ(t) = c0 + slope·(exp(p3·τ) − 1)/p3 for t ≥ settle (a straight line when p3 = 0), with the
 * seating phase before the settle time drifting at the same slope.
 */
export function syntheticClosure(opts: {
  points: number;
  dtS: number;
  settleS: number;
  c0: number;
  slope: number;
  p3: number;
  noise?: number;
  rand?: () => number;
}): SyntheticClosure {
  const { points, dtS, settleS, c0, slope, p3, noise = 0, rand } = opts;
  const tS: number[] = [];
  const co2Ppm: number[] = [];
  for (let i = 0; i < points; i++) {
    const t = i * dtS;
    const tau = t - settleS;
    const shape = p3 === 0 || tau <= 0 ? tau : Math.expm1(p3 * tau) / p3;
    tS.push(t);
    co2Ppm.push(c0 + slope * shape + (noise && rand ? noise * gaussian(rand) : 0));
  }
  return { tS, co2Ppm };
}
