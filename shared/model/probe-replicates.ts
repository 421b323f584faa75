/**
 * Replicate probe readings of one visit: crews take several insertions around a collar, every one
 * is kept as its own probe reading, and a visit's value is their mean, with the sample SD and n
 * beside it (device, server aggregation and exports all use these functions).
 */

/*
 * How far (cm) a soil temperature's depth may sit from the site's probe depth and still be averaged
 * with the others is the site's `tempDepthToleranceCm` (default in shared/model/site-layout.ts):
 * every function below takes it as an argument, so no caller can fall back to a fixed value.
 * A temperature further off is flagged and kept apart, never averaged silently.
 */

export interface SampleStats {
  n: number;
  mean: number | null;
  /** Sample standard deviation (n − 1 denominator); null below two values. */
  sd: number | null;
}

/**
 * Mean and sample standard deviation, s = √(Σ(x − x̄)² / (n − 1)) (the usual sample SD, e.g.
 * NIST/SEMATECH e-Handbook of Statistical Methods, 2012, §1.3.5.6). Two passes (mean first, then
 * squared deviations) so large values with a small spread keep their digits.
 */
export function sampleStats(values: readonly number[]): SampleStats {
  const n = values.length;
  if (!n) return { n: 0, mean: null, sd: null };
  const mean = values.reduce((a, b) => a + b, 0) / n;
  if (n < 2) return { n, mean, sd: null };
  const ss = values.reduce((a, x) => a + (x - mean) ** 2, 0);
  return { n, mean, sd: Math.sqrt(ss / (n - 1)) };
}

/** Whether a depth counts as the probe depth (the boundary is inclusive; 1e-9 absorbs decimal input). */
export function atProbeDepth(depthCm: number, probeDepthCm: number, toleranceCm: number): boolean {
  return Math.abs(depthCm - probeDepthCm) <= toleranceCm + 1e-9;
}

export interface ReplicateValues {
  id: string;
  soilTemps: readonly { depthCm: number; tempC: number }[];
  /** The replicate's VWC, % (calibrated), or null when it has no moisture. */
  vwcPct: number | null;
}

export interface ProbeSummary {
  vwc: SampleStats;
  /** Temperatures at the probe depth (± the tolerance), one per replicate. */
  soilTemp: SampleStats;
  /** Temperatures further from the probe depth than the tolerance: flagged, not in the mean. */
  offDepth: { id: string; depthCm: number; tempC: number }[];
}

/** A replicate's soil temperature at the probe depth: the one nearest it within the tolerance, or null. */
export function tempAtProbeDepth(
  soilTemps: readonly { depthCm: number; tempC: number }[],
  probeDepthCm: number,
  toleranceCm: number,
): number | null {
  let nearest: { depthCm: number; tempC: number } | null = null;
  for (const t of soilTemps) {
    if (!atProbeDepth(t.depthCm, probeDepthCm, toleranceCm)) continue;
    if (!nearest || Math.abs(t.depthCm - probeDepthCm) < Math.abs(nearest.depthCm - probeDepthCm)) nearest = t;
  }
  return nearest ? nearest.tempC : null;
}

/** A visit's probe value: mean, SD and n of its replicates' moisture and of their temperatures at the probe depth. */
export function probeSummary(replicates: readonly ReplicateValues[], probeDepthCm: number, toleranceCm: number): ProbeSummary {
  const temps: number[] = [];
  const offDepth: ProbeSummary['offDepth'] = [];
  for (const r of replicates) {
    for (const t of r.soilTemps)
      if (!atProbeDepth(t.depthCm, probeDepthCm, toleranceCm)) offDepth.push({ id: r.id, depthCm: t.depthCm, tempC: t.tempC });
    const at = tempAtProbeDepth(r.soilTemps, probeDepthCm, toleranceCm);
    if (at !== null) temps.push(at);
  }
  const vwc = replicates.map((r) => r.vwcPct).filter((v): v is number => v !== null && Number.isFinite(v));
  return { vwc: sampleStats(vwc), soilTemp: sampleStats(temps), offDepth };
}
