/** Public input and result shapes of a closure fit (camelCase; the batch CLI maps them to snake_case). */
import type { QcFlag } from './qc-flags';

export type ClosureModel = 'linear' | 'exponential' | 'quadratic';

/**
 * Where the selected flux takes the slope of a curved model: at chamber closure (t = 0, the
 * undisturbed flux; Kutzbach et al. 2007, Wagner et al. 1997) or at the end of the settle time
 * (t0, the start of the fit window). The fit itself always uses only the samples after t0.
 */
export type SlopeBasis = 'closure' | 'settle_end';
export const SLOPE_BASES: readonly SlopeBasis[] = ['closure', 'settle_end'];
export const DEFAULT_SLOPE_BASIS: SlopeBasis = 'closure';

export interface ClosureInput {
  /** Elapsed seconds since the chamber seated, one per sample. */
  tS: readonly (number | null)[];
  /** Wet CO2 mole fraction as the analyzer reports it, µmol mol⁻¹ (dry when co2IsDry). */
  co2Ppm: readonly (number | null)[];
  /**
   * The CO2 values are already per mole of dry air (the analyzer corrected them): no dilution
   * correction is applied again; water vapour still gives χw for the moles of dry air.
   */
  co2IsDry?: boolean;
  /** Water vapour, mmol mol⁻¹: per sample, one value for the closure, or none. */
  h2oMmolMol?: readonly (number | null)[] | number | null;
  pressureKpa: number | readonly (number | null)[];
  tempC: number | readonly (number | null)[];
  /** Total system volume: chamber + loop + collar headspace (see chamberVolumeFor). */
  volumeCm3: number;
  /** Soil area: the collar's own inside area. */
  areaCm2: number;
  /** The chamber profile's footprint, when stated: flagged when it differs from areaCm2. */
  footprintAreaCm2?: number | null;
  /** Settle time: t0 of the fit window (common practice ≈ 20 s). */
  settleS: number;
  /** Optional end of the fit window, elapsed seconds. */
  windowEndS?: number | null;
  /**
   * Sample indices (positions in tS) the lab left out of the fit (a spike, a knocked chamber):
   * the fit is that of the remaining samples; a left-out sample is not a gap.
   */
  excludedIndices?: readonly number[] | null;
  ambientPpm?: number | null;
  ambientMarginPpm?: number;
  /** Analyzer precision for the detection limit, ppm (default 1). */
  precisionPpm?: number;
  model?: 'auto' | ClosureModel;
  /** Slope basis of the selected flux (default 'closure'). */
  slopeAt?: SlopeBasis;
  pressureIsDefault?: boolean;
  /** Where tempC came from (chamber-air-temperature.ts): 'visit' and 'site-default' are flagged. */
  tempSource?: 'series' | 'visit' | 'site-default';
  /** Set when the volume came from an offset set taken after the closure day. */
  offsetAfter?: boolean;
}

export interface ModelFit {
  /** Dry-mole-fraction slope at t0, ppm s⁻¹. */
  slopePpmS: number;
  fluxUmolM2S: number;
  r2: number;
  rmse: number;
  aic: number;
  /** Gaussian AICc with the error variance counted (model-selection.ts). */
  aicc: number;
  n: number;
}

/** A curved model's slope and flux at chamber closure (t = 0, extrapolated back over the settle time). */
export interface AtClosure {
  slopeAtClosurePpmS: number;
  fluxAtClosureUmolM2S: number;
}

export interface LinearFit extends ModelFit {
  interceptPpm: number;
}

export interface ExponentialFit extends ModelFit, AtClosure {
  p1: number;
  p2: number;
  /** s⁻¹; negative for a saturating closure. */
  p3: number;
  /** p3 · τmax, dimensionless. */
  p3TauMax: number;
  iterations: number;
}

export interface QuadraticFit extends ModelFit, AtClosure {
  b0: number;
  b1: number;
  b2: number;
}

export interface SelectedModel {
  model: ClosureModel;
  /** The slope basis the slope and flux below refer to. */
  basis: SlopeBasis;
  slopePpmS: number;
  fluxUmolM2S: number;
  reason: string;
}

export interface ClosureFitResult {
  linear: LinearFit | null;
  exponential: ExponentialFit | null;
  quadratic: QuadraticFit | null;
  exponentialRejectedReason: string | null;
  selected: SelectedModel | null;
  flags: QcFlag[];
  error: string | null;
  /** Fit window actually used. */
  window: { t0S: number; firstTS: number; lastTS: number; n: number } | null;
  /** Minimum detectable flux (precision / window length × flux factor). */
  minDetectableFluxUmolM2S: number | null;
  /** Analyzer precision behind the detection limit, ppm, and whether it is the 1 ppm default. */
  precisionPpm: number | null;
  precisionIsDefault: boolean;
  /** Flux per ppm s⁻¹ with p, T, χw of the first sample used. */
  fluxPerSlope: number | null;
}
