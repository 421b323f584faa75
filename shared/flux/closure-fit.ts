/**
 * One closure → linear, exponential and quadratic fits, the selected model, QC flags.
 * Models: ordinary least squares (REFERENCES.md §3a); exponential of Kutzbach et al. (2007)
 * Biogeosciences 4:1005–1025; quadratic of Wagner et al. (1997) Agron. J. 89:279–284.
 * Selection (model-selection.ts): the exponential when it exists, saturates (p3 < 0, for efflux
 * and uptake alike) and beats the line by more than the AICc margin; otherwise the line.
 * Slope basis: curved models report their slope at t0 (start of the fit window) and at chamber
 * closure (t = 0); the selected flux takes the one the caller asks for, closure by default.
 */
import { fluxPerSlope } from './chamber-flux';
import {
  DEFAULT_SLOPE_BASIS,
  type ClosureFitResult,
  type ClosureInput,
  type ExponentialFit,
  type LinearFit,
  type QuadraticFit,
  type SelectedModel,
  type SlopeBasis,
} from './closure-input';
import { extractWindow, type ClosureWindow } from './closure-window';
import { minimumDetectableSlopePpmS } from './detection-limit';
import { EXP_U_MAX, EXP_U_MIN, fitExponentialRaw } from './exponential-fit';
import { fitStatistics, RSS_FLOOR_PER_POINT, totalSumOfSquares } from './fit-statistics';
import { fitLinearRaw } from './linear-fit';
import { QC_THRESHOLDS as Q, orderFlags, type QcFlag } from './qc-flags';
import { fitQuadraticRaw } from './quadratic-fit';
import { CONVEX_FLAG_MARGIN, effectiveSampleSize, exponentialAdvantage, lag1Autocorrelation, SELECTION_MARGIN } from './model-selection';
import { hasSpike } from './spike-check';

interface Models {
  linear: LinearFit | null;
  exponential: ExponentialFit | null;
  quadratic: QuadraticFit | null;
  expFailure: string | null;
  rssLinear: number;
  rssExponential: number;
  /** Lag-1 autocorrelation of the exponential fit's residuals (0 without a fit). */
  rho: number;
}

let residualBuf = new Float64Array(256);

/** The result of a closure that cannot be fitted (also used by callers that refuse before fitting). */
export function invalidFit(error: string, flags: QcFlag[] = []): ClosureFitResult {
  return {
    linear: null,
    exponential: null,
    quadratic: null,
    exponentialRejectedReason: 'invalid input',
    selected: null,
    flags: orderFlags(['invalid-input', ...flags]),
    error,
    window: null,
    minDetectableFluxUmolM2S: null,
    precisionPpm: null,
    precisionIsDefault: false,
    fluxPerSlope: null,
  };
}

function fitModels(w: ClosureWindow, factor: number): Models {
  const { tau, chi, n, tauMax, t0S } = w;
  const tss = totalSumOfSquares(chi, n);
  const base = { rssLinear: NaN, rssExponential: NaN, rho: 0 };
  let linear: LinearFit | null = null;
  const lin = n >= Q.minPointsLinear ? fitLinearRaw(tau, chi, n) : null;
  if (lin) {
    linear = { slopePpmS: lin.slope, fluxUmolM2S: lin.slope * factor, ...fitStatistics(lin.rss, tss, n, 2), interceptPpm: lin.intercept };
    base.rssLinear = lin.rss;
  }
  let quadratic: QuadraticFit | null = null;
  const quad = fitQuadraticRaw(tau, chi, n, tauMax);
  if (quad) {
    // dχ/dt = b1 + 2·b2·τ; closure is τ = −t0.
    const atClosure = quad.b1 - 2 * quad.b2 * t0S;
    quadratic = {
      slopePpmS: quad.b1,
      fluxUmolM2S: quad.b1 * factor,
      ...fitStatistics(quad.rss, tss, n, 3),
      slopeAtClosurePpmS: atClosure,
      fluxAtClosureUmolM2S: atClosure * factor,
      b0: quad.b0,
      b1: quad.b1,
      b2: quad.b2,
    };
  }
  if (n < Q.minPointsExponential) return { linear, exponential: null, quadratic, expFailure: 'fewer than 4 points', ...base };
  // The quadratic's curvature gives the first guess: a + b·τ + b·p3·τ²/2 ⇒ p3·τmax ≈ 2·b2·τmax/b1.
  const uStart = quad && quad.b1 !== 0 ? (2 * quad.b2 * tauMax) / quad.b1 : 0;
  const exp = fitExponentialRaw(tau, chi, n, tauMax, uStart);
  if (!exp.ok) return { linear, exponential: null, quadratic, expFailure: exp.reason, ...base };
  const e = exp.fit;
  const p2 = e.slope / e.p3;
  // dχ/dt = p2·p3·exp(p3·τ); closure is τ = −t0.
  const atClosure = e.slope * Math.exp(-e.p3 * t0S);
  const exponential: ExponentialFit = {
    slopePpmS: e.slope,
    fluxUmolM2S: e.slope * factor,
    ...fitStatistics(e.rss, tss, n, 3),
    slopeAtClosurePpmS: atClosure,
    fluxAtClosureUmolM2S: atClosure * factor,
    p1: e.a - p2,
    p2,
    p3: e.p3,
    p3TauMax: e.u,
    iterations: e.iterations,
  };
  if (residualBuf.length < n) residualBuf = new Float64Array(n * 2);
  for (let i = 0; i < n; i++) {
    const x = e.p3 * tau[i];
    residualBuf[i] = chi[i] - e.a - e.slope * (x === 0 ? tau[i] : Math.expm1(x) / e.p3);
  }
  // Residuals at the RSS floor are rounding, whose autocorrelation says nothing about the noise.
  const rho = e.rss > RSS_FLOOR_PER_POINT * n ? lag1Autocorrelation(residualBuf, n) : 0;
  return { linear, exponential, quadratic, expFailure: null, rssLinear: base.rssLinear, rssExponential: e.rss, rho };
}

/** Slope and flux of a fit on the requested basis (a line has the same slope everywhere). */
function onBasis(fit: LinearFit | ExponentialFit | QuadraticFit, basis: SlopeBasis): { slopePpmS: number; fluxUmolM2S: number } {
  if (basis === 'closure' && 'slopeAtClosurePpmS' in fit)
    return { slopePpmS: fit.slopeAtClosurePpmS, fluxUmolM2S: fit.fluxAtClosureUmolM2S };
  return { slopePpmS: fit.slopePpmS, fluxUmolM2S: fit.fluxUmolM2S };
}

interface Selection {
  selected: SelectedModel | null;
  rejected: string | null;
  /** The exponential failed, or is significantly convex: worth a look (exp-rejected). */
  expSuspect: boolean;
  /** The exponential is the one an automatic choice takes. */
  expChosen: boolean;
}

function select(m: Models, requested: ClosureInput['model'], basis: SlopeBasis): Selection {
  const { linear, exponential, quadratic } = m;
  const pick = (model: SelectedModel['model'], fit: LinearFit | ExponentialFit | QuadraticFit, reason: string): SelectedModel => ({
    model,
    basis,
    ...onBasis(fit, basis),
    reason,
  });
  const advantage = exponential && linear ? exponentialAdvantage(m.rssLinear, m.rssExponential, effectiveSampleSize(linear.n, m.rho)) : NaN;
  const significant = advantage > SELECTION_MARGIN;
  let rejected: string | null = null;
  let expSuspect = false;
  if (!exponential) {
    rejected = m.expFailure ?? 'no exponential fit';
    expSuspect = true;
  } else if (!(exponential.p3 < 0)) {
    rejected = 'not saturating (p3 ≥ 0)';
    expSuspect = advantage > CONVEX_FLAG_MARGIN; // a convex rise the data clearly support is not noise
  } else if (!linear) {
    rejected = 'no linear fit to compare with';
  } else if (!significant) {
    rejected = `AICc advantage ${advantage.toFixed(2)} not above the margin ${SELECTION_MARGIN}`;
  }
  const expChosen = rejected === null;
  if (requested === 'linear') {
    return {
      selected: linear && pick('linear', linear, 'linear model requested'),
      rejected: rejected ?? 'linear model requested',
      expSuspect,
      expChosen,
    };
  }
  if (requested === 'quadratic' && quadratic) {
    return {
      selected: pick('quadratic', quadratic, 'quadratic model requested'),
      rejected: rejected ?? 'quadratic model requested',
      expSuspect,
      expChosen,
    };
  }
  if (requested === 'exponential' && exponential) {
    return { selected: pick('exponential', exponential, 'exponential model requested'), rejected: null, expSuspect, expChosen: true };
  }
  if (expChosen && exponential) {
    return {
      selected: pick(
        'exponential',
        exponential,
        `exponential: saturating (p3 < 0) and AICc lower than linear by ${advantage.toFixed(2)} (margin ${SELECTION_MARGIN})`,
      ),
      rejected: null,
      expSuspect,
      expChosen,
    };
  }
  const prefix = requested && requested !== 'auto' ? `${requested} model unavailable; ` : '';
  return { selected: linear && pick('linear', linear, `${prefix}linear: exponential ${rejected}`), rejected, expSuspect, expChosen: false };
}

/** Fits one closure. Never throws for bad data: such input returns `invalid-input` and an error. */
export function fitClosure(input: ClosureInput): ClosureFitResult {
  const outcome = extractWindow(input);
  if (!outcome.ok) return invalidFit(outcome.error, input && input.pressureIsDefault ? ['default-pressure'] : []);
  const w = outcome.window;
  const factor = fluxPerSlope(w.pressureKpa, w.tempC, input.volumeCm3, input.areaCm2, w.waterMolFraction);
  const models = fitModels(w, factor);
  const { selected, rejected, expSuspect, expChosen } = select(models, input.model, input.slopeAt ?? DEFAULT_SLOPE_BASIS);
  const precisionIsDefault = !(input.precisionPpm != null && input.precisionPpm > 0);
  const precision = precisionIsDefault ? Q.defaultPrecisionPpm : (input.precisionPpm as number);
  const minSlope = minimumDetectableSlopePpmS(precision, w.tauMax);
  const { linear, exponential } = models;
  const flatClosure = !!linear && Math.abs(linear.slopePpmS) < minSlope;

  const flags: QcFlag[] = [];
  if (w.n < Q.minPointsExponential) flags.push('too-few-points');
  if (w.tauMax < Q.shortWindowS) flags.push('short-window');
  if (selected && Math.abs(selected.slopePpmS) < minSlope) flags.push('flat');
  if (selected && selected.fluxUmolM2S < 0) flags.push('negative-flux');
  if (hasSpike(w.tau, w.chi, w.n, precision, Q.spikeRobustSigmas, Q.spikePrecisionMultiple)) flags.push('spike');
  if (w.gapsDropped) flags.push('gaps-dropped');
  if (w.noWaterData) flags.push('no-water-data');
  // On a closure below the detection limit the exponential's shape is noise: no flag for it.
  if (expSuspect && !flatClosure) flags.push('exp-rejected');
  // Both slopes at t0, fitted to the same window: the ratio depends on the curvature only.
  if (expChosen && exponential && linear && linear.slopePpmS !== 0 && exponential.slopePpmS / linear.slopePpmS > Q.expLinearRatioHigh) {
    flags.push('exp-linear-ratio-high');
  }
  const margin = input.ambientMarginPpm ?? Q.defaultAmbientMarginPpm;
  if (input.ambientPpm != null && Number.isFinite(input.ambientPpm) && w.chi[0] > input.ambientPpm + margin) {
    flags.push('start-above-ambient');
  }
  const selectedFit = selected ? models[selected.model] : null;
  if (selectedFit && selectedFit.r2 < Q.lowR2) flags.push('low-r2');
  if (input.offsetAfter) flags.push('offset-after');
  const footprint = input.footprintAreaCm2;
  if (typeof footprint === 'number' && footprint > 0 && Math.abs(footprint / input.areaCm2 - 1) > Q.areaMismatchRelative) {
    flags.push('footprint-area-differs');
  }
  if (input.pressureIsDefault) flags.push('default-pressure');
  if (input.tempSource === 'visit') flags.push('temp-from-visit');
  if (input.tempSource === 'site-default') flags.push('temp-site-default');

  return {
    linear,
    exponential,
    quadratic: models.quadratic,
    exponentialRejectedReason: rejected,
    selected,
    flags: orderFlags(flags),
    error: null,
    window: { t0S: w.t0S, firstTS: w.t0S + w.tau[0], lastTS: w.t0S + w.tauMax, n: w.n },
    minDetectableFluxUmolM2S: minSlope * factor,
    precisionPpm: precision,
    precisionIsDefault,
    fluxPerSlope: factor,
  };
}

export { EXP_U_MIN, EXP_U_MAX };
