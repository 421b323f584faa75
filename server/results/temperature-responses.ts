/**
 * Temperature response per treatment cell, fitted by the flux engine (the Q10 form and Lloyd & Taylor
 * 1994, Funct. Ecol. 8:315–323, T0 = 227.13 K fixed) — no formula is repeated here — on the
 * experimental unit: the mean of a plot's visits in one campaign round (collars of a plot and repeated
 * visits of one collar are not independent replicates; Hurlbert 1984, Ecol. Monogr. 54:187–211 —
 * citation from memory). Degrees of freedom and warnings therefore count units, and the number of
 * plots behind them is warned about too. Both models are also fitted on the log scale
 * (log-scale-response.ts). E0 outside 30–450 K is warned about (the range Reichstein et al. 2005,
 * Global Change Biol. 11:1424–1439, accept for their fits — from memory). Points keep their moisture
 * so the chart can colour them: warm months are often the dry ones, and the fitted sensitivity then
 * mixes both drivers (Davidson, Janssens & Luo 2006, Global Change Biol. 12:154–164).
 */
import {
  fitLloydTaylor,
  fitQ10,
  lloydTaylorModel,
  q10Model,
  RESPONSE_LIMITS,
  type LloydTaylorFit,
  type Q10Fit,
  type Refusal,
} from '../../shared/flux';
import type { Cell, VisitMean } from './design-aggregation';
import { fitLogScale, type LogScaleFit } from './log-scale-response';
import type { ResponseCurve } from './seasonal-totals';
import { mean, meanOrNull } from './stats';

export type ResponseModelName = 'lloyd-taylor' | 'q10' | 'lloyd-taylor-log' | 'q10-log';
export const RESPONSE_MODELS: readonly ResponseModelName[] = ['lloyd-taylor', 'q10', 'lloyd-taylor-log', 'q10-log'];

/** One experimental unit: a plot's visits (all its collars in the cell) in one campaign round. */
export interface ResponsePoint {
  plotId: string;
  campaignId: string;
  round: number;
  nVisits: number;
  tempC: number;
  fluxUmolM2S: number;
  vwcPct: number | null;
}

export interface CellResponse {
  cellKey: string;
  label: string;
  nPlots: number;
  points: ResponsePoint[];
  q10: Q10Fit | Refusal;
  lloydTaylor: LloydTaylorFit | Refusal;
  q10Log: LogScaleFit | Refusal;
  lloydTaylorLog: LogScaleFit | Refusal;
  /** Curves sampled over the observed temperature span, for drawing. */
  curve: { tempC: number; q10: number | null; lloydTaylor: number | null; q10Log: number | null; lloydTaylorLog: number | null }[];
}

const CURVE_POINTS = 41;
/** Lloyd & Taylor E0 outside this range is implausible (Reichstein et al. 2005 — from memory). */
export const E0_PLAUSIBLE_K = { low: 30, high: 450 } as const;
/** Fewer plots than this leave a response resting on too few independent units (common practice). */
export const MIN_PLOTS_FOR_RESPONSE = 3;

/** Means of visits per plot × campaign × round (only visits with a soil temperature). */
export function responseUnits(cellKey: string, visitMeans: readonly VisitMean[]): ResponsePoint[] {
  const groups = new Map<string, VisitMean[]>();
  for (const v of visitMeans) {
    if (v.cellKey !== cellKey || v.soilTempC === null) continue;
    const k = `${v.plotId}|${v.campaignId}|${v.round}`;
    groups.set(k, [...(groups.get(k) ?? []), v]);
  }
  return [...groups.values()].map((vs) => ({
    plotId: vs[0].plotId,
    campaignId: vs[0].campaignId,
    round: vs[0].round,
    nVisits: vs.length,
    tempC: mean(vs.map((v) => v.soilTempC!)),
    fluxUmolM2S: mean(vs.map((v) => v.fluxUmolM2S)),
    vwcPct: meanOrNull(vs.map((v) => v.vwcPct)),
  }));
}

/** Warnings restated on independent units: the engine counts its points, which here are plot-round means. */
function unitWarnings(warnings: readonly string[], n: number, nPlots: number): string[] {
  const out = warnings.filter((w) => !/^only \d+ /.test(w));
  if (n < RESPONSE_LIMITS.warnPoints) out.unshift(`only ${n} plot-round means (fewer than ${RESPONSE_LIMITS.warnPoints})`);
  if (nPlots < MIN_PLOTS_FOR_RESPONSE) out.unshift(`only ${nPlots} plots (independent units; fewer than ${MIN_PLOTS_FOR_RESPONSE})`);
  return out;
}

function e0Warning(e0: number | undefined): string[] {
  return e0 !== undefined && (e0 < E0_PLAUSIBLE_K.low || e0 > E0_PLAUSIBLE_K.high)
    ? [`E0 = ${e0.toFixed(0)} K is outside ${E0_PLAUSIBLE_K.low}–${E0_PLAUSIBLE_K.high} K (Reichstein et al. 2005)`]
    : [];
}

export function fitResponses(cells: readonly Cell[], visitMeans: readonly VisitMean[]): CellResponse[] {
  return cells.map((cell) => {
    const points = responseUnits(cell.key, visitMeans);
    const nPlots = new Set(points.map((p) => p.plotId)).size;
    const t = points.map((p) => p.tempC);
    const y = points.map((p) => p.fluxUmolM2S);
    const q10e = fitQ10(t, y);
    const lte = fitLloydTaylor(t, y);
    const q10: Q10Fit | Refusal = q10e.ok ? { ...q10e, warnings: unitWarnings(q10e.warnings, q10e.n, nPlots) } : q10e;
    const lloydTaylor: LloydTaylorFit | Refusal = lte.ok
      ? { ...lte, warnings: [...unitWarnings(lte.warnings, lte.n, nPlots), ...e0Warning(lte.e0K.value)] }
      : lte;
    const q10l = fitLogScale('q10', t, y);
    const ltl = fitLogScale('lloyd-taylor', t, y);
    const q10Log: LogScaleFit | Refusal = q10l.ok ? { ...q10l, warnings: unitWarnings(q10l.warnings, q10l.n, nPlots) } : q10l;
    const lloydTaylorLog: LogScaleFit | Refusal = ltl.ok
      ? { ...ltl, warnings: [...unitWarnings(ltl.warnings, ltl.n, nPlots), ...e0Warning(ltl.e0K?.value)] }
      : ltl;
    const r: CellResponse = { cellKey: cell.key, label: cell.label, nPlots, points, q10, lloydTaylor, q10Log, lloydTaylorLog, curve: [] };
    if (points.length) {
      const lo = Math.min(...t);
      const hi = Math.max(...t);
      const fns = RESPONSE_MODELS.map((m) => responseFunction(r, m));
      for (let i = 0; i < CURVE_POINTS; i++) {
        const tc = lo + ((hi - lo) * i) / (CURVE_POINTS - 1);
        const [lt, q, ltLog, qLog] = fns.map((f) => (f ? f(tc) : null));
        r.curve.push({ tempC: tc, q10: q, lloydTaylor: lt, q10Log: qLog, lloydTaylorLog: ltLog });
      }
    }
    return r;
  });
}

/** The fitted response of one cell as a function of temperature (°C → µmol m⁻² s⁻¹), or null when it was refused. */
export function responseFunction(r: CellResponse, model: ResponseModelName): ((tempC: number) => number) | null {
  switch (model) {
    case 'q10': {
      const f = r.q10;
      return f.ok ? (tc) => q10Model(tc, f.r10.value, f.q10.value) : null;
    }
    case 'lloyd-taylor': {
      const f = r.lloydTaylor;
      return f.ok ? (tc) => lloydTaylorModel(tc, f.r10.value, f.e0K.value) : null;
    }
    case 'q10-log': {
      const f = r.q10Log;
      return f.ok ? (tc) => q10Model(tc, f.r10.value, f.q10!.value) : null;
    }
    case 'lloyd-taylor-log': {
      const f = r.lloydTaylorLog;
      return f.ok ? (tc) => lloydTaylorModel(tc, f.r10.value, f.e0K!.value) : null;
    }
  }
}

/** The response with the temperature range of the points it was fitted on (outside it the curve is not used). */
export function responseCurve(r: CellResponse, model: ResponseModelName): ResponseCurve | null {
  const f = responseFunction(r, model);
  if (!f || !r.points.length) return null;
  const t = r.points.map((p) => p.tempC);
  return { f, minTempC: Math.min(...t), maxTempC: Math.max(...t) };
}
