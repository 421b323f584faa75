/**
 * Seasonal totals per treatment cell in g C m⁻². Each plot gets a daily flux:
 *  - "logged temperature": where the plot has a soil-temperature log on that day and the cell has
 *    a fitted response, the day's flux is the mean over the log's samples of k · f(T) — the flux is
 *    averaged, not the temperature, because f is convex. k scales the cell's curve to the plot's
 *    own visit means (least squares through the origin: k = Σ y·f / Σ f²), so plots keep their level;
 *    a day counts as logged when the log covers at least 75 % of its usual samples per day;
 *  - "interpolated": otherwise, linear interpolation between the plot's campaign means at their
 *    mean visit times (common practice for gap filling between survey dates);
 *  - days outside both are reported as missing, never as zero.
 * Daily µmol m⁻² s⁻¹ become g C m⁻² d⁻¹ through the engine's convertFlux (C = 12.011 g mol⁻¹).
 * The interval is a percentile bootstrap over plots (Efron & Tibshirani 1993, An Introduction to
 * the Bootstrap, ch. 13 — citation from memory), seeded so a rerun gives the same numbers.
 */
import { convertFlux } from '../../shared/flux';
import { Rng } from '../seed/prng';
import type { Cell, PlotMean, VisitMean } from './design-aggregation';
import type { TemperatureLogSeries } from './results-data';
import { mean, quantileSorted } from './stats';

export type DayMethod = 'logged temperature' | 'interpolated' | 'missing';

export interface SeasonalOptions {
  fromDay: string;
  toDay: string;
  timezone: string;
  tempDepthCm: number;
  resamples: number;
  seed: number;
}

export interface PlotTotal {
  plotId: string; plotCode: string; scale: number | null; logDepthCm: number | null;
  totalGCM2: number; days: { logged: number; interpolated: number; missing: number };
  daily: { day: string; fluxUmolM2S: number | null; method: DayMethod }[];
}

export interface CellTotal {
  cellKey: string; label: string; nPlots: number; totalGCM2: number | null;
  ciLowGCM2: number | null; ciHighGCM2: number | null; plots: PlotTotal[];
  /** Mean over plots of the cumulative g C m⁻², per day (for the chart). */
  cumulative: { day: string; gCM2: number }[];
}

const DAY_MS = 86_400_000;
export const dayNumber = (day: string) => Date.parse(`${day}T00:00:00Z`) / DAY_MS;
export const dayString = (n: number) => new Date(n * DAY_MS).toISOString().slice(0, 10);

/** Local day of each instant, with one formatter per time zone (Intl formatters are costly to build). */
export function localDayFormatter(timeZone: string): (iso: string | number) => string {
  const f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
  return (t) => f.format(new Date(t));
}

/** The log of a plot at the site's depth, else the nearest depth (the choice is reported). */
function logFor(logs: readonly TemperatureLogSeries[], plotId: string, depthCm: number): TemperatureLogSeries | null {
  const own = logs.filter((l) => l.plotId === plotId && l.t.length);
  own.sort((a, b) => Math.abs(a.depthCm - depthCm) - Math.abs(b.depthCm - depthCm));
  return own[0] ?? null;
}

function dailyMeans(log: TemperatureLogSeries, f: (t: number) => number, dayOf: (iso: string) => string): Map<string, number> {
  const acc = new Map<string, { s: number; n: number }>();
  for (let i = 0; i < log.t.length; i++) {
    const d = dayOf(log.t[i]);
    const a = acc.get(d) ?? { s: 0, n: 0 };
    a.s += f(log.tempC[i]);
    a.n++;
    acc.set(d, a);
  }
  // A day counts only when the log covers most of it (≥ 75 % of the usual samples per day): the first or
  // last hour of a file would otherwise stand for a whole day at that hour's temperature.
  const counts = [...acc.values()].map((a) => a.n).sort((x, y) => x - y);
  const usual = counts[Math.floor(counts.length / 2)] ?? 0;
  return new Map([...acc].filter(([, a]) => a.n >= 0.75 * usual).map(([d, a]) => [d, a.s / a.n]));
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

export interface SeasonalInput {
  cells: readonly Cell[];
  plotMeans: readonly PlotMean[];
  visitMeans: readonly VisitMean[];
  logs: readonly TemperatureLogSeries[];
  /** The cell's fitted response (°C → µmol m⁻² s⁻¹), or null where none was fitted. */
  responses: ReadonlyMap<string, ((tempC: number) => number) | null>;
}

export function seasonalTotals(input: SeasonalInput, o: SeasonalOptions): CellTotal[] {
  const dayOf = localDayFormatter(o.timezone);
  const from = dayNumber(o.fromDay);
  const to = dayNumber(o.toDay);
  const days: string[] = [];
  for (let n = from; n <= to; n++) days.push(dayString(n));
  const toG = convertFlux(1, 'g_c_m2_d');

  return input.cells.map((cell) => {
    const f = input.responses.get(cell.key) ?? null;
    const plotIds = [...new Set(input.plotMeans.filter((p) => p.cellKey === cell.key).map((p) => p.plotId))];
    const plots: PlotTotal[] = plotIds.map((plotId) => {
      const visits = input.visitMeans.filter((v) => v.cellKey === cell.key && v.plotId === plotId);
      // Campaign means of this plot at the mean time of their visits, as fractional day numbers.
      const knots = input.plotMeans.filter((p) => p.cellKey === cell.key && p.plotId === plotId).map((p) => {
        const vs = visits.filter((v) => v.campaignId === p.campaignId);
        return { x: mean(vs.map((v) => Date.parse(v.arrivedAt))) / DAY_MS, y: p.fluxUmolM2S };
      }).sort((a, b) => a.x - b.x);
      let scale: number | null = null;
      let logged = new Map<string, number>();
      const log = f ? logFor(input.logs, plotId, o.tempDepthCm) : null;
      if (f && log) {
        const pts = visits.filter((v) => v.soilTempC !== null);
        let num = 0;
        let den = 0;
        for (const v of pts) { const m = f(v.soilTempC!); num += v.fluxUmolM2S * m; den += m * m; }
        scale = den > 0 ? num / den : 1;
        const k = scale;
        logged = dailyMeans(log, (t) => k * f(t), dayOf);
      }
      const counts = { logged: 0, interpolated: 0, missing: 0 };
      let total = 0;
      const daily = days.map((day) => {
        const fromLog = logged.get(day);
        // Noon of the day, so a campaign's mid-morning mean sits inside its own day.
        const interp = fromLog === undefined ? interpolate(knots, dayNumber(day) + 0.5) : null;
        const flux = fromLog ?? interp;
        const method: DayMethod = fromLog !== undefined ? 'logged temperature' : interp !== null ? 'interpolated' : 'missing';
        if (method === 'logged temperature') counts.logged++;
        else if (method === 'interpolated') counts.interpolated++;
        else counts.missing++;
        if (flux !== null) total += flux * toG;
        return { day, fluxUmolM2S: flux, method };
      });
      const plot = input.plotMeans.find((p) => p.plotId === plotId)!;
      return { plotId, plotCode: plot.plotCode, scale, logDepthCm: log?.depthCm ?? null, totalGCM2: total, days: counts, daily };
    });
    const totals = plots.map((p) => p.totalGCM2);
    const interval = bootstrapMeanInterval(totals, o.resamples, o.seed);
    const cumulative: { day: string; gCM2: number }[] = [];
    let run = 0;
    days.forEach((day, i) => {
      run += plots.length ? mean(plots.map((p) => (p.daily[i].fluxUmolM2S ?? 0) * toG)) : 0;
      cumulative.push({ day, gCM2: run });
    });
    return {
      cellKey: cell.key, label: cell.label, nPlots: plots.length, totalGCM2: plots.length ? mean(totals) : null,
      ciLowGCM2: interval?.[0] ?? null, ciHighGCM2: interval?.[1] ?? null, plots, cumulative,
    };
  });
}

/** 95 % percentile bootstrap interval of the mean, resampling the given values (plots) with replacement. */
export function bootstrapMeanInterval(values: readonly number[], resamples: number, seed: number): [number, number] | null {
  const n = values.length;
  if (n < 2) return null;
  const rng = new Rng(seed);
  const means: number[] = [];
  for (let b = 0; b < resamples; b++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += values[rng.int(0, n - 1)];
    means.push(s / n);
  }
  means.sort((a, b) => a - b);
  return [quantileSorted(means, 0.025), quantileSorted(means, 0.975)];
}
