import { hasSpike, neighbourDeviationScale } from './spike-check';
import { gaussian, seededRandom } from './test-closures';

/**
 * The deviation of a sample from its neighbours' line is half the second difference; for white
 * noise of SD σ the second difference has SD √6·σ (variance 1 + 4 + 1), so the deviation has SD
 * √1.5·σ (elementary variance algebra). The robust scale (1.4826 × median |d|, Hampel 1974,
 * J. Am. Stat. Assoc. 69) must estimate that, not σ itself.
 */
describe('spike check: scale of the deviation from the neighbours’ line', () => {
  const n = 20000;
  const rand = seededRandom(77);
  const t = Array.from({ length: n }, (_, i) => i);
  const y = t.map((x) => 400 + 0.5 * x + 2 * gaussian(rand)); // σ = 2 ppm on a straight rise

  it('estimates √1.5·σ for white noise (within 3 %)', () => {
    expect(neighbourDeviationScale(t, y, n) / (Math.sqrt(1.5) * 2)).toBeCloseTo(1, 1);
    expect(Math.abs(neighbourDeviationScale(t, y, n) / (Math.sqrt(1.5) * 2) - 1)).toBeLessThan(0.03);
  });

  it('flags a spike of 12 σ and not one of 8 σ (limit 8·√1.5 σ ≈ 9.8 σ)', () => {
    const m = 150;
    const base = y.slice(0, m);
    const tt = t.slice(0, m);
    const with12 = base.slice();
    with12[70] += 24;
    expect(hasSpike(tt, with12, m, 0.1, 8, 5)).toBe(true);
    const with8 = base.slice();
    with8[70] += 16;
    expect(hasSpike(tt, with8, m, 0.1, 8, 5)).toBe(false);
  });
});
