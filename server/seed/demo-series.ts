import { fluxPerSlope } from '../../shared/flux/chamber-flux';
import type { Rng } from './prng';

/**
 * Synthetic closure series for the demo season. The headspace of a closed chamber fills with a
 * saturating curve: the soil-to-headspace gradient shrinks as CO2 builds up, so the slope
 * decays roughly exponentially (the shape behind Kutzbach et al. 2007, Biogeosciences 4, and
 * Hutchinson & Mosier 1981, SSSAJ 45). The slope at chamber closure is made from a chosen flux
 * through the same ideal-gas factor the engine uses, so the engine (on its default closure basis)
 * should give the flux back.
 */

/** What went right or wrong at the collar; the odd kinds make the engine's QC flags appear. */
export const CLOSURE_KINDS = ['normal', 'flat', 'uptake', 'start-above', 'spike', 'leak'] as const;
export type ClosureKind = (typeof CLOSURE_KINDS)[number];

export interface SeriesInput {
  kind: ClosureKind;
  /** The true flux at chamber closure, µmol m⁻² s⁻¹ (ignored for `flat`). */
  fluxUmolM2S: number;
  ambientPpm: number;
  pressureKpa: number;
  airTempC: number;
  h2oMmolMol: number;
  volumeCm3: number;
  areaCm2: number;
  settleS: number;
  durationS: number;
  /** Analyzer noise, 1 σ, µmol/mol. */
  noisePpm: number;
}

export interface ClosureSeries {
  tS: number[];
  co2Ppm: number[];
  h2oMmolMol: number[];
  pressureKpa: number[];
  tempC: number[];
  /** The dry-CO2 slope at chamber closure the series was built with, ppm s⁻¹. */
  trueSlopePpmS: number;
  /** The flux that slope stands for with the first fitted sample's p, T and χw. */
  trueFluxUmolM2S: number;
}

const round = (x: number, digits: number) => Math.round(x * 10 ** digits) / 10 ** digits;

/** (1 − e^(−kτ))/k, which tends to τ as k → 0. */
function saturating(k: number, tau: number): number {
  return Math.abs(k) < 1e-9 ? tau : -Math.expm1(-k * tau) / k;
}

export function synthesizeClosure(input: SeriesInput, rng: Rng): ClosureSeries {
  const { kind, settleS, durationS } = input;
  const n = Math.floor(durationS) + 1; // 1 Hz
  // Water vapour builds up in the closed headspace (transpiration and soil evaporation).
  const h2oRise = rng.uniform(0.4, 1.5);
  const h2oTau = rng.uniform(40, 90);
  const h2oAt = (t: number) => input.h2oMmolMol + h2oRise * -Math.expm1(-t / h2oTau);
  // The dark chamber warms a little in the sun.
  const warming = rng.uniform(0, 0.6);
  const tempAt = (t: number) => input.airTempC + 0.3 + (warming * t) / durationS;

  const factor = fluxPerSlope(input.pressureKpa, tempAt(settleS), input.volumeCm3, input.areaCm2, h2oAt(settleS) / 1000);
  let flux = input.fluxUmolM2S;
  if (kind === 'flat') flux = rng.uniform(-0.03, 0.03);
  // Stale headspace: a smaller soil–air gradient, so a smaller apparent flux.
  if (kind === 'start-above') flux *= 0.7;
  if (kind === 'uptake') flux = -Math.abs(input.fluxUmolM2S);
  // Curvature of the saturating curve, s⁻¹: from nearly straight to gentle for a sealed chamber
  // (so the lab sees both linear and exponential selections), strong for a leak (the headspace
  // saturates within the closure).
  const k = kind === 'leak' ? rng.uniform(0.045, 0.06) : kind === 'flat' ? 0 : rng.uniform(0.0003, 0.004);
  // The slope decays as e^(−k·t) from closure: at the end of the settle time it is e^(−k·settle) of the flux's.
  const slope = (flux / factor) * Math.exp(-k * settleS);

  // Start a few ppm above ambient (the soil surface under the chamber as it seats) — or, when the
  // chamber was not aired after the last closure, far above it.
  const stale = kind === 'start-above' ? rng.uniform(140, 200) : 0;
  const startDry = (input.ambientPpm + stale + rng.uniform(0, 6)) / (1 - h2oAt(0) / 1000);
  const atSettle = startDry - slope * saturating(k, -settleS);
  const spikeAt = kind === 'spike' ? rng.int(Math.ceil(settleS) + 15, n - 10) : -1;
  const spikeSize = rng.uniform(25, 60);

  const tS: number[] = [];
  const co2Ppm: number[] = [];
  const h2oMmolMol: number[] = [];
  const pressure: number[] = [];
  const tempC: number[] = [];
  for (let i = 0; i < n; i++) {
    const t = i;
    let dry = atSettle + slope * saturating(k, t - settleS);
    dry += 1.5 * Math.exp(-t / 2); // pressure pulse as the chamber seats
    if (i === spikeAt) dry += spikeSize;
    const h2o = h2oAt(t);
    tS.push(t);
    // The analyzer reports wet mole fractions: χwet = χdry · (1 − χw).
    co2Ppm.push(round(dry * (1 - h2o / 1000) + rng.normal(0, input.noisePpm), 2));
    h2oMmolMol.push(round(h2o + rng.normal(0, 0.02), 3));
    pressure.push(round(input.pressureKpa + rng.normal(0, 0.004), 3));
    tempC.push(round(tempAt(t) + rng.normal(0, 0.02), 2));
  }
  return { tS, co2Ppm, h2oMmolMol, pressureKpa: pressure, tempC, trueSlopePpmS: flux / factor, trueFluxUmolM2S: flux };
}

/**
 * Soil respiration of a collar, µmol m⁻² s⁻¹: a Q10 response to soil temperature at 5 cm
 * (Q10 ≈ 2.2 and R10 ≈ 2–3 µmol m⁻² s⁻¹ are typical of temperate soils — from memory), damped
 * when the soil dries below 20 % VWC, scaled by a treatment and a collar factor.
 */
export function respirationUmolM2S(opts: { r10: number; q10: number; soilTempC: number; vwcPct: number; factor: number }): number {
  const temp = opts.r10 * opts.q10 ** ((opts.soilTempC - 10) / 10);
  const moisture = opts.vwcPct >= 20 ? 1 : 0.55 + (0.45 * Math.max(0, opts.vwcPct)) / 20;
  return Math.min(9, Math.max(0.3, temp * moisture * opts.factor));
}
