import { aggregateDesign, type ClosureIn, type DesignInput, type VisitIn } from './design-aggregation';

/**
 * A design small enough to aggregate by hand: blocks B1, B2; plot-level treatments A and B; plot
 * treatment C whose collars carry collar-level treatments X and Y (one of each per plot).
 */
function design(): DesignInput {
  const t = (code: string) => ({ id: `t-${code}`, code, name: code });
  const plots = [
    ['P1', 'B1', 'A'],
    ['P2', 'B1', 'B'],
    ['P3', 'B2', 'A'],
    ['P4', 'B2', 'B'],
    ['P5', 'B1', 'C'],
    ['P6', 'B2', 'C'],
  ].map(([p, b, tr]) => ({ plotId: p, plotCode: p, blockId: b, blockCode: b, plotTreatment: t(tr) }));
  const collars = [
    ['c1', 'P1', null],
    ['c2', 'P1', null],
    ['c3', 'P2', null],
    ['c4', 'P3', null],
    ['c5', 'P4', null],
    ['c6', 'P4', null],
    ['x1', 'P5', 'X'],
    ['y1', 'P5', 'Y'],
    ['x2', 'P6', 'X'],
    ['y2', 'P6', 'Y'],
  ].map(([c, p, ct]) => ({ collarId: c!, collarCode: c!, plotId: p!, collarTreatment: ct ? t(ct) : null }));
  const visit = (visitId: string, collarId: string, round: number, soilTempC: number | null = null): VisitIn => ({
    visitId,
    collarId,
    campaignId: 'K',
    round,
    arrivedAt: '2026-06-01T08:00:00Z',
    soilTempC,
    vwcPct: null,
  });
  const visits = [
    visit('v1', 'c1', 1, 10),
    visit('v1b', 'c1', 2, 14),
    visit('v2', 'c2', 1),
    visit('v3', 'c3', 1),
    visit('v4', 'c4', 1),
    visit('v5', 'c5', 1),
    visit('v6', 'c6', 1),
    visit('vx1', 'x1', 1),
    visit('vy1', 'y1', 1),
    visit('vx2', 'x2', 1),
    visit('vy2', 'y2', 1),
    visit('vskip', 'c3', 2),
  ];
  const fluxes: [string, number][] = [
    ['v1', 2],
    ['v1', 4],
    ['v1b', 5],
    ['v2', 2],
    ['v3', 6],
    ['v4', 5],
    ['v5', 8],
    ['v6', 10],
    ['vx1', 1],
    ['vy1', 3],
    ['vx2', 2],
    ['vy2', 5],
  ];
  const closures: ClosureIn[] = fluxes.map(([visitId, f], i) => ({ closureId: `k${i}`, visitId, fluxUmolM2S: f }));
  return { plots, collars, visits, closures, campaigns: [{ campaignId: 'K', name: 'K', startsOn: '2026-06-01', endsOn: '2026-06-01' }] };
}

describe('aggregation along the experimental design (hand calculation)', () => {
  const agg = aggregateDesign(design());
  const cell = (key: string) => agg.cellMeans.find((c) => c.cellKey === key)!;

  it('when a collar has two closures in one visit and a second round, then visits, not closures, are averaged up to the collar', () => {
    // v1 = (2 + 4)/2 = 3; collar c1 = (3 + 5)/2 = 4 (a closure-weighted mean would give 3.67).
    expect(agg.visitMeans.find((v) => v.visitId === 'v1')!.fluxUmolM2S).toBe(3);
    expect(agg.collarMeans.find((c) => c.collarId === 'c1')!.fluxUmolM2S).toBe(4);
    expect(agg.collarMeans.find((c) => c.collarId === 'c1')!.soilTempC).toBe(12);
    // Plot P1 = mean of collars (4 + 2)/2 = 3.
    expect(agg.plotMeans.find((p) => p.plotId === 'P1')!.fluxUmolM2S).toBe(3);
  });

  it('when plot-level treatments are summarised, then n is the number of plots and SE is SD over plots / √plots', () => {
    // A: plots 3 and 5 → mean 4, SD √2, SE 1. B: plots 6 and 9 → mean 7.5, SD √4.5, SE 1.5.
    expect(cell('A|none')).toMatchObject({ nPlots: 2, nCollars: 3, nVisits: 4, nClosures: 5, meanUmolM2S: 4 });
    expect(cell('A|none').seUmolM2S).toBeCloseTo(1, 12);
    expect(cell('B|none').meanUmolM2S).toBe(7.5);
    expect(cell('B|none').sdUmolM2S).toBeCloseTo(Math.sqrt(4.5), 12);
    expect(cell('B|none').seUmolM2S).toBeCloseTo(1.5, 12);
  });

  it('when collars inside the same plots carry a collar-level treatment, then each of its cells is replicated by plots', () => {
    // C·X: plots 1 and 2 → mean 1.5, SE 0.5; C·Y: 3 and 5 → mean 4, SE 1.
    expect(cell('C|X')).toMatchObject({ nPlots: 2, nCollars: 2, meanUmolM2S: 1.5 });
    expect(cell('C|X').seUmolM2S).toBeCloseTo(0.5, 12);
    expect(cell('C|Y').meanUmolM2S).toBe(4);
    expect(cell('C|Y').seUmolM2S).toBeCloseTo(1, 12);
    expect(agg.cells.find((c) => c.key === 'C|X')).toMatchObject({ level: 'collar', label: 'C · X' });
  });

  it('when blocks are a factor, then the additive cell + block model gives MS residual and block effects by hand', () => {
    // Plot stratum: A (B1 3, B2 5), B (B1 6, B2 9); grand 5.75; residuals ±0.25 → SS 0.25, df 1, SE = √(0.25/2).
    const plot = agg.blockStrata.find((s) => s.stratum === 'plot-level')!;
    expect(plot.cellKeys).toEqual(['A|none', 'B|none']);
    expect(plot.dfResidual).toBe(1);
    expect(plot.msResidual).toBeCloseTo(0.25, 12);
    expect(plot.blockEffects).toEqual([
      { blockCode: 'B1', effectUmolM2S: -1.25 },
      { blockCode: 'B2', effectUmolM2S: 1.25 },
    ]);
    expect(cell('A|none').seBlockUmolM2S).toBeCloseTo(Math.sqrt(0.125), 12);
    // Collar stratum inside C: X (1, 2), Y (3, 5); grand 2.75; residuals ±0.25 as well.
    const collar = agg.blockStrata.find((s) => s.stratum === 'collar-level within C')!;
    expect(collar.msResidual).toBeCloseTo(0.25, 12);
    expect(cell('C|Y').seBlockUmolM2S).toBeCloseTo(Math.sqrt(0.125), 12);
  });

  it('when a visit has no accepted closure, then it does not count', () => {
    expect(agg.visitMeans.some((v) => v.visitId === 'vskip')).toBe(false);
    expect(cell('B|none').nVisits).toBe(3);
  });
});
