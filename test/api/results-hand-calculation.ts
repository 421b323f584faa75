export interface HandRow {
  closureId: string;
  flux: number;
  visitId: string;
  collarId: string;
  campaignId: string;
  plotId: string;
  blockCode: string | null;
  plotTreatment: string | null;
  collarTreatment: string | null;
}

/**
 * The hand calculation, written out plainly and apart from the server's code: closures → visit mean
 * → collar mean over its visits in the campaign → plot mean over its collars in the cell → cell
 * mean and SE = SD / √n over plots (n = plots; never closures or collars).
 */
export function handTreatmentMeans(rows: HandRow[]): Map<string, { mean: number; se: number | null; nPlots: number; nCollars: number }> {
  const avg = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const push = <T>(m: Map<string, T[]>, k: string, v: T) => {
    const l = m.get(k);
    if (l) l.push(v);
    else m.set(k, [v]);
  };
  const visits = new Map<string, HandRow[]>();
  for (const r of rows) push(visits, r.visitId, r);
  const collars = new Map<string, { flux: number[]; row: HandRow }>();
  for (const vs of visits.values()) {
    const r = vs[0];
    const key = `${r.campaignId}|${r.collarId}`;
    const c = collars.get(key) ?? { flux: [], row: r };
    c.flux.push(avg(vs.map((x) => x.flux)));
    collars.set(key, c);
  }
  const plots = new Map<string, { flux: number[]; row: HandRow }>();
  for (const c of collars.values()) {
    const r = c.row;
    const key = `${r.campaignId}|${r.plotTreatment ?? 'none'}|${r.collarTreatment ?? 'none'}|${r.plotId}`;
    const p = plots.get(key) ?? { flux: [], row: r };
    p.flux.push(avg(c.flux));
    plots.set(key, p);
  }
  const cells = new Map<string, { plotMeans: number[]; nCollars: number }>();
  for (const p of plots.values()) {
    const r = p.row;
    const key = `${r.campaignId}|${r.plotTreatment ?? 'none'}|${r.collarTreatment ?? 'none'}`;
    const c = cells.get(key) ?? { plotMeans: [], nCollars: 0 };
    c.plotMeans.push(avg(p.flux));
    c.nCollars += p.flux.length;
    cells.set(key, c);
  }
  const out = new Map<string, { mean: number; se: number | null; nPlots: number; nCollars: number }>();
  for (const [k, c] of cells) {
    const m = avg(c.plotMeans);
    const n = c.plotMeans.length;
    const sd = n > 1 ? Math.sqrt(c.plotMeans.reduce((a, x) => a + (x - m) ** 2, 0) / (n - 1)) : null;
    out.set(k, { mean: m, se: sd === null ? null : sd / Math.sqrt(n), nPlots: n, nCollars: c.nCollars });
  }
  return out;
}
