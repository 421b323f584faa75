import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { lloydTaylorModel, q10Model } from '../../shared/flux';
import { Rng } from '../seed/prng';
import type { Cell, VisitMean } from './design-aggregation';
import { fitLogScale } from './log-scale-response';
import { fitResponses } from './temperature-responses';

const cell: Cell = { key: 'T|none', label: 'T', level: 'plot', plotTreatment: { id: 't', code: 'T', name: 'T' }, collarTreatment: null };

/** Plots × campaigns, each plot visited at `collars` collars per campaign (pseudoreplicates of one unit). */
function visits(
  model: (tc: number) => number,
  plots: number,
  campaigns: number,
  collars: number,
  noiseSd: number,
  seed: number,
): VisitMean[] {
  const rng = new Rng(seed);
  const out: VisitMean[] = [];
  for (let p = 0; p < plots; p++) {
    for (let k = 0; k < campaigns; k++) {
      const tc = 2 + (22 * k) / Math.max(campaigns - 1, 1) + rng.normal(0, 0.5);
      const unit = 1 + rng.normal(0, noiseSd); // the plot-round deviation all its collars share
      for (let c = 0; c < collars; c++) {
        out.push({
          visitId: `v${p}-${k}-${c}`,
          collarId: `c${p}-${c}`,
          plotId: `p${p}`,
          cellKey: cell.key,
          campaignId: `k${k}`,
          round: 1,
          arrivedAt: '2026-06-01T09:00:00Z',
          nClosures: 1,
          fluxUmolM2S: model(tc) * unit * (1 + rng.normal(0, 0.02)),
          soilTempC: tc + rng.normal(0, 0.1),
          vwcPct: 30 - k,
        });
      }
    }
  }
  return out;
}

describe('temperature response per treatment cell on the experimental unit (synthetic data with known parameters)', () => {
  it('when visit means follow a Q10 curve (R10 = 2.1, Q10 = 2.3), then the fit on plot-round means recovers both within its 95 % CI', () => {
    // Q10 form R = R10·Q10^((T − 10)/10): Davidson, Janssens & Luo (2006) Global Change Biol. 12:154–164.
    const [r] = fitResponses(
      [cell],
      visits((tc) => q10Model(tc, 2.1, 2.3), 4, 8, 3, 0.08, 11),
    );
    if (!r.q10.ok) throw new Error(r.q10.reason);
    expect(r.points).toHaveLength(32);
    expect(r.points.every((p) => p.nVisits === 3)).toBe(true);
    expect(r.q10.n).toBe(32);
    expect(r.nPlots).toBe(4);
    expect(r.q10.q10.ciLow).toBeLessThan(2.3);
    expect(r.q10.q10.ciHigh).toBeGreaterThan(2.3);
    expect(r.q10.r10.ciLow).toBeLessThan(2.1);
    expect(r.q10.r10.ciHigh).toBeGreaterThan(2.1);
    if (!r.q10Log.ok) throw new Error(r.q10Log.reason);
    expect(r.q10Log.q10!.ciLow).toBeLessThan(2.3);
    expect(r.q10Log.q10!.ciHigh).toBeGreaterThan(2.3);
  });

  it('when visit means follow Lloyd & Taylor (R10 = 1.8, E0 = 280 K), then R10 and E0 are recovered within the CI on both scales', () => {
    // Lloyd, J., Taylor, J.A. (1994) Functional Ecology 8:315–323, Eq. 11, T0 = 227.13 K fixed.
    const [r] = fitResponses(
      [cell],
      visits((tc) => lloydTaylorModel(tc, 1.8, 280), 4, 8, 2, 0.08, 12),
    );
    if (!r.lloydTaylor.ok || !r.lloydTaylorLog.ok) throw new Error('not fitted');
    expect(r.lloydTaylor.e0K.ciLow).toBeLessThan(280);
    expect(r.lloydTaylor.e0K.ciHigh).toBeGreaterThan(280);
    expect(r.lloydTaylorLog.e0K!.ciLow).toBeLessThan(280);
    expect(r.lloydTaylorLog.e0K!.ciHigh).toBeGreaterThan(280);
    expect(r.lloydTaylor.warnings.some((w) => w.includes('E0'))).toBe(false);
  });

  it('when many collars are visited in few plot-rounds, then the visits do not count as replicates', () => {
    // 1 plot × 4 campaigns × 10 collars = 40 visits but 4 units: the engine refuses (fewer than 5 points).
    const [r] = fitResponses(
      [cell],
      visits((tc) => q10Model(tc, 2, 2), 1, 4, 10, 0.05, 3),
    );
    expect(r.points).toHaveLength(4);
    expect(r.q10).toEqual({ ok: false, reason: 'fewer than 5 points (4)' });
    expect(r.curve.every((c) => c.q10 === null)).toBe(true);
  });

  it('when a response rests on 2 plots and 8 units, then its warnings count units and plots, not visits', () => {
    const [r] = fitResponses(
      [cell],
      visits((tc) => q10Model(tc, 2, 2), 2, 4, 6, 0.05, 4),
    );
    if (!r.q10.ok) throw new Error(r.q10.reason);
    expect(r.q10.warnings).toContain('only 2 plots (independent units; fewer than 3)');
    expect(r.q10.warnings).toContain('only 8 plot-round means (fewer than 20)');
    expect(r.q10.warnings.some((w) => w.includes('visit means'))).toBe(false);
  });

  it('when the fitted E0 is far above 450 K, then the fit is warned about (Reichstein et al. 2005 range, from memory)', () => {
    const [r] = fitResponses(
      [cell],
      visits((tc) => lloydTaylorModel(tc, 1.5, 700), 4, 8, 1, 0.02, 5),
    );
    if (!r.lloydTaylor.ok) throw new Error(r.lloydTaylor.reason);
    expect(r.lloydTaylor.warnings.find((w) => w.startsWith('E0 ='))).toMatch(/outside 30–450 K/);
  });
});

interface LogCase {
  model: 'q10' | 'lloyd-taylor';
  temp_c: number[];
  flux: number[];
  intercept: number;
  slope: number;
  intercept_ci: number[];
  slope_ci: number[];
  se_slope: number;
}
const logCases: { cases: LogCase[] } = JSON.parse(readFileSync(join(__dirname, 'fixtures', 'statsmodels-log-response.json'), 'utf8'));

describe('log-scale responses against statsmodels OLS on ln(flux) (tools/results-reference/make-fixtures.py)', () => {
  it.each(logCases.cases.map((c) => [c.model, c] as const))(
    'when %s is fitted on the log scale, then estimates and 95 %% CIs match',
    (_m, c) => {
      const f = fitLogScale(c.model, c.temp_c, c.flux);
      if (!f.ok) throw new Error(f.reason);
      expect(Math.log(f.r10.value)).toBeCloseTo(c.intercept, 9);
      expect(Math.log(f.r10.ciLow)).toBeCloseTo(c.intercept_ci[0], 8);
      expect(Math.log(f.r10.ciHigh)).toBeCloseTo(c.intercept_ci[1], 8);
      const beta = c.model === 'q10' ? f.q10! : f.e0K!;
      const tr = c.model === 'q10' ? Math.log : (x: number) => x;
      expect(tr(beta.value)).toBeCloseTo(c.slope, c.model === 'q10' ? 9 : 5);
      expect(tr(beta.ciLow)).toBeCloseTo(c.slope_ci[0], c.model === 'q10' ? 8 : 4);
      expect(tr(beta.ciHigh)).toBeCloseTo(c.slope_ci[1], c.model === 'q10' ? 8 : 4);
    },
  );

  it("when a unit's flux is not positive, then it is left out of the log-scale fit and counted", () => {
    const c = logCases.cases[0];
    const f = fitLogScale('q10', [...c.temp_c, 12], [...c.flux, -0.1]);
    if (!f.ok) throw new Error(f.reason);
    expect(f.nLeftOut).toBe(1);
    expect(f.n).toBe(c.temp_c.length);
    expect(f.warnings[0]).toContain('1 non-positive fluxes left out');
  });
});
