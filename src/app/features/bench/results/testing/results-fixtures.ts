import type { CellResponse, Estimate, Responses, Seasonal, Summary } from '../results-api';

/** Invented results for component tests: one site, two campaigns, a plot-level and a collar-level treatment. */
export const SUMMARY: Summary = {
  campaigns: [
    { campaignId: 'k-apr', name: 'April round', startsOn: '2026-04-07' },
    { campaignId: 'k-may', name: 'May round', startsOn: '2026-05-05' },
  ],
  cells: [
    { key: 'CTRL', label: 'CTRL', level: 'plot' },
    { key: 'TRENCH', label: 'TRENCH (collar)', level: 'collar' },
  ],
  cellMeans: [
    {
      cellKey: 'CTRL',
      campaignId: 'k-apr',
      nPlots: 4,
      nCollars: 12,
      nVisits: 12,
      nClosures: 36,
      meanUmolM2S: 2.3456,
      seUmolM2S: 0.1234,
      seBlockUmolM2S: 0.0987,
      soilTempC: 8.44,
      vwcPct: 31.26,
    },
    {
      cellKey: 'TRENCH',
      campaignId: 'k-may',
      nPlots: 1,
      nCollars: 3,
      nVisits: 3,
      nClosures: 9,
      meanUmolM2S: 1.005,
      seUmolM2S: null,
      seBlockUmolM2S: null,
      soilTempC: null,
      vwcPct: null,
    },
  ],
  blockStrata: [],
  counts: { closures: 45, visits: 15, collars: 15, plots: 4 },
};

const est = (value: number, ciLow: number, ciHigh: number): Estimate => ({ value, ciLow, ciHigh, se: (ciHigh - ciLow) / 3.92 });

const pt = (tempC: number, fluxUmolM2S: number, vwcPct: number | null, plotId = 'P1') => ({
  plotId,
  campaignId: 'k-apr',
  round: 1,
  nVisits: 3,
  tempC,
  fluxUmolM2S,
  vwcPct,
});

const FITTED: CellResponse = {
  cellKey: 'CTRL',
  label: 'CTRL',
  nPlots: 2,
  points: [pt(4, 1.1, 20), pt(10, 2.0, 30, 'P2'), pt(16, 3.6, 40)],
  q10: {
    ok: true,
    n: 3,
    tempSpanC: 12,
    rmse: 0.1,
    r10: est(2.02, 1.8, 2.25),
    q10: est(2.71, 2.2, 3.3),
    warnings: ['only 2 plots (independent units; fewer than 3)'],
  },
  lloydTaylor: {
    ok: true,
    n: 3,
    tempSpanC: 12,
    rmse: 0.1,
    r10: est(2.05, 1.81, 2.31),
    e0K: est(515.4, 450.2, 580.9),
    publishedE0K: 308.56,
    warnings: ['only 2 plots (independent units; fewer than 3)', 'E0 = 515 K is outside 30–450 K (Reichstein et al. 2005)'],
  },
  q10Log: {
    ok: true,
    n: 3,
    nLeftOut: 0,
    tempSpanC: 12,
    rmseLog: 0.05,
    r10: est(2.0, 1.7, 2.3),
    q10: est(2.65, 2.1, 3.2),
    e0K: null,
    warnings: [],
  },
  lloydTaylorLog: { ok: false, reason: 'fewer than 5 points with a positive flux (3)' },
  curve: [
    { tempC: 4, q10: 1.2, lloydTaylor: 1.15, q10Log: 1.2, lloydTaylorLog: null },
    { tempC: 10, q10: 2.0, lloydTaylor: 2.05, q10Log: 2, lloydTaylorLog: null },
    { tempC: 16, q10: 3.3, lloydTaylor: 3.4, q10Log: 3.2, lloydTaylorLog: null },
  ],
};

export const RESPONSES: Responses = {
  tempDepthCm: 5,
  responses: [
    FITTED,
    {
      cellKey: 'TRENCH',
      label: 'TRENCH (collar)',
      nPlots: 1,
      points: [pt(9, 0.8, null)],
      q10: { ok: false, reason: 'fewer than 5 points (1)' },
      lloydTaylor: { ok: false, reason: 'fewer than 5 points (1)' },
      q10Log: { ok: false, reason: 'fewer than 5 points with a positive flux (1)' },
      lloydTaylorLog: { ok: false, reason: 'fewer than 5 points with a positive flux (1)' },
      curve: [],
    },
  ],
};

const days = (logged: number, interpolated: number, missing: number, outsideRange = 0) => ({ logged, interpolated, missing, outsideRange });

export const SEASONAL: Seasonal = {
  fromDay: '2026-04-01',
  toDay: '2026-06-30',
  model: 'lloyd-taylor-log',
  method: 'Daily flux from logged soil temperature through the fitted response; other days gap-filled between campaigns.',
  interval:
    "95 % interval: Student t interval over the plots' totals. It leaves out the uncertainty of the response parameters and of the gap filling.",
  totals: [
    {
      cellKey: 'CTRL',
      label: 'CTRL',
      status: 'partial',
      nPlots: 3,
      nPlotsTotalled: 2,
      totalGCM2: 412.4,
      ciLowGCM2: 380.2,
      ciHighGCM2: 445.6,
      days: days(165, 17, 0, 4),
      shareOutsideRange: 0.0219,
      fittedRangeC: { minTempC: 4, maxTempC: 16 },
      completePeriod: { fromDay: '2026-04-01', toDay: '2026-06-30' },
      flags: ['1 of 3 plots have too little signal and are not totalled: P3'],
      plots: [
        {
          plotCode: 'P1',
          status: 'complete',
          totalGCM2: 400,
          days: days(80, 11, 0, 2),
          logDepthCm: 5,
          responseDepthCm: 5,
          depthDiffers: false,
          daytimeVisitsOnly: true,
          flags: ['interpolated days use means of daytime visits (6–18 h) as daily means: diel bias'],
        },
        {
          plotCode: 'P2',
          status: 'complete',
          totalGCM2: 425,
          days: days(85, 6, 0, 2),
          logDepthCm: 10,
          responseDepthCm: 5,
          depthDiffers: true,
          daytimeVisitsOnly: false,
          flags: ['logger depth 10 cm differs from the response depth 5 cm'],
        },
        {
          plotCode: 'P3',
          status: 'too little signal',
          totalGCM2: null,
          days: days(0, 91, 0),
          logDepthCm: null,
          responseDepthCm: 5,
          depthDiffers: false,
          daytimeVisitsOnly: false,
          flags: ['too little signal'],
        },
      ],
      cumulative: [
        { day: '2026-04-01', gCM2: 3 },
        { day: '2026-04-02', gCM2: 6.5 },
        { day: '2026-04-03', gCM2: 10 },
      ],
    },
    {
      cellKey: 'TRENCH',
      label: 'TRENCH (collar)',
      status: 'incomplete',
      nPlots: 1,
      nPlotsTotalled: 0,
      totalGCM2: null,
      ciLowGCM2: null,
      ciHighGCM2: null,
      days: days(0, 80, 11),
      shareOutsideRange: 0,
      fittedRangeC: null,
      completePeriod: { fromDay: '2026-04-01', toDay: '2026-06-19' },
      flags: ['missing days at P9: no total for 2026-04-01 to 2026-06-30; every plot has a value from 2026-04-01 to 2026-06-19'],
      plots: [
        {
          plotCode: 'P9',
          status: 'incomplete',
          totalGCM2: null,
          days: days(0, 80, 11),
          logDepthCm: null,
          responseDepthCm: 5,
          depthDiffers: false,
          daytimeVisitsOnly: true,
          flags: ['11 missing days: no total for this period'],
        },
      ],
      cumulative: [],
    },
  ],
};
