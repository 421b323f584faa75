/**
 * Seasonal totals per treatment cell in g C m⁻² over a stated period. Each plot gets a daily flux:
 *  - "logged temperature": the plot's soil-temperature log covers the day (≥ 75 % of its usual samples)
 *    and every sample lies inside the temperature range the cell's response was fitted on; the day's
 *    flux is the mean over the samples of k · f(T) — the flux is averaged, not the temperature,
 *    because f is convex. k scales the cell's curve to the plot's own visits by the ratio estimator
 *    k = Σ y / Σ f(T) (Cochran 1977, Sampling Techniques, ch. 6 — citation from memory), which is
 *    positive whenever the plot's visit fluxes sum to a positive value, so it can never flip the curve;
 *  - "interpolated" (gap-filled): otherwise, linear interpolation between the plot's campaign means
 *    at their mean visit times, read at local noon in the site's zone (common practice);
 *  - "missing": neither. A plot with a missing day has no total (never a smaller number), and
 *    neither has its cell; the cell reports the longest period in which every plot has a value.
 * A plot whose visit fluxes do not sum to a positive value has too little signal to scale or total
 * and is reported as such. Daily µmol m⁻² s⁻¹ become g C m⁻² d⁻¹ through the engine's convertFlux
 * (C = 12.011 g mol⁻¹). The interval is a Student t interval over the plots' totals (see stats.ts).
 */
import { convertFlux } from '../../shared/flux';
import type { Cell, PlotMean, VisitMean } from './design-aggregation';
import type { TemperatureLogSeries } from './results-data';
import { dayNumber, dayString, localDayFormatter, localHourFormatter, localNoonFormatter, MS_PER_DAY } from './season-days';
import { mean, tMeanInterval } from './stats';

export type DayMethod = 'logged temperature' | 'interpolated' | 'missing';
export type PlotStatus = 'complete' | 'incomplete' | 'too little signal';
export type CellStatus = 'complete' | 'partial' | 'incomplete' | 'too little signal';

export interface SeasonalOptions {
  fromDay: string;
  toDay: string;
  timezone: string;
  tempDepthCm: number;
}

/** A cell's fitted response (°C → µmol m⁻² s⁻¹) and the temperature range of the points it was fitted on. */
export interface ResponseCurve {
  f: (tempC: number) => number;
  minTempC: number;
  maxTempC: number;
}

/** Plot-days by how their flux was obtained; outsideRange days had a log beyond the fitted range (then gap-filled or missing). */
export interface DayCounts {
  logged: number;
  interpolated: number;
  missing: number;
  outsideRange: number;
}

export interface PlotTotal {
  plotId: string;
  plotCode: string;
  status: PlotStatus;
  scale: number | null;
  logDepthCm: number | null;
  responseDepthCm: number;
  depthDiffers: boolean;
  /** Interpolated days rest on campaign means of daytime visits only: they stand for daily means (diel bias). */
  daytimeVisitsOnly: boolean;
  totalGCM2: number | null;
  days: DayCounts;
  flags: string[];
  daily: { day: string; fluxUmolM2S: number | null; method: DayMethod }[];
}

export interface CellTotal {
  cellKey: string;
  label: string;
  status: CellStatus;
  nPlots: number;
  nPlotsTotalled: number;
  totalGCM2: number | null;
  ciLowGCM2: number | null;
  ciHighGCM2: number | null;
  days: DayCounts;
  shareOutsideRange: number;
  fittedRangeC: { minTempC: number; maxTempC: number } | null;
  /** The longest run of days in which every plot with signal has a value. */
  completePeriod: { fromDay: string; toDay: string } | null;
  flags: string[];
  plots: PlotTotal[];
  /** Mean over the totalled plots of the cumulative g C m⁻², per day (empty when there is no total). */
  cumulative: { day: string; gCM2: number }[];
}

export interface SeasonalInput {
  cells: readonly Cell[];
  plotMeans: readonly PlotMean[];
  visitMeans: readonly VisitMean[];
  logs: readonly TemperatureLogSeries[];
  responses: ReadonlyMap<string, ResponseCurve | null>;
}

/** Visits between these local hours are daytime; a survey made only then misses the night (common practice). */
export const DAYTIME_HOURS = { from: 6, to: 18 } as const;

/** The log of a plot at the site's depth, else the nearest depth (the choice is reported). */
function logFor(logs: readonly TemperatureLogSeries[], plotId: string, depthCm: number): TemperatureLogSeries | null {
  const own = logs.filter((l) => l.plotId === plotId && l.t.length);
  own.sort((a, b) => Math.abs(a.depthCm - depthCm) - Math.abs(b.depthCm - depthCm));
  return own[0] ?? null;
}

interface LoggedDay {
  flux: number;
  inRange: boolean;
}

function dailyMeans(log: TemperatureLogSeries, c: ResponseCurve, k: number, dayOf: (iso: string) => string): Map<string, LoggedDay> {
  const acc = new Map<string, { s: number; n: number; out: boolean }>();
  for (let i = 0; i < log.t.length; i++) {
    const d = dayOf(log.t[i]);
    const a = acc.get(d) ?? { s: 0, n: 0, out: false };
    const tc = log.tempC[i];
    a.s += k * c.f(tc);
    a.n++;
    if (tc < c.minTempC || tc > c.maxTempC) a.out = true;
    acc.set(d, a);
  }
  // A day counts only when the log covers most of it (≥ 75 % of the usual samples per day): the first or
  // last hour of a file would otherwise stand for a whole day at that hour's temperature.
  const counts = [...acc.values()].map((a) => a.n).sort((x, y) => x - y);
  const usual = counts[Math.floor(counts.length / 2)] ?? 0;
  return new Map([...acc].filter(([, a]) => a.n >= 0.75 * usual).map(([d, a]) => [d, { flux: a.s / a.n, inRange: !a.out }]));
}

function interpolate(knots: { x: number; y: number }[], x: number): number | null {
  if (!knots.length || x < knots[0].x || x > knots[knots.length - 1].x) return null;
  for (let i = 1; i < knots.length; i++) {
    if (x <= knots[i].x) {
      const a = knots[i - 1];
      const b = knots[i];
      return b.x === a.x ? b.y : a.y + ((b.y - a.y) * (x - a.x)) / (b.x - a.x);
    }
  }
  return knots[0].y;
}

interface Clock {
  days: string[];
  dayOf: (t: string | number) => string;
  noon: Map<string, number>;
  hourOf: (iso: string) => number;
}

function plotTotal(input: SeasonalInput, o: SeasonalOptions, clock: Clock, cell: Cell, plotId: string): PlotTotal {
  const curve = input.responses.get(cell.key) ?? null;
  const visits = input.visitMeans.filter((v) => v.cellKey === cell.key && v.plotId === plotId);
  const means = input.plotMeans.filter((p) => p.cellKey === cell.key && p.plotId === plotId);
  // Campaign means of this plot at the mean time of their visits, as fractional day numbers.
  const knots = means
    .map((p) => {
      const vs = visits.filter((v) => v.campaignId === p.campaignId);
      return { x: mean(vs.map((v) => Date.parse(v.arrivedAt))) / MS_PER_DAY, y: p.fluxUmolM2S };
    })
    .sort((a, b) => a.x - b.x);
  // The local days of the first and last campaign means carry those means (noon may fall just outside them).
  const ends = new Map(knots.length ? [knots.at(-1)!, knots[0]].map((k) => [clock.dayOf(k.x * MS_PER_DAY), k.y]) : []);
  const signal = visits.length > 0 && mean(visits.map((v) => v.fluxUmolM2S)) > 0;
  const log = curve && signal ? logFor(input.logs, plotId, o.tempDepthCm) : null;
  let scale: number | null = null;
  let logged = new Map<string, LoggedDay>();
  const withTemp = visits.filter((v) => v.soilTempC !== null);
  if (curve && log && withTemp.length) {
    const k = withTemp.reduce((a, v) => a + v.fluxUmolM2S, 0) / withTemp.reduce((a, v) => a + curve.f(v.soilTempC!), 0);
    if (k > 0) {
      scale = k;
      logged = dailyMeans(log, curve, k, clock.dayOf);
    }
  }
  const days: DayCounts = { logged: 0, interpolated: 0, missing: 0, outsideRange: 0 };
  const toG = convertFlux(1, 'g_c_m2_d');
  let total = 0;
  const daily = clock.days.map((day) => {
    const fromLog = logged.get(day);
    if (fromLog && !fromLog.inRange) days.outsideRange++;
    const useLog = fromLog !== undefined && fromLog.inRange;
    const interp = useLog ? null : (interpolate(knots, clock.noon.get(day)! / MS_PER_DAY) ?? ends.get(day) ?? null);
    const flux = useLog ? fromLog.flux : interp;
    const method: DayMethod = useLog ? 'logged temperature' : interp !== null ? 'interpolated' : 'missing';
    if (method === 'logged temperature') days.logged++;
    else if (method === 'interpolated') days.interpolated++;
    else days.missing++;
    if (flux !== null) total += flux * toG;
    return { day, fluxUmolM2S: flux, method };
  });
  const status: PlotStatus = !signal ? 'too little signal' : days.missing ? 'incomplete' : 'complete';
  const logDepthCm = log?.depthCm ?? null;
  const depthDiffers = logDepthCm !== null && days.logged > 0 && logDepthCm !== o.tempDepthCm;
  const daytimeVisitsOnly =
    days.interpolated > 0 &&
    visits.length > 0 &&
    visits.every((v) => {
      const h = clock.hourOf(v.arrivedAt);
      return h >= DAYTIME_HOURS.from && h < DAYTIME_HOURS.to;
    });
  const flags: string[] = [];
  if (!signal) flags.push('too little signal: its visit fluxes do not sum to a positive value, so it is neither scaled nor totalled');
  if (days.missing) flags.push(`${days.missing} missing days: no total for this period`);
  if (days.outsideRange)
    flags.push(
      `${days.outsideRange} logged days outside the fitted range ${curve!.minTempC.toFixed(1)}–${curve!.maxTempC.toFixed(1)} °C were not taken from the response`,
    );
  if (depthDiffers) flags.push(`logger depth ${logDepthCm} cm differs from the response depth ${o.tempDepthCm} cm`);
  if (daytimeVisitsOnly)
    flags.push(`interpolated days use means of daytime visits (${DAYTIME_HOURS.from}–${DAYTIME_HOURS.to} h) as daily means: diel bias`);
  const plotCode = means[0]?.plotCode ?? plotId;
  return {
    plotId,
    plotCode,
    status,
    scale,
    logDepthCm,
    responseDepthCm: o.tempDepthCm,
    depthDiffers,
    daytimeVisitsOnly,
    totalGCM2: status === 'complete' ? total : null,
    days,
    flags,
    daily,
  };
}

/** Longest run of days on which every given plot has a value. */
function completePeriod(plots: readonly PlotTotal[], days: readonly string[]): CellTotal['completePeriod'] {
  if (!plots.length) return null;
  let best: [number, number] | null = null;
  let start = -1;
  for (let i = 0; i <= days.length; i++) {
    const ok = i < days.length && plots.every((p) => p.daily[i].method !== 'missing');
    if (ok && start < 0) start = i;
    if (!ok && start >= 0) {
      if (!best || i - 1 - start > best[1] - best[0]) best = [start, i - 1];
      start = -1;
    }
  }
  return best ? { fromDay: days[best[0]], toDay: days[best[1]] } : null;
}

export function seasonalTotals(input: SeasonalInput, o: SeasonalOptions): CellTotal[] {
  const days: string[] = [];
  for (let n = dayNumber(o.fromDay); n <= dayNumber(o.toDay); n++) days.push(dayString(n));
  const noonOf = localNoonFormatter(o.timezone);
  const clock: Clock = {
    days,
    dayOf: localDayFormatter(o.timezone),
    noon: new Map(days.map((d) => [d, noonOf(d)])),
    hourOf: localHourFormatter(o.timezone),
  };
  const toG = convertFlux(1, 'g_c_m2_d');

  return input.cells.map((cell) => {
    const plotIds = [...new Set(input.plotMeans.filter((p) => p.cellKey === cell.key).map((p) => p.plotId))];
    const plots = plotIds.map((plotId) => plotTotal(input, o, clock, cell, plotId));
    const curve = input.responses.get(cell.key) ?? null;
    const counts: DayCounts = { logged: 0, interpolated: 0, missing: 0, outsideRange: 0 };
    for (const p of plots) for (const k of Object.keys(counts) as (keyof DayCounts)[]) counts[k] += p.days[k];
    const withSignal = plots.filter((p) => p.status !== 'too little signal');
    const totalled = plots.filter((p) => p.status === 'complete');
    const status: CellStatus =
      withSignal.some((p) => p.status === 'incomplete') || !plots.length
        ? 'incomplete'
        : !withSignal.length
          ? 'too little signal'
          : totalled.length < plots.length
            ? 'partial'
            : 'complete';
    const counted = status === 'complete' || status === 'partial';
    const totals = totalled.map((p) => p.totalGCM2!);
    const interval = counted ? tMeanInterval(totals) : null;
    const cumulative: CellTotal['cumulative'] = [];
    let run = 0;
    if (counted)
      days.forEach((day, i) => {
        run += mean(totalled.map((p) => p.daily[i].fluxUmolM2S! * toG));
        cumulative.push({ day, gCM2: run });
      });
    const period = completePeriod(withSignal, days);
    const list = (ps: PlotTotal[]) => ps.map((p) => p.plotCode).join(', ');
    const flags: string[] = [];
    const quiet = plots.filter((p) => p.status === 'too little signal');
    if (quiet.length) flags.push(`${quiet.length} of ${plots.length} plots have too little signal and are not totalled: ${list(quiet)}`);
    if (status === 'incomplete') {
      flags.push(
        `missing days at ${list(withSignal.filter((p) => p.status === 'incomplete'))}: no total for ${o.fromDay} to ${o.toDay}` +
          (period ? `; every plot has a value from ${period.fromDay} to ${period.toDay}` : ''),
      );
    }
    if (counts.outsideRange) flags.push(`${counts.outsideRange} plot-days outside the fitted temperature range were gap-filled or missing`);
    const deep = plots.filter((p) => p.depthDiffers);
    if (deep.length) flags.push(`logger depth differs from the response depth (${o.tempDepthCm} cm) at ${list(deep)}`);
    const diel = plots.filter((p) => p.daytimeVisitsOnly);
    if (diel.length) flags.push(`daytime visit means stand for daily means on interpolated days at ${list(diel)} (diel bias)`);
    return {
      cellKey: cell.key,
      label: cell.label,
      status,
      nPlots: plots.length,
      nPlotsTotalled: counted ? totalled.length : 0,
      totalGCM2: counted ? mean(totals) : null,
      ciLowGCM2: interval?.[0] ?? null,
      ciHighGCM2: interval?.[1] ?? null,
      days: counts,
      shareOutsideRange: plots.length && days.length ? counts.outsideRange / (plots.length * days.length) : 0,
      fittedRangeC: curve ? { minTempC: curve.minTempC, maxTempC: curve.maxTempC } : null,
      completePeriod: period,
      flags,
      plots,
      cumulative,
    };
  });
}
