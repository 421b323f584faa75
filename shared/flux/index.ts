/** Public API of the flux engine (pure TypeScript: devices, server and batch CLI share it). */
export const engineVersion = '1.1.0';

export { fitClosure, invalidFit } from './closure-fit';
export {
  planClosureFit,
  withCollarArea,
  type ClosureFitPlan,
  type ClosureSeries,
  type FitContext,
  type FitSettings,
  type StoredProfileVersion,
} from './closure-fit-plan';
export { exclusionProblems, usablePointCount, type ExclusionProblem } from './point-exclusion';
export { fitLinearRaw, type LinearRaw } from './linear-fit';
export { DEFAULT_SLOPE_BASIS, SLOPE_BASES, type SlopeBasis } from './closure-input';
export type {
  AtClosure,
  ClosureFitResult,
  ClosureInput,
  ClosureModel,
  ExponentialFit,
  LinearFit,
  ModelFit,
  QuadraticFit,
  SelectedModel,
} from './closure-input';
export { aiccOf, SELECTION_MARGIN } from './model-selection';
export { QC_FLAGS, QC_THRESHOLDS, type QcFlag } from './qc-flags';
export { FLAG_ADVICE, flagAdvice, type FlagAction, type FlagAdvice } from './flag-advice';
export {
  AMBIENT_MAX_GAP_H,
  ambientForClosure,
  profileForClosure,
  type AmbientCheck,
  type AmbientChoice,
  type NamedProfileVersion,
  type ProfileChoice,
  type ProfileSource,
} from './chamber-system';
export {
  AIR_TEMP_SOURCES,
  DEFAULT_SITE_AIR_TEMP_C,
  chamberAirTemperature,
  type AirTempChoice,
  type AirTempSource,
} from './chamber-air-temperature';
export { chamberFluxUmolM2S, fluxPerSlope } from './chamber-flux';
export { dryMoleFractionPpm, waterMoleFraction } from './dry-mole-fraction';
export { minimumDetectableSlopePpmS } from './detection-limit';
export {
  chamberVolumeFor,
  roundCollarAreaCm2,
  meanOffsetCm,
  offsetSetFor,
  profileValidOn,
  type ChamberProfileVersion,
  type ChamberVolume,
  type ChamberVolumeOutcome,
  type OffsetSetRecord,
} from './chamber-volume';
export {
  fitLloydTaylor,
  fitQ10,
  lloydTaylorModel,
  q10Model,
  LLOYD_TAYLOR_E0_K,
  LLOYD_TAYLOR_T0_K,
  RESPONSE_LIMITS,
  type Estimate,
  type LloydTaylorFit,
  type Q10Fit,
  type Refusal,
} from './temperature-response';
export { polynomialVwc, toppVwc } from './soil-moisture';
export { pressureFromElevationKpa, geopotentialHeightM } from './standard-atmosphere';
export { convertFlux, FLUX_UNIT_LABELS, type FluxUnit } from './units';
export { GAS_CONSTANT_J_PER_MOL_K, TYPICAL_SETTLE_TIME_S, ZERO_CELSIUS_K } from './constants';
