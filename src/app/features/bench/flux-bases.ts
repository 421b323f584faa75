import type { FitResult } from '../../../../shared/bench/review-wire';

/** The selected model's flux on both slope bases: at chamber closure (t = 0) and at the end of the settle time. */
export interface FluxBases {
  basis: 'closure' | 'settle_end';
  atClosure: number;
  atSettleEnd: number;
}

/**
 * Curved models carry their flux at closure beside the flux at the start of the fit window; a line
 * has one slope everywhere. Results stored before the basis existed were on the settle-end basis.
 */
export function fluxBases(fit: FitResult): FluxBases | null {
  const s = fit.selected;
  if (!s) return null;
  const model = fit[s.model];
  if (!model) return null;
  return {
    basis: s.basis ?? 'settle_end',
    atClosure: model.fluxAtClosureUmolM2S ?? model.fluxUmolM2S,
    atSettleEnd: model.fluxUmolM2S,
  };
}

/** The detection limit and the precision behind it; a 1 ppm default is named as such, never passed off as the analyzer's. */
export function detectionLimitNote(fit: FitResult): string | null {
  if (fit.minDetectableFluxUmolM2S == null) return null;
  const mdf = fit.minDetectableFluxUmolM2S.toFixed(3);
  if (fit.precisionPpm == null) return `Minimum detectable flux ${mdf} µmol m⁻² s⁻¹`;
  const source = fit.precisionIsDefault ? 'the 1 µmol/mol default: no precision on the analyzer record' : 'from the analyzer record';
  return `Minimum detectable flux ${mdf} µmol m⁻² s⁻¹ (analyzer precision ${fit.precisionPpm} µmol/mol, ${source})`;
}
