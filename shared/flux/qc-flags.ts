/**
 * The one documented list of quality-control flags of a closure. Names are our own, kebab-case.
 * Flags inform review; only `invalid-input` means there is no result. None of them changes a
 * flux value (negative fluxes are never zeroed, low R² is never a filter on its own).
 */
export const QC_FLAGS = {
  'invalid-input':
    'The closure cannot be fitted: unequal array lengths, missing settle time, pressure, temperature, volume or area, or no usable points. See `error`.',
  'too-few-points': 'Fewer than 4 usable samples after the settle time: no exponential fit (a line needs 3).',
  'short-window': 'Less than 60 s of data after the settle time (common practice: too short for a stable slope).',
  flat: 'The CO2 change over the window is below the analyzer precision, i.e. |slope| < precision / window length: the flux is below the minimum detectable flux (closed form of Christiansen et al. 2015, Agric. For. Meteorol. 211–212:48, after Parkin et al. 2012, J. Environ. Qual. 41:705–715).',
  'negative-flux': 'The selected flux is negative (uptake): review it; the value is kept as is.',
  spike:
    'At least one sample lies off the line through its two neighbours by more than max(8 robust SDs of that deviation ≈ 9.8 σ of white analyzer noise, 5 × precision).',
  'gaps-dropped': 'Samples after the settle time with missing or non-numeric values were dropped.',
  'no-water-data': 'No water-vapour data: CO2 was fitted as reported (no dilution correction) and χw = 0 in the flux.',
  'exp-rejected':
    'The exponential model could not be fitted (too few points, no convergence, optimum of p3·τmax not inside (−40, 10)) on a closure above the detection limit, or the closure rises convexly (p3 > 0) by more than the AICc margin. A straight closure whose noise gives p3 ≥ 0 is not flagged. See `exponentialRejectedReason`.',
  'exp-linear-ratio-high':
    'The exponential was chosen and its slope at the start of the fit window is more than 4 × the linear slope on the same window (|p3·τmax| ≳ 3.4: the window spans over three time constants, so almost all of the initial rise happened before most samples; rule of thumb: a leak or a disturbance at closure). A noise-free p3 = −0.01 s⁻¹ closure of 130 s has 1.8, p3 = −0.02 s⁻¹ has 3.1.',
  'footprint-area-differs':
    'The chamber profile’s footprint area differs from the collar’s own inside area by more than 0.5 %: the flux uses the collar’s area; check which is right.',
  'start-above-ambient':
    'First CO2 value more than the ambient margin (default 100 ppm) above ambient (common practice: breath near the inlet or a chamber not aired between closures).',
  'low-r2': 'R² of the selected model below 0.9 (common-practice threshold). Information only: near-zero fluxes have low R² and are valid.',
  'offset-after': 'No offset set on or before the closure day: the earliest later offset set was used for the volume.',
  'default-pressure': 'Pressure was not measured: a default from site elevation (US Standard Atmosphere 1976) was used.',
  'temp-from-visit':
    'The analyzer file has no chamber air temperature: the air temperature noted at the visit was used (chamber-air-temperature.ts).',
  'temp-site-default':
    'Neither the analyzer file nor the visit has an air temperature: the site’s default (15 °C unless the site states another) was used; 10 °C off moves the flux by about 3.5 %.',
} as const;

export type QcFlag = keyof typeof QC_FLAGS;

const ORDER = Object.keys(QC_FLAGS) as QcFlag[];

/** Returns the flags in the documented order, without duplicates, so outputs are stable. */
export function orderFlags(flags: Iterable<QcFlag>): QcFlag[] {
  const set = new Set(flags);
  return ORDER.filter((f) => set.has(f));
}

/** Thresholds that go with the flags (common practice or rules of thumb, as documented above). */
export const QC_THRESHOLDS = {
  minPointsExponential: 4,
  minPointsLinear: 3,
  shortWindowS: 60,
  expLinearRatioHigh: 4,
  /** Relative difference between footprint and collar area that raises footprint-area-differs. */
  areaMismatchRelative: 0.005,
  lowR2: 0.9,
  defaultAmbientMarginPpm: 100,
  defaultPrecisionPpm: 1,
  spikeRobustSigmas: 8,
  spikePrecisionMultiple: 5,
} as const;
