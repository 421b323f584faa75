/**
 * Block as a factor: an additive two-way model y = μ + cell + block + ε fitted to the plot means
 * of one campaign, within one stratum of comparable cells (randomised complete block analysis,
 * e.g. Steel & Torrie 1980, Principles and Procedures of Statistics, ch. 9 — citation from memory).
 * Strata: cells of plot-level treatments on collars without a collar-level treatment; and, per
 * plot-level treatment, its collar-level cells (their plots pair them, so there the "blocks" are
 * the blocks of those plots). The block-adjusted SE of a cell mean is √(MS residual / blocks).
 */
import type { Cell, PlotMean } from './design-aggregation';
import { mean } from './stats';

export interface BlockStratum {
  campaignId: string;
  stratum: string;
  cellKeys: string[];
  blockCodes: string[];
  /** Block mean minus the stratum's grand mean, per block (the block effect). */
  blockEffects: { blockCode: string; effectUmolM2S: number }[];
  dfResidual: number;
  msResidual: number | null;
  seBlockUmolM2S: number | null;
}

function stratumOf(cell: Cell): string {
  return cell.collarTreatment ? `collar-level within ${cell.plotTreatment?.code ?? 'none'}` : 'plot-level';
}

export function blockAnalysis(plotMeans: readonly PlotMean[], cells: ReadonlyMap<string, Cell>): BlockStratum[] {
  const groups = new Map<string, PlotMean[]>();
  for (const p of plotMeans) {
    if (p.blockCode === null) continue;
    const key = `${p.campaignId}|${stratumOf(cells.get(p.cellKey)!)}`;
    groups.set(key, [...(groups.get(key) ?? []), p]);
  }
  const out: BlockStratum[] = [];
  for (const [key, ps] of groups) {
    const [campaignId, stratum] = key.split('|');
    // A cell × block table with one value per pair (plots of a cell inside one block are averaged).
    const y = new Map<string, Map<string, number[]>>();
    for (const p of ps) {
      const row = y.get(p.cellKey) ?? new Map<string, number[]>();
      row.set(p.blockCode!, [...(row.get(p.blockCode!) ?? []), p.fluxUmolM2S]);
      y.set(p.cellKey, row);
    }
    const cellKeys = [...y.keys()].sort();
    // Only blocks where every cell of the stratum was measured keep the table complete.
    const blockCodes = [...new Set(ps.map((p) => p.blockCode!))].filter((b) => cellKeys.every((c) => y.get(c)!.has(b))).sort();
    const t = cellKeys.length;
    const b = blockCodes.length;
    const cellOf = (c: string, bl: string) => mean(y.get(c)!.get(bl)!);
    const all = cellKeys.flatMap((c) => blockCodes.map((bl) => cellOf(c, bl)));
    const grand = all.length ? mean(all) : NaN;
    const cellMean = new Map(cellKeys.map((c) => [c, mean(blockCodes.map((bl) => cellOf(c, bl)))]));
    const blockMean = new Map(blockCodes.map((bl) => [bl, mean(cellKeys.map((c) => cellOf(c, bl)))]));
    const df = (t - 1) * (b - 1);
    let ss = 0;
    for (const c of cellKeys) for (const bl of blockCodes) ss += (cellOf(c, bl) - cellMean.get(c)! - blockMean.get(bl)! + grand) ** 2;
    const ms = df > 0 ? ss / df : null;
    out.push({
      campaignId, stratum, cellKeys, blockCodes, dfResidual: Math.max(df, 0), msResidual: ms,
      blockEffects: b > 0 && t > 0 ? blockCodes.map((bl) => ({ blockCode: bl, effectUmolM2S: blockMean.get(bl)! - grand })) : [],
      seBlockUmolM2S: ms === null ? null : Math.sqrt(ms / b),
    });
  }
  return out;
}
