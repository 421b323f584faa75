import type { DataSource, EntityManager } from 'typeorm';
import { RESPONSE_LIMITS } from '../../shared/flux';
import { badRequest } from '../core/errors';
import { aggregateDesign, type DesignAggregate } from './design-aggregation';
import { loadSiteDesign, loadTemperatureLogs, type ClosureSelection, type SiteDesign } from './results-data';
import { seasonalTotals, type CellTotal } from './seasonal-totals';
import { fitResponses, responseCurve, type CellResponse, type ResponseModelName } from './temperature-responses';

type Db = Pick<DataSource, 'query'> | Pick<EntityManager, 'query'>;

export interface SeasonalParams {
  model: ResponseModelName;
  from?: string;
  to?: string;
}

export interface SiteResults {
  design: SiteDesign;
  aggregate: DesignAggregate;
  responses: CellResponse[];
}

export async function siteResults(db: Db, siteId: string, selection: ClosureSelection): Promise<SiteResults> {
  const design = await loadSiteDesign(db, siteId, selection);
  const aggregate = aggregateDesign(design);
  return { design, aggregate, responses: fitResponses(aggregate.cells, aggregate.visitMeans) };
}

/** The treatment summary: n at each level, means ± SE over plots, block strata, temperature and moisture alongside. */
export async function treatmentSummary(db: Db, siteId: string, selection: ClosureSelection) {
  const { design, aggregate } = await siteResults(db, siteId, selection);
  return {
    site: design.site,
    selection,
    campaigns: design.campaigns,
    cells: aggregate.cells,
    cellMeans: aggregate.cellMeans,
    plotMeans: aggregate.plotMeans,
    blockStrata: aggregate.blockStrata,
    counts: {
      closures: design.closures.length,
      visits: aggregate.visitMeans.length,
      collars: new Set(aggregate.collarMeans.map((c) => c.collarId)).size,
      plots: new Set(aggregate.plotMeans.map((p) => p.plotId)).size,
    },
  };
}

export async function temperatureResponses(db: Db, siteId: string, selection: ClosureSelection) {
  const { design, responses } = await siteResults(db, siteId, selection);
  return { site: design.site, selection, tempDepthCm: design.site.tempDepthCm, limits: RESPONSE_LIMITS, responses };
}

/** What the totals' interval includes and leaves out (shown in the Bench, the EML methods and the data package). */
export const TOTAL_INTERVAL_METHOD =
  "95 % interval: Student t interval over the plots' totals (mean ± t(0.975, n − 1)·SD/√n, n = plots totalled). It includes the variation " +
  "between plots and everything that varies plot by plot (visit noise, each plot's scale). It leaves out the uncertainty of the response " +
  'parameters and of the gap filling, which all plots of a treatment share; those are not propagated. Coverage 94.5–95.5 % at 3–6 plots ' +
  'in 2 000 simulated seasons each (docs/results-statistics.md).';

export const SEASONAL_METHOD =
  "Daily flux per plot from its soil-temperature log through the treatment's fitted response, scaled to the plot's own visit fluxes " +
  "(ratio of sums, positive by construction), averaged over the day's samples, only where every sample lies inside the fitted temperature range; " +
  "other days are gap-filled by linear interpolation between the plot's campaign means at local noon. A total is given only when every plot " +
  'has a value for every day of the stated period; plots whose visit fluxes do not sum to a positive value are reported as too little signal, not totalled. ' +
  'g C m⁻² with C = 12.011 g mol⁻¹. ' +
  TOTAL_INTERVAL_METHOD;

/** The days every cell's complete period shares, or null when they share none. */
function commonPeriod(totals: readonly CellTotal[]): { fromDay: string; toDay: string } | null {
  const ps = totals.map((t) => t.completePeriod).filter((x): x is NonNullable<typeof x> => x !== null);
  if (!ps.length) return null;
  const fromDay = ps
    .map((x) => x.fromDay)
    .sort()
    .at(-1)!;
  const toDay = ps.map((x) => x.toDay).sort()[0];
  return fromDay <= toDay ? { fromDay, toDay } : null;
}

export async function seasonalSummary(
  db: Db,
  siteId: string,
  selection: ClosureSelection,
  p: SeasonalParams,
): Promise<{
  site: SiteDesign['site'];
  selection: ClosureSelection;
  model: ResponseModelName;
  fromDay: string;
  toDay: string;
  method: string;
  interval: string;
  totals: CellTotal[];
}> {
  const { design, aggregate, responses } = await siteResults(db, siteId, selection);
  // By default the season runs from the first to the last campaign that has selected closures.
  const withData = design.campaigns.filter((c) => aggregate.plotMeans.some((m) => m.campaignId === c.campaignId));
  let fromDay = p.from ?? withData[0]?.startsOn;
  let toDay = p.to ?? withData.at(-1)?.endsOn;
  if (!fromDay || !toDay) throw badRequest('The site has no campaigns to total');
  if (toDay < fromDay) throw badRequest('The season ends before it starts', [{ path: 'to', message: 'Must be on or after from' }]);
  const logs = await loadTemperatureLogs(db, siteId);
  const fns = new Map(responses.map((r) => [r.cellKey, responseCurve(r, p.model)]));
  const input = { cells: aggregate.cells, plotMeans: aggregate.plotMeans, visitMeans: aggregate.visitMeans, logs, responses: fns };
  const run = (from: string, to: string) =>
    seasonalTotals(input, { fromDay: from, toDay: to, timezone: design.site.timezone, tempDepthCm: design.site.tempDepthCm });
  let totals = run(fromDay, toDay);
  // Without a stated period the season is the longest span in which every plot of every cell has a value.
  if (!p.from && !p.to && totals.some((t) => t.status === 'incomplete')) {
    const common = commonPeriod(totals);
    if (common) {
      fromDay = common.fromDay;
      toDay = common.toDay;
      totals = run(fromDay, toDay);
    }
  }
  return { site: design.site, selection, model: p.model, fromDay, toDay, method: SEASONAL_METHOD, interval: TOTAL_INTERVAL_METHOD, totals };
}
