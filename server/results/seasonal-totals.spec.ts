import { q10Model } from '../../shared/flux';
import type { Cell, PlotMean, VisitMean } from './design-aggregation';
import { bootstrapMeanInterval, seasonalTotals, type SeasonalOptions } from './seasonal-totals';

// 1 µmol CO2 m⁻² s⁻¹ = 10⁻⁶ × 12.011 × 86 400 = 1.0377504 g C m⁻² d⁻¹ (IUPAC conventional atomic
// weight of C, Prohaska et al. 2022, Pure Appl. Chem. 94 — citation from memory; the product is plain arithmetic).
const G_C_PER_UMOL_DAY = 1.0377504;

const cell: Cell = { key: 'T|none', label: 'T', level: 'plot', plotTreatment: { id: 't', code: 'T', name: 'T' }, collarTreatment: null };
const plotMean = (plotId: string, campaignId: string, flux: number): PlotMean =>
  ({ plotId, plotCode: plotId, blockCode: null, cellKey: cell.key, campaignId, nCollars: 1, nVisits: 1, nClosures: 1, fluxUmolM2S: flux, soilTempC: null, vwcPct: null });
const visit = (plotId: string, campaignId: string, arrivedAt: string, flux: number, soilTempC: number | null): VisitMean =>
  ({ visitId: `${plotId}${campaignId}`, collarId: plotId, plotId, cellKey: cell.key, campaignId, round: 1, arrivedAt, nClosures: 1, fluxUmolM2S: flux, soilTempC, vwcPct: null });
const opts = (fromDay: string, toDay: string): SeasonalOptions => ({ fromDay, toDay, timezone: 'UTC', tempDepthCm: 5, resamples: 500, seed: 7 });

describe('seasonal totals (closed-form checks)', () => {
  it('when a plot\'s campaign means are one constant flux, then the interpolated total is flux × 1.0377504 × days', () => {
    const input = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 3), plotMean('P1', 'b', 3)],
      visitMeans: [visit('P1', 'a', '2026-05-01T09:00:00Z', 3, null), visit('P1', 'b', '2026-06-15T09:00:00Z', 3, null)],
      logs: [], responses: new Map(),
    };
    // 2 May … 31 May: 30 days, all inside the span of the two campaigns.
    const [t] = seasonalTotals(input, opts('2026-05-02', '2026-05-31'));
    expect(t.plots[0].days).toEqual({ logged: 0, interpolated: 30, missing: 0 });
    expect(t.totalGCM2).toBeCloseTo(3 * G_C_PER_UMOL_DAY * 30, 10);
    expect(t.cumulative.at(-1)!.gCM2).toBeCloseTo(3 * G_C_PER_UMOL_DAY * 30, 10);
  });

  it('when the plot has a constant-temperature log, then the fitted response scaled to its visits gives its visit flux every day', () => {
    const f = (tc: number) => q10Model(tc, 1.7, 2.4); // Q10 form, any parameters: the plot scale absorbs the level
    const t: string[] = [];
    const tempC: number[] = [];
    for (let h = 0; h < 24 * 10; h++) { t.push(new Date(Date.UTC(2026, 6, 1) + h * 3_600_000).toISOString()); tempC.push(15); }
    const input = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 2.5)],
      visitMeans: [visit('P1', 'a', '2026-07-03T09:00:00Z', 2.5, 15)],
      logs: [{ id: 'L', plotId: 'P1', depthCm: 5, source: '', t, tempC }],
      responses: new Map([[cell.key, f]]),
    };
    const [total] = seasonalTotals(input, opts('2026-07-01', '2026-07-12'));
    expect(total.plots[0].scale).toBeCloseTo(2.5 / f(15), 12);
    // 10 logged days; the 2 days after the log ends have one campaign only: nothing to interpolate between → missing.
    expect(total.plots[0].days).toEqual({ logged: 10, interpolated: 0, missing: 2 });
    expect(total.totalGCM2).toBeCloseTo(2.5 * G_C_PER_UMOL_DAY * 10, 10);
  });

  it('when temperature swings within a day, then the day\'s flux is the mean of the fluxes, not the flux at the mean temperature', () => {
    const f = (tc: number) => q10Model(tc, 2, 2);
    const t = [0, 12].map((h) => new Date(Date.UTC(2026, 6, 1, h)).toISOString());
    const input = {
      cells: [cell], plotMeans: [plotMean('P1', 'a', 2)], visitMeans: [visit('P1', 'a', '2026-07-01T09:00:00Z', 2, 10)],
      logs: [{ id: 'L', plotId: 'P1', depthCm: 5, source: '', t, tempC: [0, 20] }], responses: new Map([[cell.key, f]]),
    };
    const [total] = seasonalTotals(input, opts('2026-07-01', '2026-07-01'));
    // Q10 = 2, R10 = 2 (scale 1): f(0) = 1, f(20) = 4 → day mean 2.5 µmol m⁻² s⁻¹ (f(10) would be 2).
    expect(total.plots[0].daily[0].fluxUmolM2S).toBeCloseTo(2.5, 12);
  });

  it('when plots are resampled with a seed, then the interval is reproducible, inside the plot range and collapses for equal plots', () => {
    const a = bootstrapMeanInterval([100, 120, 140, 160], 2000, 42)!;
    expect(bootstrapMeanInterval([100, 120, 140, 160], 2000, 42)).toEqual(a);
    expect(a[0]).toBeGreaterThanOrEqual(100);
    expect(a[1]).toBeLessThanOrEqual(160);
    expect(a[0]).toBeLessThan(130);
    expect(a[1]).toBeGreaterThan(130);
    expect(bootstrapMeanInterval([5, 5, 5], 200, 1)).toEqual([5, 5]);
    expect(bootstrapMeanInterval([5], 200, 1)).toBeNull();
  });
});
