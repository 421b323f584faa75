/**
 * Temperature response per treatment cell, fitted by the flux engine on visit means (the Q10 form
 * and Lloyd & Taylor 1994, Funct. Ecol. 8:315–323, T0 = 227.13 K fixed) — no formula is repeated
 * here. Points keep their moisture so the chart can colour them: warm months are often the dry
 * ones, and the fitted sensitivity then mixes both drivers (Davidson, Janssens & Luo 2006,
 * Global Change Biol. 12:154–164).
 */
import { fitLloydTaylor, fitQ10, lloydTaylorModel, q10Model, type LloydTaylorFit, type Q10Fit, type Refusal } from '../../shared/flux';
import type { Cell, VisitMean } from './design-aggregation';

export type ResponseModelName = 'lloyd-taylor' | 'q10';

export interface ResponsePoint { visitId: string; plotId: string; campaignId: string; tempC: number; fluxUmolM2S: number; vwcPct: number | null }

export interface CellResponse {
  cellKey: string;
  label: string;
  points: ResponsePoint[];
  q10: Q10Fit | Refusal;
  lloydTaylor: LloydTaylorFit | Refusal;
  /** Both curves sampled over the observed temperature span, for drawing. */
  curve: { tempC: number; q10: number | null; lloydTaylor: number | null }[];
}

const CURVE_POINTS = 41;

export function fitResponses(cells: readonly Cell[], visitMeans: readonly VisitMean[]): CellResponse[] {
  return cells.map((cell) => {
    const points: ResponsePoint[] = visitMeans
      .filter((v) => v.cellKey === cell.key && v.soilTempC !== null)
      .map((v) => ({ visitId: v.visitId, plotId: v.plotId, campaignId: v.campaignId, tempC: v.soilTempC!, fluxUmolM2S: v.fluxUmolM2S, vwcPct: v.vwcPct }));
    const t = points.map((p) => p.tempC);
    const y = points.map((p) => p.fluxUmolM2S);
    const q10 = fitQ10(t, y);
    const lloydTaylor = fitLloydTaylor(t, y);
    const curve: CellResponse['curve'] = [];
    if (points.length) {
      const lo = Math.min(...t);
      const hi = Math.max(...t);
      for (let i = 0; i < CURVE_POINTS; i++) {
        const tc = lo + ((hi - lo) * i) / (CURVE_POINTS - 1);
        curve.push({
          tempC: tc,
          q10: q10.ok ? q10Model(tc, q10.r10.value, q10.q10.value) : null,
          lloydTaylor: lloydTaylor.ok ? lloydTaylorModel(tc, lloydTaylor.r10.value, lloydTaylor.e0K.value) : null,
        });
      }
    }
    return { cellKey: cell.key, label: cell.label, points, q10, lloydTaylor, curve };
  });
}

/** The fitted response of one cell as a function of temperature (°C → µmol m⁻² s⁻¹), or null when the engine refused it. */
export function responseFunction(r: CellResponse, model: ResponseModelName): ((tempC: number) => number) | null {
  if (model === 'q10') {
    const f = r.q10;
    return f.ok ? (tc) => q10Model(tc, f.r10.value, f.q10.value) : null;
  }
  const f = r.lloydTaylor;
  return f.ok ? (tc) => lloydTaylorModel(tc, f.r10.value, f.e0K.value) : null;
}
