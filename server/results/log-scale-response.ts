/**
 * Temperature responses fitted on the log scale: respiration noise is multiplicative (its spread
 * grows with the flux; e.g. Richardson et al. 2006, Agric. For. Meteorol. 136:1–18 — citation from
 * memory), so ln R = ln R10 + x·β is fitted by ordinary least squares with
 *  - Q10 form: x = (T − 10)/10, β = ln Q10;
 *  - Lloyd & Taylor (1994) Eq. 11: x = 1/(Tref − T0) − 1/(T − T0), β = E0.
 * x is read from the engine's own model functions (ln of the model at R10 = 1 and unit exponent),
 * so no formula is repeated here. The fit describes the median (geometric-mean) curve; intervals are
 * β ± t(0.975, n − 2)·SE, back-transformed for R10 and Q10. Non-positive fluxes have no logarithm:
 * they are left out and counted, since leaving them out lifts the curve.
 */
import {
  LLOYD_TAYLOR_T0_K,
  lloydTaylorModel,
  q10Model,
  RESPONSE_LIMITS,
  ZERO_CELSIUS_K,
  type Estimate,
  type Refusal,
} from '../../shared/flux';
import { studentTQuantile } from '../../shared/flux/student-t';

export interface LogScaleFit {
  ok: true;
  n: number;
  nLeftOut: number;
  tempSpanC: number;
  rmseLog: number;
  r10: Estimate;
  q10: Estimate | null;
  e0K: Estimate | null;
  warnings: string[];
}

interface Line {
  a: number;
  b: number;
  seA: number;
  seB: number;
  rss: number;
  n: number;
}

/** Simple linear regression y = a + b·x with the usual standard errors (n − 2 degrees of freedom). */
export function olsLine(x: readonly number[], y: readonly number[]): Line {
  const n = x.length;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  const b = sxy / sxx;
  const a = my - b * mx;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (y[i] - a - b * x[i]) ** 2;
  const s2 = rss / (n - 2);
  return { a, b, seB: Math.sqrt(s2 / sxx), seA: Math.sqrt(s2 * (1 / n + (mx * mx) / sxx)), rss, n };
}

const expEstimate = (v: number, se: number, tq: number): Estimate => ({
  value: Math.exp(v),
  se: Math.exp(v) * se,
  ciLow: Math.exp(v - tq * se),
  ciHigh: Math.exp(v + tq * se),
});

export function fitLogScale(model: 'q10' | 'lloyd-taylor', tempC: readonly number[], flux: readonly number[]): LogScaleFit | Refusal {
  const t: number[] = [];
  const ly: number[] = [];
  let leftOut = 0;
  for (let i = 0; i < tempC.length; i++) {
    if (!Number.isFinite(tempC[i]) || !Number.isFinite(flux[i])) continue;
    if (flux[i] > 0) {
      t.push(tempC[i]);
      ly.push(Math.log(flux[i]));
    } else leftOut++;
  }
  const span = t.length ? Math.max(...t) - Math.min(...t) : 0;
  if (t.length < RESPONSE_LIMITS.minPoints)
    return { ok: false, reason: `fewer than ${RESPONSE_LIMITS.minPoints} points with a positive flux (${t.length})` };
  if (span < RESPONSE_LIMITS.minSpanC)
    return { ok: false, reason: `temperature span ${span.toFixed(1)} °C is below ${RESPONSE_LIMITS.minSpanC} °C` };
  if (model === 'lloyd-taylor' && t.some((tc) => tc + ZERO_CELSIUS_K <= LLOYD_TAYLOR_T0_K + 1)) {
    return { ok: false, reason: 'temperature at or below T0 = 227.13 K' };
  }
  const x = t.map((tc) => Math.log(model === 'q10' ? q10Model(tc, 1, Math.E) : lloydTaylorModel(tc, 1, 1)));
  const line = olsLine(x, ly);
  const tq = studentTQuantile(0.975, line.n - 2);
  const warnings: string[] = [];
  if (leftOut) warnings.push(`${leftOut} non-positive fluxes left out of the log-scale fit (the curve is lifted)`);
  return {
    ok: true,
    n: line.n,
    nLeftOut: leftOut,
    tempSpanC: span,
    rmseLog: Math.sqrt(line.rss / line.n),
    r10: expEstimate(line.a, line.seA, tq),
    q10: model === 'q10' ? expEstimate(line.b, line.seB, tq) : null,
    e0K: model === 'lloyd-taylor' ? { value: line.b, se: line.seB, ciLow: line.b - tq * line.seB, ciHigh: line.b + tq * line.seB } : null,
    warnings,
  };
}
