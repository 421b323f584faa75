import { lloydTaylorModel, q10Model } from '../../shared/flux';
import { Rng } from '../seed/prng';
import type { Cell, VisitMean } from './design-aggregation';
import { fitResponses } from './temperature-responses';

const cell: Cell = { key: 'T|none', label: 'T', level: 'plot', plotTreatment: { id: 't', code: 'T', name: 'T' }, collarTreatment: null };

function visits(model: (tc: number) => number, n: number, noiseSd: number, seed: number): VisitMean[] {
  const rng = new Rng(seed);
  return Array.from({ length: n }, (_, i) => {
    const tc = 2 + (22 * i) / (n - 1);
    return { visitId: `v${i}`, collarId: 'c', plotId: 'p', cellKey: cell.key, campaignId: 'k', round: 1, arrivedAt: '2026-06-01T00:00:00Z',
      nClosures: 1, fluxUmolM2S: model(tc) * (1 + rng.normal(0, noiseSd)), soilTempC: tc, vwcPct: 30 - i * 0.5 };
  });
}

describe('temperature response per treatment cell (synthetic data with known parameters)', () => {
  it('when visit means follow a Q10 curve (R10 = 2.1, Q10 = 2.3) with 5 % noise, then the fit recovers both within its 95 % CI', () => {
    // Q10 form R = R10·Q10^((T − 10)/10): Davidson, Janssens & Luo (2006) Global Change Biol. 12:154–164.
    const [r] = fitResponses([cell], visits((tc) => q10Model(tc, 2.1, 2.3), 30, 0.05, 11));
    if (!r.q10.ok) throw new Error(r.q10.reason);
    expect(r.points).toHaveLength(30);
    expect(r.q10.q10.ciLow).toBeLessThan(2.3);
    expect(r.q10.q10.ciHigh).toBeGreaterThan(2.3);
    expect(r.q10.r10.ciLow).toBeLessThan(2.1);
    expect(r.q10.r10.ciHigh).toBeGreaterThan(2.1);
    expect(Math.abs(r.q10.q10.value - 2.3)).toBeLessThan(0.15);
    expect(r.points[0].vwcPct).toBe(30);
  });

  it('when visit means follow Lloyd & Taylor (R10 = 1.8, E0 = 280 K), then R10 and E0 are recovered within the CI and the curve passes R10 at 10 °C', () => {
    // Lloyd, J., Taylor, J.A. (1994) Functional Ecology 8:315–323, Eq. 11, T0 = 227.13 K fixed.
    const [r] = fitResponses([cell], visits((tc) => lloydTaylorModel(tc, 1.8, 280), 30, 0.05, 12));
    if (!r.lloydTaylor.ok) throw new Error(r.lloydTaylor.reason);
    expect(r.lloydTaylor.e0K.ciLow).toBeLessThan(280);
    expect(r.lloydTaylor.e0K.ciHigh).toBeGreaterThan(280);
    expect(r.lloydTaylor.r10.ciLow).toBeLessThan(1.8);
    expect(r.lloydTaylor.r10.ciHigh).toBeGreaterThan(1.8);
    const at10 = r.curve.reduce((a, b) => (Math.abs(b.tempC - 10) < Math.abs(a.tempC - 10) ? b : a));
    expect(at10.lloydTaylor! / lloydTaylorModel(at10.tempC, r.lloydTaylor.r10.value, r.lloydTaylor.e0K.value)).toBeCloseTo(1, 12);
  });

  it('when a cell has too few visit means, then the engine\'s refusal is passed on, not a curve', () => {
    const [r] = fitResponses([cell], visits((tc) => q10Model(tc, 2, 2), 4, 0, 1));
    expect(r.q10).toEqual({ ok: false, reason: 'fewer than 5 points (4)' });
    expect(r.curve.every((c) => c.q10 === null)).toBe(true);
  });
});
