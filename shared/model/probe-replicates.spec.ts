import { readFileSync } from 'fs';
import { join } from 'path';
import { atProbeDepth, probeSummary, sampleStats } from './probe-replicates';

const reference = JSON.parse(readFileSync(join(__dirname, 'fixtures', 'python-replicate-stats.json'), 'utf8')) as {
  cases: { values: number[]; mean: number; sd: number }[];
};

const close = (a: number | null, b: number) => {
  expect(a).not.toBeNull();
  expect(Math.abs(a! - b)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(b)));
};

describe('replicate mean and sample SD', () => {
  // Reference: Python's statistics.mean / statistics.stdev (sample SD, n − 1 denominator; computed in
  // exact rational arithmetic), from tools/flux-reference/make-replicate-fixtures.py.
  it.each(reference.cases.map((c) => [c.values.join(', '), c] as const))('matches statistics.stdev for %s', (_name, c) => {
    const s = sampleStats(c.values);
    expect(s.n).toBe(c.values.length);
    close(s.mean, c.mean);
    close(s.sd, c.sd);
  });

  it('when there is one replicate, then its value is the mean and there is no SD; none gives no mean', () => {
    expect(sampleStats([21.5])).toEqual({ n: 1, mean: 21.5, sd: null });
    expect(sampleStats([])).toEqual({ n: 0, mean: null, sd: null });
  });

  it('by hand: 23, 25, 27 → mean 25, SD √((4 + 0 + 4) / 2) = 2 (sample SD, n − 1)', () => {
    expect(sampleStats([23, 25, 27])).toEqual({ n: 3, mean: 25, sd: 2 });
  });
});

describe('a visit’s probe replicates', () => {
  const rep = (id: string, vwcPct: number | null, temps: [number, number][]) => ({
    id,
    vwcPct,
    soilTemps: temps.map(([depthCm, tempC]) => ({ depthCm, tempC })),
  });

  it('when replicates are taken at the probe depth, then moisture and temperature are their means', () => {
    const s = probeSummary([rep('a', 20, [[5, 10]]), rep('b', 22, [[5, 11]]), rep('c', 24, [[5, 12]])], 5, 1);
    expect(s.vwc).toEqual({ n: 3, mean: 22, sd: 2 });
    expect(s.soilTemp).toEqual({ n: 3, mean: 11, sd: 1 });
    expect(s.offDepth).toEqual([]);
  });

  it("when a temperature is more than the site's ±1 cm from the probe depth, then it is flagged and left out of the mean", () => {
    const s = probeSummary(
      [
        rep('a', 20, [[5, 10]]),
        rep('b', null, [[5.5, 12]]),
        rep('c', 24, [
          [10, 4],
          [4, 11],
        ]),
      ],
      5,
      1,
    );
    // 5 and 5.5 and 4 are within ±1 cm of 5 cm; 10 cm is not.
    expect(s.soilTemp.n).toBe(3);
    expect(s.soilTemp.mean).toBeCloseTo(11, 12);
    expect(s.offDepth).toEqual([{ id: 'c', depthCm: 10, tempC: 4 }]);
    // A replicate without moisture does not count in the moisture n.
    expect(s.vwc).toEqual({ n: 2, mean: 22, sd: Math.sqrt(8) });
  });

  it('when one replicate has two depths within the tolerance, then only the one nearest the probe depth counts', () => {
    const s = probeSummary(
      [
        rep('a', null, [
          [4.5, 9],
          [5, 10],
        ]),
        rep('b', null, [[5, 12]]),
      ],
      5,
      1,
    );
    expect(s.soilTemp).toEqual({ n: 2, mean: 11, sd: Math.sqrt(2) });
    expect(s.offDepth).toEqual([]);
  });

  it('exactly at the tolerance counts as at depth (the boundary is inclusive)', () => {
    const s = probeSummary([rep('a', null, [[6, 10]]), rep('b', null, [[3.9, 12]])], 5, 1);
    expect(s.soilTemp.n).toBe(1);
    expect(s.offDepth).toEqual([{ id: 'b', depthCm: 3.9, tempC: 12 }]);
  });

  // The tolerance is the site's: practitioners set it from how well their thermometer's depth can
  // be placed (common practice; no published value).
  it('when the site allows ±2 cm, then a temperature 1.5 cm off counts; at ±1 cm it is flagged and left out', () => {
    const reps = [rep('a', null, [[5, 10]]), rep('b', null, [[6.5, 14]]), rep('c', null, [[2.5, 20]])];
    const wide = probeSummary(reps, 5, 2);
    expect(wide.soilTemp).toEqual({ n: 2, mean: 12, sd: Math.sqrt(8) });
    expect(wide.offDepth).toEqual([{ id: 'c', depthCm: 2.5, tempC: 20 }]);
    const narrow = probeSummary(reps, 5, 1);
    expect(narrow.soilTemp).toEqual({ n: 1, mean: 10, sd: null });
    expect(narrow.offDepth.map((o) => o.id)).toEqual(['b', 'c']);
  });

  it('when the tolerance is 0 cm, then only a temperature exactly at the probe depth counts (decimal input still matches)', () => {
    expect(atProbeDepth(5, 5, 0)).toBe(true);
    expect(atProbeDepth(0.1 + 0.2, 0.3, 0)).toBe(true);
    expect(atProbeDepth(5.1, 5, 0)).toBe(false);
    expect(atProbeDepth(3, 5, 2)).toBe(true);
    expect(atProbeDepth(2.9, 5, 2)).toBe(false);
  });
});
