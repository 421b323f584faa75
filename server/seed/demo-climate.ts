import { pressureFromElevationKpa } from '../../shared/flux/standard-atmosphere';
import { toppVwc } from '../../shared/flux/soil-moisture';
import { hashString } from './prng';

/**
 * The invented weather of the demo site (51.0 °N, 10.0 °E, 420 m): smooth, deterministic
 * functions of time, so probe readings, chamber air, closures and the continuous temperature
 * logs all tell the same story. Shapes are textbook (annual and daily sinusoids, damped at
 * depth); the numbers are chosen to look like a temperate site, not taken from any record.
 */

const DAY_MS = 86_400_000;
const YEAR_START_MS = Date.UTC(2026, 0, 1);

/** Fractional day of year (0 = 1 January 00:00 UTC). */
export function dayOfYear(ms: number): number {
  return (ms - YEAR_START_MS) / DAY_MS;
}

const phases = new Map<string, number[]>();

/** Fixed-period sinusoids with hashed phases: a weather "anomaly" that wanders over days. */
function anomaly(ms: number, label: string, periodsDays: readonly number[], amplitudes: readonly number[]): number {
  let phase = phases.get(label);
  if (!phase) {
    phase = periodsDays.map((_, i) => ((hashString(`${label}:${i}`) % 10000) / 10000) * 2 * Math.PI);
    phases.set(label, phase);
  }
  const d = dayOfYear(ms);
  let sum = 0;
  for (let i = 0; i < periodsDays.length; i++) sum += amplitudes[i] * Math.sin((2 * Math.PI * d) / periodsDays[i] + phase[i]);
  return sum;
}

/** Warm/cold spells shared by air and soil, °C (standard deviation ≈ 1.2 °C). */
export function weatherAnomalyC(ms: number): number {
  return anomaly(ms, 'temperature', [3.3, 5.9, 9.4, 15.7, 27.1], [0.5, 0.6, 0.7, 0.6, 0.5]);
}

/** What makes one plot's soil warmer or its daily swing larger than another's. */
export interface PlotClimate {
  /** Added to the soil temperature at every depth, °C (e.g. a warming treatment). */
  offsetC: number;
  /** Multiplies the daily amplitude (bare soil after litter removal swings more). */
  dailyAmplitudeFactor: number;
}

export const NEUTRAL_PLOT: PlotClimate = { offsetC: 0, dailyAmplitudeFactor: 1 };

/**
 * Soil temperature at 5 cm, °C: annual wave (minimum late January, maximum late July), a daily
 * wave peaking mid-afternoon whose amplitude grows in summer, and the weather anomaly.
 * Deeper sensors get a damped, delayed daily wave (damping depth ≈ 10 cm, textbook heat
 * conduction in moist soil — from memory, order of magnitude only).
 */
export function soilTempC(ms: number, plot: PlotClimate = NEUTRAL_PLOT, depthCm = 5): number {
  const d = dayOfYear(ms);
  const seasonal = 9 + 8.5 * Math.sin((2 * Math.PI * (d - 117)) / 365);
  const hourUtc = (((ms % DAY_MS) + DAY_MS) % DAY_MS) / 3_600_000;
  const summer = Math.max(0, Math.sin((2 * Math.PI * (d - 80)) / 365));
  const damping = Math.exp(-(depthCm - 5) / 10);
  const lagH = ((depthCm - 5) / 10) * 3.8; // phase lag grows with depth: 24 h / 2π per damping depth
  const amplitude = (1 + 1.8 * summer) * plot.dailyAmplitudeFactor * damping;
  const daily = amplitude * Math.cos((2 * Math.PI * (hourUtc - 13.5 - lagH)) / 24);
  return Math.max(-1.5, seasonal + daily + 0.8 * weatherAnomalyC(ms - 6 * 3_600_000) + plot.offsetC);
}

/** Air temperature near the ground, °C: larger daily swing, peak at about 14:00 local solar time. */
export function airTempC(ms: number): number {
  const d = dayOfYear(ms);
  const seasonal = 9.5 + 9 * Math.sin((2 * Math.PI * (d - 110)) / 365);
  const hourUtc = (((ms % DAY_MS) + DAY_MS) % DAY_MS) / 3_600_000;
  const summer = Math.max(0, Math.sin((2 * Math.PI * (d - 80)) / 365));
  return seasonal + (3.5 + 2.5 * summer) * Math.cos((2 * Math.PI * (hourUtc - 13.3)) / 24) + 1.5 * weatherAnomalyC(ms);
}

/** Station pressure, kPa: US Standard Atmosphere 1976 at 420 m (≈ 96.4 kPa) plus passing weather systems. */
export function pressureKpa(ms: number, elevationM = 420): number {
  return pressureFromElevationKpa(elevationM) + anomaly(ms, 'pressure', [4.1, 7.3, 11.9], [0.35, 0.45, 0.3]);
}

/** Did it rain on this (UTC) calendar day? About one day in three, more in summer storms. */
export function rainedOn(ms: number): boolean {
  const dayIndex = Math.floor(ms / DAY_MS);
  return hashString(`rain:${dayIndex}`) % 100 < 33;
}

/** Volumetric water content at 0–12 cm, %: wet spring and autumn, a dry late summer, recharged by rain. */
export function soilVwcPct(ms: number, plotOffsetPct = 0): number {
  const d = dayOfYear(ms);
  const base = 30 - 11 * Math.max(0, Math.sin((2 * Math.PI * (d - 125)) / 365));
  let recharge = 0;
  for (let k = 0; k < 5; k++) if (rainedOn(ms - k * DAY_MS)) recharge += 4.5 * Math.exp(-k / 1.5);
  return Math.min(45, Math.max(8, base + recharge + plotOffsetPct));
}

/** Saturation vapour pressure over water, kPa (Tetens formula, common practice in micrometeorology). */
export function saturationVapourKpa(tempC: number): number {
  return 0.6108 * Math.exp((17.27 * tempC) / (tempC + 237.3));
}

/** Water vapour of the air entering the chamber, mmol mol⁻¹, at a relative humidity that falls in the afternoon. */
export function airH2oMmolMol(ms: number): number {
  const t = airTempC(ms);
  const hourUtc = (((ms % DAY_MS) + DAY_MS) % DAY_MS) / 3_600_000;
  const rh = 0.74 - 0.12 * Math.cos((2 * Math.PI * (hourUtc - 13)) / 24);
  // Capped where a temperate summer's dew point tops out (≈ 16 °C), so the headspace stays below ~20 mmol/mol.
  return Math.min(18.5, Math.max(5, ((rh * saturationVapourKpa(t)) / pressureKpa(ms)) * 1000));
}

/**
 * Apparent permittivity Ka that a probe would report for a water content, by inverting
 * Topp et al. (1980, Water Resour. Res. 16) with bisection (the curve rises monotonically over 1–60).
 */
export function permittivityForVwc(vwcPct: number): number {
  const target = vwcPct / 100;
  let lo = 1;
  let hi = 60;
  for (let i = 0; i < 50; i++) {
    const mid = (lo + hi) / 2;
    if (toppVwc(mid) < target) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
