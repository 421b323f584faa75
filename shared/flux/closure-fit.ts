/**
 * One closure → linear, exponential and quadratic fits, the selected model, QC flags.
 * Models: ordinary least squares (REFERENCES.md §3a); exponential of Kutzbach et al. (2007)
 * Biogeosciences 4:1005–1025; quadratic of Wagner et al. (1997) Agron. J. 89:279–284.
 * Selection: the exponential when it exists, saturates (p3 < 0, for efflux and uptake alike)
 * and has the lower AIC; otherwise the line.
 */
import { fluxPerSlope } from './chamber-flux';
import type {
  ClosureFitResult,
  ClosureInput,
  ExponentialFit,
  LinearFit,
  QuadraticFit,
  SelectedModel,
} from './closure-input';
import { extractWindow, type ClosureWindow } from './closure-window';
import { minimumDetectableSlopePpmS } from './detection-limit';
import { EXP_U_MAX, EXP_U_MIN, fitExponentialRaw } from './exponential-fit';
import { fitStatistics, totalSumOfSquares } from './fit-statistics';
import { fitLinearRaw } from './linear-fit';
import { QC_THRESHOLDS as Q, orderFlags, type QcFlag } from './qc-flags';
import { fitQuadraticRaw } from './quadratic-fit';
import { hasSpike } from './spike-check';

interface Models {
  linear: LinearFit | null;
  exponential: ExponentialFit | null;
  quadratic: QuadraticFit | null;
  expFailure: string | null;
}

function invalid(error: string, flags: QcFlag[] = []): ClosureFitResult {
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
    fluxPerSlope: null,
  };
}

function fitModels(w: ClosureWindow, factor: number): Models {
  const { tau, chi, n, tauMax } = w;
  const tss = totalSumOfSquares(chi, n);
  let linear: LinearFit | null = null;
  const lin = n >= Q.minPointsLinear ? fitLinearRaw(tau, chi, n) : null;
  if (lin) {
    linear = { slopePpmS: lin.slope, fluxUmolM2S: lin.slope * factor, ...fitStatistics(lin.rss, tss, n, 2), interceptPpm: lin.intercept };
  }
  let quadratic: QuadraticFit | null = null;
  const quad = fitQuadraticRaw(tau, chi, n, tauMax);
  if (quad) {
    quadratic = { slopePpmS: quad.b1, fluxUmolM2S: quad.b1 * factor, ...fitStatistics(quad.rss, tss, n, 3), b0: quad.b0, b1: quad.b1, b2: quad.b2 };
  }
  if (n < Q.minPointsExponential) return { linear, exponential: null, quadratic, expFailure: 'fewer than 4 points' };
  // The quadratic's curvature gives the first guess: a + b·τ + b·p3·τ²/2 ⇒ p3·τmax ≈ 2·b2·τmax/b1.
  const uStart = quad && quad.b1 !== 0 ? (2 * quad.b2 * tauMax) / quad.b1 : 0;
  const exp = fitExponentialRaw(tau, chi, n, tauMax, uStart);
  if (!exp.ok) return { linear, exponential: null, quadratic, expFailure: exp.reason };
  const e = exp.fit;
  const p2 = e.slope / e.p3;
  const exponential: ExponentialFit = {
    slopePpmS: e.slope,
    fluxUmolM2S: e.slope * factor,
    ...fitStatistics(e.rss, tss, n, 3),
    p1: e.a - p2,
    p2,
    p3: e.p3,
    p3TauMax: e.u,
    iterations: e.iterations,
  };
  return { linear, exponential, quadratic, expFailure: null };
}

function select(m: Models, requested: ClosureInput['model']): { selected: SelectedModel | null; rejected: string | null; expUnusable: boolean } {
  const { linear, exponential, quadratic } = m;
  const pick = (model: SelectedModel['model'], fit: LinearFit | ExponentialFit | QuadraticFit, reason: string): SelectedModel => ({
    model,
    slopePpmS: fit.slopePpmS,
    fluxUmolM2S: fit.fluxUmolM2S,
    reason,
  });
  let rejected: string | null = null;
  let expUnusable = false;
  if (!exponential) {
    rejected = m.expFailure ?? 'no exponential fit';
    expUnusable = true;
  } else if (!(exponential.p3 < 0)) {
    rejected = 'not saturating (p3 ≥ 0)';
    expUnusable = true;
  } else if (!linear || !(exponential.aic < linear.aic)) {
    rejected = linear ? `AIC not lower than linear (${exponential.aic.toFixed(2)} vs ${linear.aic.toFixed(2)})` : 'no linear fit to compare with';
  }
  if (requested === 'linear') {
    return { selected: linear && pick('linear', linear, 'linear model requested'), rejected: rejected ?? 'linear model requested', expUnusable };
  }
  if (requested === 'quadratic' && quadratic) {
    return { selected: pick('quadratic', quadratic, 'quadratic model requested'), rejected: rejected ?? 'quadratic model requested', expUnusable };
  }
  if (requested === 'exponential' && exponential) {
    return { selected: pick('exponential', exponential, 'exponential model requested'), rejected: null, expUnusable };
  }
  if (!rejected && exponential) {
    const dAic = (linear as LinearFit).aic - exponential.aic;
    return { selected: pick('exponential', exponential, `exponential: saturating (p3 < 0) and AIC lower than linear by ${dAic.toFixed(2)}`), rejected: null, expUnusable };
  }
  const prefix = requested && requested !== 'auto' ? `${requested} model unavailable; ` : '';
  return { selected: linear && pick('linear', linear, `${prefix}linear: exponential ${rejected}`), rejected, expUnusable };
}

/** Fits one closure. Never throws for bad data: such input returns `invalid-input` and an error. */
export function fitClosure(input: ClosureInput): ClosureFitResult {
  const outcome = extractWindow(input);
  if (!outcome.ok) return invalid(outcome.error, input && input.pressureIsDefault ? ['default-pressure'] : []);
  const w = outcome.window;
  const factor = fluxPerSlope(w.pressureKpa, w.tempC, input.volumeCm3, input.areaCm2, w.waterMolFraction);
  const models = fitModels(w, factor);
  const { selected, rejected, expUnusable } = select(models, input.model);
  const precision = input.precisionPpm != null && input.precisionPpm > 0 ? input.precisionPpm : Q.defaultPrecisionPpm;
  const minSlope = minimumDetectableSlopePpmS(precision, w.tauMax);

  const flags: QcFlag[] = [];
  if (w.n < Q.minPointsExponential) flags.push('too-few-points');
  if (w.tauMax < Q.shortWindowS) flags.push('short-window');
  if (selected && Math.abs(selected.slopePpmS) < minSlope) flags.push('flat');
  if (selected && selected.fluxUmolM2S < 0) flags.push('negative-flux');
  if (hasSpike(w.tau, w.chi, w.n, precision, Q.spikeRobustSigmas, Q.spikePrecisionMultiple)) flags.push('spike');
  if (w.gapsDropped) flags.push('gaps-dropped');
  if (w.noWaterData) flags.push('no-water-data');
  if (expUnusable) flags.push('exp-rejected');
  const { linear, exponential } = models;
  if (exponential && linear && linear.slopePpmS !== 0 && exponential.slopePpmS / linear.slopePpmS > Q.expLinearRatioHigh) {
    flags.push('exp-linear-ratio-high');
  }
  const margin = input.ambientMarginPpm ?? Q.defaultAmbientMarginPpm;
  if (input.ambientPpm != null && Number.isFinite(input.ambientPpm) && w.chi[0] > input.ambientPpm + margin) {
    flags.push('start-above-ambient');
  }
  const selectedFit = selected ? models[selected.model] : null;
  if (selectedFit && selectedFit.r2 < Q.lowR2) flags.push('low-r2');
  if (input.offsetAfter) flags.push('offset-after');
  if (input.pressureIsDefault) flags.push('default-pressure');

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
    fluxPerSlope: factor,
  };
}

export { EXP_U_MIN, EXP_U_MAX };
