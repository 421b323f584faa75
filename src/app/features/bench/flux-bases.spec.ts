import type { FitNumbers, FitResult } from '../../../../shared/bench/review-wire';
import { detectionLimitNote, fluxBases } from './flux-bases';

const stats = { r2: 0.99, rmse: 0.2, aic: -10, n: 130 };
const fit = (selected: FitResult['selected'], exponential: FitNumbers | null): FitResult => ({
  linear: { slopePpmS: 0.4, fluxUmolM2S: 2.0, ...stats },
  exponential,
  quadratic: null,
  selected,
  exponentialRejectedReason: null,
  flags: [],
  error: null,
  window: null,
  minDetectableFluxUmolM2S: null,
});

describe('fluxBases (Bench: the selected flux at closure and at the end of the settle time)', () => {
  it('when the exponential is selected, then both its values are shown with the basis in force', () => {
    const e = { slopePpmS: 0.49, fluxUmolM2S: 2.5, slopeAtClosurePpmS: 0.6, fluxAtClosureUmolM2S: 3.05, ...stats };
    expect(fluxBases(fit({ model: 'exponential', basis: 'closure', slopePpmS: 0.6, fluxUmolM2S: 3.05, reason: '' }, e))).toEqual({
      basis: 'closure',
      atClosure: 3.05,
      atSettleEnd: 2.5,
    });
  });

  it('when the line is selected, then both bases give its one flux', () => {
    expect(fluxBases(fit({ model: 'linear', basis: 'closure', slopePpmS: 0.4, fluxUmolM2S: 2.0, reason: '' }, null))).toEqual({
      basis: 'closure',
      atClosure: 2.0,
      atSettleEnd: 2.0,
    });
  });
});

describe('detectionLimitNote (MDF after Christiansen et al. 2015 / Parkin et al. 2012)', () => {
  const base = fit(null, null);
  it('when the engine used the 1 ppm default, then the note says it is a default', () => {
    expect(detectionLimitNote({ ...base, minDetectableFluxUmolM2S: 0.0421, precisionPpm: 1, precisionIsDefault: true })).toBe(
      'Minimum detectable flux 0.042 µmol m⁻² s⁻¹ (analyzer precision 1 µmol/mol, the 1 µmol/mol default: no precision on the analyzer record)',
    );
  });
  it('when the analyzer record gave the precision, then the note says so', () => {
    expect(detectionLimitNote({ ...base, minDetectableFluxUmolM2S: 0.0105, precisionPpm: 0.25, precisionIsDefault: false })).toBe(
      'Minimum detectable flux 0.011 µmol m⁻² s⁻¹ (analyzer precision 0.25 µmol/mol, from the analyzer record)',
    );
  });
});
