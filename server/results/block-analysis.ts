/**
 * The design's pairing factor in an additive linear model y = μ + cell + factor + ε, fitted by
 * ordinary least squares to the plot means of one campaign within one stratum of comparable cells
 * (randomised complete block analysis, e.g. Steel & Torrie 1980, Principles and Procedures of
 * Statistics, ch. 9 — citation from memory). Least squares, not a table of cell × block means, so
 * unbalanced strata (two plots of a cell in one block) and incomplete blocks keep every plot.
 * Strata and their factor:
 *  - plot-level treatments (collars without a collar-level treatment): the factor is the block;
 *  - collar-level treatments inside one plot-level treatment (a split plot): the collars of both
 *    treatments share a plot, so the pairing factor is the plot, not the block.
 * Each cell's least-squares mean averages the factor's levels with equal weight; its SE is
 * √(L·Cov·Lᵀ). Checked against statsmodels OLS (server/results/fixtures/statsmodels-blocks.json).
 */
import type { Cell, PlotMean } from './design-aggregation';

export interface BlockStratum {
  campaignId: string;
  stratum: string;
  /** The pairing factor of the stratum: blocks for plot-level treatments, plots for collar-level ones. */
  factor: 'block' | 'plot';
  cellKeys: string[];
  /** The factor's levels (block codes, or plot codes in a split-plot stratum). */
  blockCodes: string[];
  /** Each level's least-squares mean (over cells) minus the grand least-squares mean. */
  blockEffects: { blockCode: string; effectUmolM2S: number }[];
  /** Each cell's least-squares mean over the factor's levels, with its SE from the model. */
  lsMeans: { cellKey: string; meanUmolM2S: number; seUmolM2S: number | null }[];
  dfResidual: number;
  msResidual: number | null;
  /** SE of the cell means in a balanced stratum, √(MS residual / levels); per-cell SEs are in lsMeans. */
  seBlockUmolM2S: number | null;
}

export interface AdditiveFit {
  dfResidual: number;
  msResidual: number | null;
  lsMeans: Map<string, { mean: number; se: number | null }>;
  effects: Map<string, number>;
}

/** Inverse of a symmetric positive-definite matrix by Gauss–Jordan with partial pivoting; null when singular. */
function invert(a: number[][]): number[][] | null {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(1, ...a.map((r, i) => Math.abs(r[i])));
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (Math.abs(m[p][c]) < 1e-10 * scale) return null;
    [m[c], m[p]] = [m[p], m[c]];
    const d = m[c][c];
    for (let j = 0; j < 2 * n; j++) m[c][j] /= d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r][c];
      if (f !== 0) for (let j = 0; j < 2 * n; j++) m[r][j] -= f * m[c][j];
    }
  }
  return m.map((row) => row.slice(n));
}

/** OLS of y on intercept + cell dummies + factor dummies (treatment coding); null when the design is not estimable. */
export function fitAdditive(rows: readonly { cell: string; factor: string; y: number }[]): AdditiveFit | null {
  const cells = [...new Set(rows.map((r) => r.cell))].sort();
  const levels = [...new Set(rows.map((r) => r.factor))].sort();
  const p = 1 + (cells.length - 1) + (levels.length - 1);
  const row = (cell: string | null, level: string | null): number[] => {
    const x = [1];
    for (const c of cells.slice(1)) x.push(cell === null ? 1 / cells.length : c === cell ? 1 : 0);
    for (const l of levels.slice(1)) x.push(level === null ? 1 / levels.length : l === level ? 1 : 0);
    return x;
  };
  const xtx = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const xty = new Array<number>(p).fill(0);
  for (const r of rows) {
    const x = row(r.cell, r.factor);
    for (let i = 0; i < p; i++) {
      xty[i] += x[i] * r.y;
      for (let j = 0; j < p; j++) xtx[i][j] += x[i] * x[j];
    }
  }
  const inv = invert(xtx);
  if (!inv) return null;
  const beta = inv.map((r) => r.reduce((s, v, j) => s + v * xty[j], 0));
  const dot = (a: number[], b: number[]) => a.reduce((s, v, i) => s + v * b[i], 0);
  let rss = 0;
  for (const r of rows) rss += (r.y - dot(row(r.cell, r.factor), beta)) ** 2;
  const df = rows.length - p;
  const ms = df > 0 ? rss / df : null;
  const se = (l: number[]) =>
    ms === null
      ? null
      : Math.sqrt(
          ms *
            dot(
              l,
              inv.map((r) => dot(r, l)),
            ),
        );
  const grand = dot(row(null, null), beta);
  return {
    dfResidual: Math.max(df, 0),
    msResidual: ms,
    lsMeans: new Map(
      cells.map((c) => {
        const l = row(c, null);
        return [c, { mean: dot(l, beta), se: se(l) }];
      }),
    ),
    effects: new Map(levels.map((l) => [l, dot(row(null, l), beta) - grand])),
  };
}

function stratumOf(cell: Cell): { name: string; factor: 'block' | 'plot' } {
  return cell.collarTreatment
    ? { name: `collar-level within ${cell.plotTreatment?.code ?? 'none'}`, factor: 'plot' }
    : { name: 'plot-level', factor: 'block' };
}

export function blockAnalysis(plotMeans: readonly PlotMean[], cells: ReadonlyMap<string, Cell>): BlockStratum[] {
  const groups = new Map<string, { factor: 'block' | 'plot'; rows: { cell: string; factor: string; y: number }[] }>();
  for (const p of plotMeans) {
    const s = stratumOf(cells.get(p.cellKey)!);
    const level = s.factor === 'plot' ? p.plotCode : p.blockCode;
    if (level === null) continue;
    const key = `${p.campaignId}|${s.name}`;
    const g = groups.get(key) ?? { factor: s.factor, rows: [] };
    g.rows.push({ cell: p.cellKey, factor: level, y: p.fluxUmolM2S });
    groups.set(key, g);
  }
  const out: BlockStratum[] = [];
  for (const [key, g] of groups) {
    const [campaignId, stratum] = key.split('|');
    const cellKeys = [...new Set(g.rows.map((r) => r.cell))].sort();
    const levels = [...new Set(g.rows.map((r) => r.factor))].sort();
    const fit = cellKeys.length > 1 && levels.length > 1 ? fitAdditive(g.rows) : null;
    out.push({
      campaignId,
      stratum,
      factor: g.factor,
      cellKeys,
      blockCodes: levels,
      blockEffects: fit ? levels.map((l) => ({ blockCode: l, effectUmolM2S: fit.effects.get(l)! })) : [],
      lsMeans: fit ? cellKeys.map((c) => ({ cellKey: c, meanUmolM2S: fit.lsMeans.get(c)!.mean, seUmolM2S: fit.lsMeans.get(c)!.se })) : [],
      dfResidual: fit?.dfResidual ?? 0,
      msResidual: fit?.msResidual ?? null,
      seBlockUmolM2S: fit?.msResidual == null ? null : Math.sqrt(fit.msResidual / levels.length),
    });
  }
  return out;
}
