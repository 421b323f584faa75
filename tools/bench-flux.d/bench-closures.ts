/**
 * The benchmark's synthetic closures (an invented scenario of our own): 150 samples at 1 Hz,
 * 20 s settle time, a quarter each straight efflux, saturating efflux, saturating uptake and
 * noisy near-zero flux; water vapour rising slowly during the closure.
 */
import { gaussian, seededRandom, syntheticClosure } from '../../shared/flux/test-closures';
import type { BatchRun } from '../flux-batch/batch-wire';

/** A bench closure as the batch CLI reads it. */
export type WireRun = BatchRun & { id: string };

export const POINTS = 150;
export const SETTLE_S = 20;

export function benchRun(k: number, rand: () => number): WireRun {
  const kind = k % 4;
  const slope = kind === 2 ? -(0.2 + rand()) : kind === 3 ? 0.02 * gaussian(rand) : 0.3 + 3 * rand();
  const u = kind === 0 || kind === 3 ? 0 : -(0.5 + 6 * rand());
  const noise = kind === 3 ? 1 : 0.3;
  const c = syntheticClosure({
    points: POINTS,
    dtS: 1,
    settleS: SETTLE_S,
    c0: 425 + 30 * rand(),
    slope,
    p3: u / (POINTS - 1 - SETTLE_S),
    noise,
    rand,
  });
  const h0 = 8 + 6 * rand();
  const h2o = c.tS.map((t) => Math.round((h0 + 0.004 * t) * 1000) / 1000);
  return {
    id: `bench-${k}`,
    t_s: c.tS,
    // The analyzer reports wet mole fractions to 3 decimals.
    co2_ppm: c.co2Ppm.map((x, i) => Math.round(x * (1 - h2o[i] / 1000) * 1000) / 1000),
    h2o_mmol_mol: h2o,
    pressure_kpa: 97 + 2 * rand(),
    temp_c: 8 + 15 * rand(),
    volume_cm3: 4600 + 400 * rand(),
    area_cm2: 317.8,
    settle_s: SETTLE_S,
  };
}

export function benchRuns(count: number, seed = 12345): WireRun[] {
  const rand = seededRandom(seed);
  return Array.from({ length: count }, (_, k) => benchRun(k, rand));
}
