import { q10Model } from '../../shared/flux';
import type { Cell, PlotMean, VisitMean } from './design-aggregation';
import type { TemperatureLogSeries } from './results-data';
import { seasonalTotals, type ResponseCurve, type SeasonalInput, type SeasonalOptions } from './seasonal-totals';

// 1 µmol CO2 m⁻² s⁻¹ = 10⁻⁶ × 12.011 × 86 400 = 1.0377504 g C m⁻² d⁻¹ (IUPAC conventional atomic
// weight of C, Prohaska et al. 2022, Pure Appl. Chem. 94 — citation from memory; the product is plain arithmetic).
const G_C_PER_UMOL_DAY = 1.0377504;

const cell: Cell = { key: 'T|none', label: 'T', level: 'plot', plotTreatment: { id: 't', code: 'T', name: 'T' }, collarTreatment: null };
const plotMean = (plotId: string, campaignId: string, flux: number): PlotMean => ({
  plotId,
  plotCode: plotId,
  blockCode: null,
  cellKey: cell.key,
  campaignId,
  nCollars: 1,
  nVisits: 1,
  nClosures: 1,
  fluxUmolM2S: flux,
  soilTempC: null,
  vwcPct: null,
});
const visit = (plotId: string, campaignId: string, arrivedAt: string, flux: number, soilTempC: number | null): VisitMean => ({
  visitId: `${plotId}${campaignId}`,
  collarId: plotId,
  plotId,
  cellKey: cell.key,
  campaignId,
  round: 1,
  arrivedAt,
  nClosures: 1,
  fluxUmolM2S: flux,
  soilTempC,
  vwcPct: null,
});
const opts = (fromDay: string, toDay: string, timezone = 'UTC'): SeasonalOptions => ({ fromDay, toDay, timezone, tempDepthCm: 5 });
const curve = (f: (tc: number) => number, minTempC = -50, maxTempC = 60): ResponseCurve => ({ f, minTempC, maxTempC });

/** An hourly log from `start` (UTC) over `days` days at a temperature given per day index. */
function hourlyLog(plotId: string, start: number, days: number, tempOfDay: (d: number) => number, depthCm = 5): TemperatureLogSeries {
  const t: string[] = [];
  const tempC: number[] = [];
  for (let h = 0; h < 24 * days; h++) {
    t.push(new Date(start + h * 3_600_000).toISOString());
    tempC.push(tempOfDay(Math.floor(h / 24)));
  }
  return { id: `L${plotId}`, plotId, depthCm, source: '', t, tempC };
}

/** Two plots with constant campaign means 3 and 5 at 1 May and 15 June, 09:00 UTC. */
function twoPlots(): SeasonalInput {
  return {
    cells: [cell],
    plotMeans: [plotMean('P1', 'a', 3), plotMean('P1', 'b', 3), plotMean('P2', 'a', 5), plotMean('P2', 'b', 5)],
    visitMeans: [
      visit('P1', 'a', '2026-05-01T09:00:00Z', 3, null),
      visit('P1', 'b', '2026-06-15T09:00:00Z', 3, null),
      visit('P2', 'a', '2026-05-01T09:00:00Z', 5, null),
      visit('P2', 'b', '2026-06-15T09:00:00Z', 5, null),
    ],
    logs: [],
    responses: new Map(),
  };
}

describe('seasonal totals over a stated period (closed-form checks)', () => {
  it("when a plot's campaign means are one constant flux, then the interpolated total is flux × 1.0377504 × days", () => {
    const [t] = seasonalTotals(twoPlots(), opts('2026-05-02', '2026-05-31'));
    expect(t.plots[0].days).toEqual({ logged: 0, interpolated: 30, missing: 0, outsideRange: 0 });
    expect(t.plots[0].totalGCM2).toBeCloseTo(3 * G_C_PER_UMOL_DAY * 30, 10);
    expect(t.status).toBe('complete');
    expect(t.totalGCM2).toBeCloseTo(4 * G_C_PER_UMOL_DAY * 30, 10);
    expect(t.cumulative.at(-1)!.gCM2).toBeCloseTo(4 * G_C_PER_UMOL_DAY * 30, 10);
  });

  it('when a 12-day season has 2 days past the last campaign, then there is no total (not a 10-day one) and the complete period is named', () => {
    const [t] = seasonalTotals(twoPlots(), opts('2026-06-06', '2026-06-17'));
    expect(t.plots[0].days).toMatchObject({ interpolated: 10, missing: 2 });
    expect(t.plots.map((p) => [p.status, p.totalGCM2])).toEqual([
      ['incomplete', null],
      ['incomplete', null],
    ]);
    expect(t).toMatchObject({ status: 'incomplete', totalGCM2: null, ciLowGCM2: null, ciHighGCM2: null, cumulative: [] });
    expect(t.days).toEqual({ logged: 0, interpolated: 20, missing: 4, outsideRange: 0 });
    expect(t.completePeriod).toEqual({ fromDay: '2026-06-06', toDay: '2026-06-15' });
    expect(t.flags.join(' ')).toContain('every plot has a value from 2026-06-06 to 2026-06-15');
  });

  it('when plots cover different days, then the cell is not a mean over different periods', () => {
    const input = twoPlots();
    // P2's second campaign is earlier: it has no value after 1 June.
    input.visitMeans[3] = visit('P2', 'b', '2026-06-01T09:00:00Z', 5, null);
    const [t] = seasonalTotals(input, opts('2026-05-02', '2026-06-10'));
    expect(t.plots.find((p) => p.plotId === 'P1')!.status).toBe('complete');
    expect(t.plots.find((p) => p.plotId === 'P2')!.status).toBe('incomplete');
    expect(t.totalGCM2).toBeNull();
    expect(t.completePeriod).toEqual({ fromDay: '2026-05-02', toDay: '2026-06-01' });
  });

  it('when the site is in UTC−7, then each day is interpolated at local noon (19:00 UTC), not UTC noon', () => {
    // Campaign means 0 and 2 at local noon of 1 and 3 June (PDT, UTC−7); 2 June local noon is halfway → 1.
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 0), plotMean('P1', 'b', 2)],
      visitMeans: [visit('P1', 'a', '2026-06-01T19:00:00Z', 0, null), visit('P1', 'b', '2026-06-03T19:00:00Z', 2, null)],
      logs: [],
      responses: new Map(),
    };
    const [t] = seasonalTotals(input, opts('2026-06-01', '2026-06-03', 'America/Los_Angeles'));
    expect(t.plots[0].daily.map((d) => d.fluxUmolM2S)).toEqual([0, 1, 2]);
    expect(t.plots[0].status).toBe('complete');
  });

  it('when the plot has a constant-temperature log, then the fitted response scaled to its visits gives its visit flux every day', () => {
    const f = (tc: number) => q10Model(tc, 1.7, 2.4); // Q10 form, any parameters: the plot scale absorbs the level
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 2.5)],
      visitMeans: [visit('P1', 'a', '2026-07-03T09:00:00Z', 2.5, 15)],
      logs: [hourlyLog('P1', Date.UTC(2026, 6, 1), 10, () => 15)],
      responses: new Map([[cell.key, curve(f)]]),
    };
    const [total] = seasonalTotals(input, opts('2026-07-01', '2026-07-10'));
    expect(total.plots[0].scale).toBeCloseTo(2.5 / f(15), 12);
    expect(total.plots[0].days).toEqual({ logged: 10, interpolated: 0, missing: 0, outsideRange: 0 });
    expect(total.totalGCM2).toBeCloseTo(2.5 * G_C_PER_UMOL_DAY * 10, 10);
  });

  it("when temperature swings within a day, then the day's flux is the mean of the fluxes, not the flux at the mean temperature", () => {
    const f = (tc: number) => q10Model(tc, 2, 2);
    const t = [0, 12].map((h) => new Date(Date.UTC(2026, 6, 1, h)).toISOString());
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 2)],
      visitMeans: [visit('P1', 'a', '2026-07-01T09:00:00Z', 2, 10)],
      logs: [{ id: 'L', plotId: 'P1', depthCm: 5, source: '', t, tempC: [0, 20] }],
      responses: new Map([[cell.key, curve(f)]]),
    };
    const [total] = seasonalTotals(input, opts('2026-07-01', '2026-07-01'));
    // Q10 = 2, R10 = 2 (scale 1): f(0) = 1, f(20) = 4 → day mean 2.5 µmol m⁻² s⁻¹ (f(10) would be 2).
    expect(total.plots[0].daily[0].fluxUmolM2S).toBeCloseTo(2.5, 12);
  });

  it('when logged days go beyond the fitted temperature range, then the response is not applied there and the share is reported', () => {
    const f = (tc: number) => q10Model(tc, 2, 2);
    // Days 0–5 at 12 °C (inside 8–18 °C), days 6–9 at 25 °C (outside); campaigns bracket the whole period.
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 2), plotMean('P1', 'b', 2)],
      visitMeans: [visit('P1', 'a', '2026-06-30T09:00:00Z', 2, 10), visit('P1', 'b', '2026-07-12T09:00:00Z', 2, 10)],
      logs: [hourlyLog('P1', Date.UTC(2026, 6, 1), 10, (d) => (d < 6 ? 12 : 25))],
      responses: new Map([[cell.key, curve(f, 8, 18)]]),
    };
    const [t] = seasonalTotals(input, opts('2026-07-01', '2026-07-10'));
    expect(t.plots[0].days).toEqual({ logged: 6, interpolated: 4, missing: 0, outsideRange: 4 });
    expect(t.plots[0].daily.slice(6).every((d) => d.method === 'interpolated' && d.fluxUmolM2S === 2)).toBe(true);
    expect(t.shareOutsideRange).toBeCloseTo(0.4, 12);
    expect(t.fittedRangeC).toEqual({ minTempC: 8, maxTempC: 18 });
  });

  it('when the only log is deeper than the response depth, then both depths are shown and the plot is flagged', () => {
    const f = (tc: number) => q10Model(tc, 2, 2);
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [plotMean('P1', 'a', 2)],
      visitMeans: [visit('P1', 'a', '2026-07-01T09:00:00Z', 2, 10)],
      logs: [hourlyLog('P1', Date.UTC(2026, 6, 1), 3, () => 10, 15)],
      responses: new Map([[cell.key, curve(f)]]),
    };
    const [t] = seasonalTotals(input, opts('2026-07-01', '2026-07-03'));
    expect(t.plots[0]).toMatchObject({ logDepthCm: 15, responseDepthCm: 5, depthDiffers: true });
    expect(t.flags.join(' ')).toContain('logger depth differs');
  });

  it('when interpolated days rest on daytime visits only, then the plot is flagged for diel bias; a night visit clears it', () => {
    const [t] = seasonalTotals(twoPlots(), opts('2026-05-02', '2026-05-31'));
    expect(t.plots.every((p) => p.daytimeVisitsOnly)).toBe(true);
    const input = twoPlots();
    input.visitMeans.push({ ...visit('P1', 'a', '2026-05-01T23:00:00Z', 3, null), visitId: 'night' });
    const [u] = seasonalTotals(input, opts('2026-05-02', '2026-05-31'));
    expect(u.plots.find((p) => p.plotId === 'P1')!.daytimeVisitsOnly).toBe(false);
  });

  it("when a plot's only closures are flat near zero, then it is reported as too little signal, never given a negative total", () => {
    const f = (tc: number) => q10Model(tc, 2, 2.2);
    const log = (p: string) => hourlyLog(p, Date.UTC(2026, 3, 14), 30, (d) => 6 + d / 3);
    const input: SeasonalInput = {
      cells: [cell],
      plotMeans: [
        plotMean('P1', 'a', 1.1),
        plotMean('P1', 'b', 1.8),
        plotMean('P2', 'a', 1.2),
        plotMean('P2', 'b', 1.7),
        plotMean('P3', 'a', -0.02),
      ],
      visitMeans: [
        visit('P1', 'a', '2026-04-14T08:00:00Z', 1.1, 7),
        visit('P1', 'b', '2026-05-12T08:00:00Z', 1.8, 14),
        visit('P2', 'a', '2026-04-14T09:00:00Z', 1.2, 7),
        visit('P2', 'b', '2026-05-12T09:00:00Z', 1.7, 14),
        visit('P3', 'a', '2026-04-15T09:00:00Z', -0.02, 7),
      ],
      logs: ['P1', 'P2', 'P3'].map(log),
      responses: new Map([[cell.key, curve(f)]]),
    };
    const [t] = seasonalTotals(input, opts('2026-04-14', '2026-05-13'));
    const p3 = t.plots.find((p) => p.plotId === 'P3')!;
    expect(p3).toMatchObject({ status: 'too little signal', totalGCM2: null, scale: null });
    expect(t.plots.filter((p) => p.plotId !== 'P3').every((p) => p.scale! > 0 && p.totalGCM2! > 0)).toBe(true);
    expect(t).toMatchObject({ status: 'partial', nPlots: 3, nPlotsTotalled: 2 });
    expect(t.totalGCM2).toBeCloseTo((t.plots[0].totalGCM2! + t.plots[1].totalGCM2!) / 2, 10);
    expect(t.flags[0]).toBe('1 of 3 plots have too little signal and are not totalled: P3');
  });

  it("when a plot's visits are noisy around a small positive flux, then its scale stays positive whatever the noise", () => {
    const f = (tc: number) => q10Model(tc, 2, 2.2);
    for (const ys of [
      [0.3, -0.2, 0.1],
      [-0.5, 0.6],
      [0.05, 0.02, -0.06],
    ]) {
      const input: SeasonalInput = {
        cells: [cell],
        plotMeans: [plotMean('P1', 'a', mean(ys))],
        visitMeans: ys.map((y, i) => ({ ...visit('P1', 'a', `2026-07-0${i + 1}T09:00:00Z`, y, 5 + 8 * i), visitId: `v${i}` })),
        logs: [hourlyLog('P1', Date.UTC(2026, 6, 1), 3, () => 12)],
        responses: new Map([[cell.key, curve(f)]]),
      };
      const [t] = seasonalTotals(input, opts('2026-07-01', '2026-07-03'));
      expect(t.plots[0].scale).toBeGreaterThan(0);
      expect(t.plots[0].totalGCM2).toBeGreaterThan(0);
    }
  });

  it('when plot totals are known, then the interval is the Student t interval over plots', () => {
    // Totals 100·k over 10 days for k = 1, 1.2, 1.4, 1.6 µmol m⁻² s⁻¹ → mean 130·c, SD 25.8199·c (c = 1.0377504·10/100).
    // t(0.975, 3) = 3.182446305 (scipy.stats.t.ppf(0.975, 3); Student's t tables).
    const input: SeasonalInput = {
      cells: [cell],
      logs: [],
      responses: new Map(),
      plotMeans: [1, 1.2, 1.4, 1.6].flatMap((k, i) => [plotMean(`P${i}`, 'a', k), plotMean(`P${i}`, 'b', k)]),
      visitMeans: [1, 1.2, 1.4, 1.6].flatMap((k, i) => [
        visit(`P${i}`, 'a', '2026-05-01T09:00:00Z', k, null),
        visit(`P${i}`, 'b', '2026-05-20T09:00:00Z', k, null),
      ]),
    };
    const [t] = seasonalTotals(input, opts('2026-05-02', '2026-05-11'));
    const c = (G_C_PER_UMOL_DAY * 10) / 100;
    const half = (3.182446305284263 * (Math.sqrt(2000 / 3) * c)) / 2;
    expect(t.totalGCM2).toBeCloseTo(130 * c, 9);
    expect(t.ciLowGCM2).toBeCloseTo(130 * c - half, 8);
    expect(t.ciHighGCM2).toBeCloseTo(130 * c + half, 8);
  });
});

function mean(xs: number[]): number {
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}
