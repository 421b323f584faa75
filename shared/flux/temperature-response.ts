/**
 * Temperature response of soil respiration, fitted by non-linear least squares on the fluxes:
 *  - Q10 (van 't Hoff form): R(T) = R10 · Q10^((T − 10)/10); see Davidson, Janssens & Luo (2006)
 *    Global Change Biol. 12:154–164 for its limits.
 *  - Lloyd, J., Taylor, J.A. (1994) Functional Ecology 8:315–323, their Eq. 11:
 *    R(T) = R10 · exp[E0 · (1/(Tref − T0) − 1/(T − T0))], T in K, Tref = 283.15 K,
 *    T0 = 227.13 K fixed, R10 and E0 fitted; the published E0 = 308.56 K is shown beside it.
 * 95 % confidence intervals: estimate ± t(0.975, n − 2)·SE; for Q10 the interval of ln Q10 is
 * transformed, so it stays positive. Refusal and warning thresholds are common practice.
 */
import { ZERO_CELSIUS_K } from './constants';
import { fitScaledExponential } from './scaled-exponential-fit';
import { studentTQuantile } from './student-t';

export const LLOYD_TAYLOR_T0_K = 227.13;
export const LLOYD_TAYLOR_E0_K = 308.56;
export const REFERENCE_TEMP_C = 10;
const TREF_K = REFERENCE_TEMP_C + ZERO_CELSIUS_K;

export const RESPONSE_LIMITS = {
  minPoints: 5,
  minSpanC: 5,
  warnPoints: 20,
  warnSpanC: 10,
  q10Low: 1,
  q10High: 5,
} as const;

export interface Estimate {
  value: number;
  ciLow: number;
  ciHigh: number;
  se: number;
}

interface FitBase {
  ok: true;
  n: number;
  tempSpanC: number;
  rmse: number;
  r10: Estimate;
  warnings: string[];
}

export interface Q10Fit extends FitBase {
  q10: Estimate;
}

export interface LloydTaylorFit extends FitBase {
  e0K: Estimate;
  t0K: number;
  publishedE0K: number;
  /** R10 fitted with E0 fixed at the published 308.56 K, for comparison. */
  r10AtPublishedE0: number;
}

export type Refusal = { ok: false; reason: string };

export function q10Model(tempC: number, r10: number, q10: number): number {
  return r10 * Math.pow(q10, (tempC - REFERENCE_TEMP_C) / 10);
}

export function lloydTaylorModel(tempC: number, r10: number, e0K = LLOYD_TAYLOR_E0_K): number {
  return r10 * Math.exp(e0K * lloydTaylorZ(tempC));
}

function lloydTaylorZ(tempC: number): number {
  return 1 / (TREF_K - LLOYD_TAYLOR_T0_K) - 1 / (tempC + ZERO_CELSIUS_K - LLOYD_TAYLOR_T0_K);
}

interface Prepared {
  t: number[];
  y: number[];
  span: number;
  warnings: string[];
}

function prepare(tempC: readonly number[], flux: readonly number[]): Prepared | Refusal {
  const t: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < Math.min(tempC.length, flux.length); i++) {
    if (Number.isFinite(tempC[i]) && Number.isFinite(flux[i])) {
      t.push(tempC[i]);
      y.push(flux[i]);
    }
  }
  const span = t.length ? Math.max(...t) - Math.min(...t) : 0;
  if (t.length < RESPONSE_LIMITS.minPoints) return { ok: false, reason: `fewer than ${RESPONSE_LIMITS.minPoints} points (${t.length})` };
  if (span < RESPONSE_LIMITS.minSpanC)
    return { ok: false, reason: `temperature span ${span.toFixed(1)} °C is below ${RESPONSE_LIMITS.minSpanC} °C` };
  const warnings: string[] = [];
  if (t.length < RESPONSE_LIMITS.warnPoints) warnings.push(`only ${t.length} visit means (fewer than ${RESPONSE_LIMITS.warnPoints})`);
  if (span < RESPONSE_LIMITS.warnSpanC) warnings.push(`temperature span ${span.toFixed(1)} °C is below ${RESPONSE_LIMITS.warnSpanC} °C`);
  return { t, y, span, warnings };
}

function estimate(value: number, se: number, tq: number): Estimate {
  return { value, se, ciLow: value - tq * se, ciHigh: value + tq * se };
}

export function fitQ10(tempC: readonly number[], flux: readonly number[]): Q10Fit | Refusal {
  const p = prepare(tempC, flux);
  if ('ok' in p) return p;
  const fit = fitScaledExponential(
    p.t.map((t) => t - REFERENCE_TEMP_C),
    p.y,
  );
  if (!fit) return { ok: false, reason: 'the fit did not converge' };
  const tq = studentTQuantile(0.975, fit.n - 2);
  const q10 = Math.exp(10 * fit.theta);
  const warnings = [...p.warnings];
  if (q10 < RESPONSE_LIMITS.q10Low || q10 > RESPONSE_LIMITS.q10High) warnings.push(`Q10 = ${q10.toFixed(2)} is outside 1–5`);
  return {
    ok: true,
    n: fit.n,
    tempSpanC: p.span,
    rmse: Math.sqrt(fit.rss / fit.n),
    r10: estimate(fit.c, fit.seC, tq),
    q10: {
      value: q10,
      se: 10 * q10 * fit.seTheta, // delta method, for reference; the interval is on ln Q10
      ciLow: Math.exp(10 * (fit.theta - tq * fit.seTheta)),
      ciHigh: Math.exp(10 * (fit.theta + tq * fit.seTheta)),
    },
    warnings,
  };
}

export function fitLloydTaylor(tempC: readonly number[], flux: readonly number[]): LloydTaylorFit | Refusal {
  const p = prepare(tempC, flux);
  if ('ok' in p) return p;
  if (p.t.some((t) => t + ZERO_CELSIUS_K <= LLOYD_TAYLOR_T0_K + 1)) return { ok: false, reason: 'temperature at or below T0 = 227.13 K' };
  const z = p.t.map(lloydTaylorZ);
  const fit = fitScaledExponential(z, p.y);
  if (!fit) return { ok: false, reason: 'the fit did not converge' };
  const tq = studentTQuantile(0.975, fit.n - 2);
  let num = 0;
  let den = 0;
  for (let i = 0; i < z.length; i++) {
    const e = Math.exp(LLOYD_TAYLOR_E0_K * z[i]);
    num += e * p.y[i];
    den += e * e;
  }
  return {
    ok: true,
    n: fit.n,
    tempSpanC: p.span,
    rmse: Math.sqrt(fit.rss / fit.n),
    r10: estimate(fit.c, fit.seC, tq),
    e0K: estimate(fit.theta, fit.seTheta, tq),
    t0K: LLOYD_TAYLOR_T0_K,
    publishedE0K: LLOYD_TAYLOR_E0_K,
    r10AtPublishedE0: num / den,
    warnings: p.warnings,
  };
}
