import type { FitResult } from './bench-api';

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
