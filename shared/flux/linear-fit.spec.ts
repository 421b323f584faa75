import { fitLinearRaw } from './linear-fit';
import { fitQuadraticRaw } from './quadratic-fit';

describe('linear and quadratic regression', () => {
  it('ordinary least squares recovers a known line and its residual sum of squares', () => {
    // y = 2 + 3x with residuals +1, −1, −1, +1: the fit is unchanged, RSS = 4.
    const x = [0, 1, 2, 3];
    const y = [3, 4, 7, 12];
    const fit = fitLinearRaw(x, y, 4)!;
    expect(fit.slope).toBeCloseTo(3, 12);
    expect(fit.intercept).toBeCloseTo(2, 12);
    expect(fit.rss).toBeCloseTo(4, 12);
  });

  it('returns null when all samples share one time', () => {
    expect(fitLinearRaw([5, 5, 5], [1, 2, 3], 3)).toBeNull();
  });

  it('quadratic regression gives the slope at t0 as b1 (Wagner, Reicosky & Alessi 1997, Agron. J. 89)', () => {
    const x = Array.from({ length: 30 }, (_, i) => i * 4);
    const y = x.map((t) => 400 + 1.5 * t - 0.004 * t * t);
    const fit = fitQuadraticRaw(x, y, x.length, x[x.length - 1])!;
    expect(fit.b0).toBeCloseTo(400, 8);
    expect(fit.b1).toBeCloseTo(1.5, 10);
    expect(fit.b2).toBeCloseTo(-0.004, 12);
    expect(fit.rss).toBeLessThan(1e-15);
  });
});
