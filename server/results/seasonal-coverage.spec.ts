import { q10Model } from '../../shared/flux';
import { Rng } from '../seed/prng';
import type { Cell, PlotMean, VisitMean } from './design-aggregation';
import type { TemperatureLogSeries } from './results-data';
import { seasonalTotals, type SeasonalInput } from './seasonal-totals';

/**
 * Coverage of the seasonal total's 95 % interval, by simulation (seeded, so the measured numbers in
 * docs/results-statistics.md are reproducible). Each simulated season: n plots whose level varies
 * normally between plots (mean 2, SD 0.5 µmol m⁻² s⁻¹ at 10 °C), a Q10 = 2.2 response, visits with
 * 10 % multiplicative noise at the two campaigns bracketing the period, a 6-hourly log for the first
 * ten days (logged through the response) and interpolation for the rest. The target is the
 * population mean total, i.e. the total of a plot at the mean level without noise (the totals are
 * linear in level and noise). A 95 % interval must cover it in 93–97 % of 2 000 seasons
 * (binomial SE at 2 000 seasons ≈ 0.5 percentage points).
 */
const cell: Cell = { key: 'T|none', label: 'T', level: 'plot', plotTreatment: { id: 't', code: 'T', name: 'T' }, collarTreatment: null };
const DAY0 = Date.UTC(2026, 5, 1);
const HOUR = 3_600_000;
const f = (tc: number) => q10Model(tc, 1, 2.2);
const tempAt = (ms: number) => 8 + (0.5 * (ms - DAY0)) / (24 * HOUR) + 3 * Math.sin((2 * Math.PI * (ms - DAY0)) / (24 * HOUR));
const LOG_T: string[] = [];
const LOG_C: number[] = [];
for (let h = 24; h < 24 * 11; h += 6) {
  LOG_T.push(new Date(DAY0 + h * HOUR).toISOString());
  LOG_C.push(tempAt(DAY0 + h * HOUR));
}
const VISITS = [DAY0 + 9 * HOUR, DAY0 + (20 * 24 + 9) * HOUR];

function season(levels: readonly number[], noise: (i: number, j: number) => number): SeasonalInput {
  const plotMeans: PlotMean[] = [];
  const visitMeans: VisitMean[] = [];
  const logs: TemperatureLogSeries[] = [];
  levels.forEach((k, i) => {
    const plotId = `P${i}`;
    VISITS.forEach((ms, j) => {
      const y = k * f(tempAt(ms)) * (1 + noise(i, j));
      const campaignId = `c${j}`;
      plotMeans.push({
        plotId,
        plotCode: plotId,
        blockCode: null,
        cellKey: cell.key,
        campaignId,
        nCollars: 1,
        nVisits: 1,
        nClosures: 1,
        fluxUmolM2S: y,
        soilTempC: null,
        vwcPct: null,
      });
      visitMeans.push({
        visitId: `${plotId}${j}`,
        collarId: plotId,
        plotId,
        cellKey: cell.key,
        campaignId,
        round: 1,
        arrivedAt: new Date(ms).toISOString(),
        nClosures: 1,
        fluxUmolM2S: y,
        soilTempC: tempAt(ms),
        vwcPct: null,
      });
    });
    logs.push({ id: plotId, plotId, depthCm: 5, source: '', t: LOG_T, tempC: LOG_C });
  });
  return { cells: [cell], plotMeans, visitMeans, logs, responses: new Map([[cell.key, { f, minTempC: -10, maxTempC: 40 }]]) };
}

const OPTS = { fromDay: '2026-06-02', toDay: '2026-06-20', timezone: 'UTC', tempDepthCm: 5 };

export function measuredCoverage(nPlots: number, seasons: number, seed: number): number {
  const rng = new Rng(seed);
  const [truth] = seasonalTotals(
    season([2], () => 0),
    OPTS,
  );
  let covered = 0;
  for (let s = 0; s < seasons; s++) {
    const levels = Array.from({ length: nPlots }, () => rng.normal(2, 0.5));
    const [t] = seasonalTotals(
      season(levels, () => rng.normal(0, 0.1)),
      OPTS,
    );
    if (t.ciLowGCM2! <= truth.totalGCM2! && truth.totalGCM2! <= t.ciHighGCM2!) covered++;
  }
  return covered / seasons;
}

describe('seasonal total interval coverage (simulated seasons)', () => {
  it('when the season path is used, then every simulated plot is logged and interpolated as designed', () => {
    const [t] = seasonalTotals(
      season([2, 2.5, 1.5], () => 0),
      OPTS,
    );
    expect(t.status).toBe('complete');
    expect(t.plots[0].days).toEqual({ logged: 10, interpolated: 9, missing: 0, outsideRange: 0 });
  });

  it.each([
    [3, 101],
    [4, 102],
    [6, 103],
  ])('when %i plots are simulated over 2 000 seasons, then the 95 %% interval covers the mean in 93–97 %%', (n, seed) => {
    const c = measuredCoverage(n, 2000, seed);
    expect(c).toBeGreaterThanOrEqual(0.93);
    expect(c).toBeLessThanOrEqual(0.97);
  });
});
