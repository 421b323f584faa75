import type { CellResponse, Estimate, Responses, Seasonal, Summary } from '../results-api';

/** Invented results for component tests: one site, two campaigns, a plot-level and a collar-level treatment. */
export const SUMMARY: Summary = {
  campaigns: [{ campaignId: 'k-apr', name: 'April round', startsOn: '2026-04-07' }, { campaignId: 'k-may', name: 'May round', startsOn: '2026-05-05' }],
  cells: [{ key: 'CTRL', label: 'CTRL', level: 'plot' }, { key: 'TRENCH', label: 'TRENCH (collar)', level: 'collar' }],
  cellMeans: [
    { cellKey: 'CTRL', campaignId: 'k-apr', nPlots: 4, nCollars: 12, nVisits: 12, nClosures: 36, meanUmolM2S: 2.3456, seUmolM2S: 0.1234,
      seBlockUmolM2S: 0.0987, soilTempC: 8.44, vwcPct: 31.26 },
    { cellKey: 'TRENCH', campaignId: 'k-may', nPlots: 1, nCollars: 3, nVisits: 3, nClosures: 9, meanUmolM2S: 1.005, seUmolM2S: null,
      seBlockUmolM2S: null, soilTempC: null, vwcPct: null },
  ],
  blockStrata: [],
  counts: { closures: 45, visits: 15, collars: 15, plots: 4 },
};

const est = (value: number, ciLow: number, ciHigh: number): Estimate => ({ value, ciLow, ciHigh, se: (ciHigh - ciLow) / 3.92 });

const FITTED: CellResponse = {
  cellKey: 'CTRL', label: 'CTRL',
  points: [{ tempC: 4, fluxUmolM2S: 1.1, vwcPct: 20 }, { tempC: 10, fluxUmolM2S: 2.0, vwcPct: 30 }, { tempC: 16, fluxUmolM2S: 3.6, vwcPct: 40 }],
  q10: { ok: true, n: 3, tempSpanC: 12, rmse: 0.1, r10: est(2.02, 1.8, 2.25), q10: est(2.71, 2.2, 3.3), warnings: ['Only 3 visit means: the interval is wide'] },
  lloydTaylor: { ok: true, n: 3, tempSpanC: 12, rmse: 0.1, r10: est(2.05, 1.81, 2.31), e0K: est(315.4, 250.2, 380.9), publishedE0K: 308.56, warnings: [] },
  curve: [{ tempC: 4, q10: 1.2, lloydTaylor: 1.15 }, { tempC: 10, q10: 2.0, lloydTaylor: 2.05 }, { tempC: 16, q10: 3.3, lloydTaylor: 3.4 }],
};

export const RESPONSES: Responses = {
  tempDepthCm: 5,
  responses: [
    FITTED,
    { cellKey: 'TRENCH', label: 'TRENCH (collar)', points: [{ tempC: 9, fluxUmolM2S: 0.8, vwcPct: null }],
      q10: { ok: false, reason: 'Fewer than 4 visit means with a soil temperature' }, lloydTaylor: { ok: false, reason: 'Fewer than 4 visit means' }, curve: [] },
  ],
};

export const SEASONAL: Seasonal = {
  fromDay: '2026-04-01', toDay: '2026-06-30', model: 'lloyd-taylor', resamples: 2000,
  method: 'Daily flux from logged soil temperature through the fitted response; days without logs interpolated between campaigns.',
  totals: [
    { cellKey: 'CTRL', label: 'CTRL', nPlots: 4, totalGCM2: 412.4, ciLowGCM2: 380.2, ciHighGCM2: 445.6,
      plots: [{ plotCode: 'P1', totalGCM2: 400, days: { logged: 80, interpolated: 10, missing: 1 } },
        { plotCode: 'P2', totalGCM2: 425, days: { logged: 85, interpolated: 6, missing: 0 } }],
      cumulative: [{ day: '2026-04-01', gCM2: 3 }, { day: '2026-04-02', gCM2: 6.5 }, { day: '2026-04-03', gCM2: 10 }] },
    { cellKey: 'TRENCH', label: 'TRENCH (collar)', nPlots: 1, totalGCM2: null, ciLowGCM2: null, ciHighGCM2: null,
      plots: [], cumulative: [{ day: '2026-04-01', gCM2: 1 }, { day: '2026-04-02', gCM2: 2 }] },
  ],
};
