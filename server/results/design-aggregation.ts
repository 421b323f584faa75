/**
 * Aggregation along the experimental design: accepted closures → visit mean → collar (mean of its
 * visits in a campaign) → plot (mean of its collars in one treatment cell: the replicate) →
 * treatment cell mean ± SE over plots. Collars and closures are never replicates: n of a cell is
 * its number of plots. Soil temperature and moisture ride along through the same means.
 *
 * A treatment cell is a plot-level treatment together with the collar-level treatment of the
 * collars (e.g. control plots · trenched collars); plots carry the replicate in both cases, so a
 * collar-level comparison (trenched vs untrenched inside the same plots) is paired by plot.
 * Hierarchical means of this kind are common practice in field ecology (e.g. Hurlbert 1984,
 * Ecol. Monogr. 54:187–211 on pseudoreplication — citation from memory).
 */
import { blockAnalysis, type BlockStratum } from './block-analysis';
import { mean, meanOrNull, sd } from './stats';

export interface ClosureIn {
  closureId: string;
  visitId: string;
  fluxUmolM2S: number;
}
/** A visit's probe replicates: mean (soilTempC, vwcPct), SD and n, and temperatures left out for their depth. */
export interface VisitProbeStats {
  soilTempSdC: number | null;
  soilTempN: number;
  vwcSdPct: number | null;
  vwcN: number;
  offDepthN: number;
}
export interface VisitIn {
  visitId: string;
  collarId: string;
  campaignId: string;
  round: number;
  arrivedAt: string;
  soilTempC: number | null;
  vwcPct: number | null;
  probe?: VisitProbeStats;
}
export interface TreatmentRef {
  id: string;
  code: string;
  name: string;
}
export interface CollarIn {
  collarId: string;
  collarCode: string;
  plotId: string;
  collarTreatment: TreatmentRef | null;
}
export interface PlotIn {
  plotId: string;
  plotCode: string;
  blockId: string | null;
  blockCode: string | null;
  plotTreatment: TreatmentRef | null;
}
export interface CampaignIn {
  campaignId: string;
  name: string;
  startsOn: string;
  endsOn: string;
}

export interface DesignInput {
  closures: ClosureIn[];
  visits: VisitIn[];
  collars: CollarIn[];
  plots: PlotIn[];
  campaigns: CampaignIn[];
}

export interface VisitMean {
  visitId: string;
  collarId: string;
  plotId: string;
  cellKey: string;
  campaignId: string;
  round: number;
  arrivedAt: string;
  nClosures: number;
  fluxUmolM2S: number;
  soilTempC: number | null;
  vwcPct: number | null;
  probe?: VisitProbeStats;
}
export interface CollarMean {
  collarId: string;
  plotId: string;
  cellKey: string;
  campaignId: string;
  nVisits: number;
  nClosures: number;
  fluxUmolM2S: number;
  soilTempC: number | null;
  vwcPct: number | null;
}
export interface PlotMean {
  plotId: string;
  plotCode: string;
  blockCode: string | null;
  cellKey: string;
  campaignId: string;
  nCollars: number;
  nVisits: number;
  nClosures: number;
  fluxUmolM2S: number;
  soilTempC: number | null;
  vwcPct: number | null;
}
export interface Cell {
  key: string;
  label: string;
  level: 'plot' | 'collar';
  plotTreatment: TreatmentRef | null;
  collarTreatment: TreatmentRef | null;
}
export interface CellMean {
  cellKey: string;
  campaignId: string;
  nPlots: number;
  nCollars: number;
  nVisits: number;
  nClosures: number;
  meanUmolM2S: number;
  sdUmolM2S: number | null;
  seUmolM2S: number | null;
  /** SE of the cell's least-squares mean in the additive cell + block (or, for collar-level cells, cell + plot) model. */
  seBlockUmolM2S: number | null;
  soilTempC: number | null;
  vwcPct: number | null;
}

export interface DesignAggregate {
  cells: Cell[];
  visitMeans: VisitMean[];
  collarMeans: CollarMean[];
  plotMeans: PlotMean[];
  cellMeans: CellMean[];
  blockStrata: BlockStratum[];
}

const NONE = 'none';

export function cellOf(plot: PlotIn, collar: CollarIn): Cell {
  const p = plot.plotTreatment;
  const c = collar.collarTreatment;
  const key = `${p?.code ?? NONE}|${c?.code ?? NONE}`;
  const label = c ? `${p?.code ?? 'no plot treatment'} · ${c.code}` : (p?.code ?? 'no treatment');
  return { key, label, level: c ? 'collar' : 'plot', plotTreatment: p, collarTreatment: c };
}

function groupBy<T>(items: readonly T[], key: (t: T) => string): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const it of items) {
    const k = key(it);
    const list = m.get(k);
    if (list) list.push(it);
    else m.set(k, [it]);
  }
  return m;
}

const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);

export function aggregateDesign(input: DesignInput): DesignAggregate {
  const collars = new Map(input.collars.map((c) => [c.collarId, c]));
  const plots = new Map(input.plots.map((p) => [p.plotId, p]));
  const cells = new Map<string, Cell>();
  const byVisit = groupBy(input.closures, (c) => c.visitId);

  const visitMeans: VisitMean[] = [];
  for (const v of input.visits) {
    const closures = byVisit.get(v.visitId);
    const collar = collars.get(v.collarId);
    const plot = collar && plots.get(collar.plotId);
    if (!closures?.length || !collar || !plot) continue;
    const cell = cellOf(plot, collar);
    cells.set(cell.key, cell);
    visitMeans.push({
      visitId: v.visitId,
      collarId: v.collarId,
      plotId: plot.plotId,
      cellKey: cell.key,
      campaignId: v.campaignId,
      round: v.round,
      arrivedAt: v.arrivedAt,
      nClosures: closures.length,
      fluxUmolM2S: mean(closures.map((c) => c.fluxUmolM2S)),
      soilTempC: v.soilTempC,
      vwcPct: v.vwcPct,
      probe: v.probe,
    });
  }

  const collarMeans: CollarMean[] = [...groupBy(visitMeans, (v) => `${v.campaignId}|${v.collarId}`).values()].map((vs) => ({
    collarId: vs[0].collarId,
    plotId: vs[0].plotId,
    cellKey: vs[0].cellKey,
    campaignId: vs[0].campaignId,
    nVisits: vs.length,
    nClosures: sum(vs.map((v) => v.nClosures)),
    fluxUmolM2S: mean(vs.map((v) => v.fluxUmolM2S)),
    soilTempC: meanOrNull(vs.map((v) => v.soilTempC)),
    vwcPct: meanOrNull(vs.map((v) => v.vwcPct)),
  }));

  const plotMeans: PlotMean[] = [...groupBy(collarMeans, (c) => `${c.campaignId}|${c.cellKey}|${c.plotId}`).values()].map((cs) => {
    const plot = plots.get(cs[0].plotId)!;
    return {
      plotId: plot.plotId,
      plotCode: plot.plotCode,
      blockCode: plot.blockCode,
      cellKey: cs[0].cellKey,
      campaignId: cs[0].campaignId,
      nCollars: cs.length,
      nVisits: sum(cs.map((c) => c.nVisits)),
      nClosures: sum(cs.map((c) => c.nClosures)),
      fluxUmolM2S: mean(cs.map((c) => c.fluxUmolM2S)),
      soilTempC: meanOrNull(cs.map((c) => c.soilTempC)),
      vwcPct: meanOrNull(cs.map((c) => c.vwcPct)),
    };
  });

  const blockStrata = blockAnalysis(plotMeans, cells);
  const seBlock = new Map<string, number | null>();
  for (const s of blockStrata) for (const m of s.lsMeans) seBlock.set(`${s.campaignId}|${m.cellKey}`, m.seUmolM2S);

  const cellMeans: CellMean[] = [...groupBy(plotMeans, (p) => `${p.campaignId}|${p.cellKey}`).entries()].map(([key, ps]) => {
    const y = ps.map((p) => p.fluxUmolM2S);
    const s = ps.length > 1 ? sd(y) : null;
    return {
      cellKey: ps[0].cellKey,
      campaignId: ps[0].campaignId,
      nPlots: ps.length,
      nCollars: sum(ps.map((p) => p.nCollars)),
      nVisits: sum(ps.map((p) => p.nVisits)),
      nClosures: sum(ps.map((p) => p.nClosures)),
      meanUmolM2S: mean(y),
      sdUmolM2S: s,
      seUmolM2S: s === null ? null : s / Math.sqrt(ps.length),
      seBlockUmolM2S: seBlock.get(key) ?? null,
      soilTempC: meanOrNull(ps.map((p) => p.soilTempC)),
      vwcPct: meanOrNull(ps.map((p) => p.vwcPct)),
    };
  });

  const order = new Map(input.campaigns.map((c, i) => [c.campaignId, i]));
  const cellList = [...cells.values()].sort((a, b) => a.key.localeCompare(b.key));
  const cellOrder = new Map(cellList.map((c, i) => [c.key, i]));
  cellMeans.sort(
    (a, b) => (order.get(a.campaignId) ?? 0) - (order.get(b.campaignId) ?? 0) || cellOrder.get(a.cellKey)! - cellOrder.get(b.cellKey)!,
  );
  return { cells: cellList, visitMeans, collarMeans, plotMeans, cellMeans, blockStrata };
}
