import type { DataSource, EntityManager } from 'typeorm';
import { RESPONSE_LIMITS } from '../../shared/flux';
import { badRequest } from '../core/errors';
import { aggregateDesign, type DesignAggregate } from './design-aggregation';
import { loadSiteDesign, loadTemperatureLogs, type ClosureSelection, type SiteDesign } from './results-data';
import { seasonalTotals, type CellTotal } from './seasonal-totals';
import { fitResponses, responseFunction, type CellResponse, type ResponseModelName } from './temperature-responses';

type Db = Pick<DataSource, 'query'> | Pick<EntityManager, 'query'>;

export interface SeasonalParams { model: ResponseModelName; from?: string; to?: string; resamples: number; seed: number }

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
    site: design.site, selection, campaigns: design.campaigns, cells: aggregate.cells,
    cellMeans: aggregate.cellMeans, plotMeans: aggregate.plotMeans, blockStrata: aggregate.blockStrata,
    counts: { closures: design.closures.length, visits: aggregate.visitMeans.length, collars: new Set(aggregate.collarMeans.map((c) => c.collarId)).size,
      plots: new Set(aggregate.plotMeans.map((p) => p.plotId)).size },
  };
}

export async function temperatureResponses(db: Db, siteId: string, selection: ClosureSelection) {
  const { design, responses } = await siteResults(db, siteId, selection);
  return { site: design.site, selection, tempDepthCm: design.site.tempDepthCm, limits: RESPONSE_LIMITS, responses };
}

export const SEASONAL_METHOD =
  'Daily flux per plot from its soil-temperature log through the treatment\'s fitted response, scaled to the plot\'s own visit means, '
  + 'averaged over the day\'s samples; on days without a log (or without a fitted response), linear interpolation between the plot\'s '
  + 'campaign means. g C m⁻² with C = 12.011 g mol⁻¹; 95 % interval: percentile bootstrap over plots.';

export async function seasonalSummary(db: Db, siteId: string, selection: ClosureSelection, p: SeasonalParams): Promise<{
  site: SiteDesign['site']; selection: ClosureSelection; model: ResponseModelName; fromDay: string; toDay: string;
  resamples: number; seed: number; method: string; totals: CellTotal[];
}> {
  const { design, aggregate, responses } = await siteResults(db, siteId, selection);
  // By default the season runs from the first to the last campaign that has selected closures.
  const withData = design.campaigns.filter((c) => aggregate.plotMeans.some((m) => m.campaignId === c.campaignId));
  const fromDay = p.from ?? withData[0]?.startsOn;
  const toDay = p.to ?? withData.at(-1)?.endsOn;
  if (!fromDay || !toDay) throw badRequest('The site has no campaigns to total');
  if (toDay < fromDay) throw badRequest('The season ends before it starts', [{ path: 'to', message: 'Must be on or after from' }]);
  const logs = await loadTemperatureLogs(db, siteId);
  const fns = new Map(responses.map((r) => [r.cellKey, responseFunction(r, p.model)]));
  const totals = seasonalTotals({ cells: aggregate.cells, plotMeans: aggregate.plotMeans, visitMeans: aggregate.visitMeans, logs, responses: fns },
    { fromDay, toDay, timezone: design.site.timezone, tempDepthCm: design.site.tempDepthCm, resamples: p.resamples, seed: p.seed });
  return { site: design.site, selection, model: p.model, fromDay, toDay, resamples: p.resamples, seed: p.seed, method: SEASONAL_METHOD, totals };
}
