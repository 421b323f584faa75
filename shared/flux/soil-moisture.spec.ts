import { polynomialVwc, toppVwc } from './soil-moisture';

describe('soil moisture', () => {
  it.each([
    [5, 0.0797875],
    [10, 0.1883],
    [20, 0.3454],
    [30, 0.4441],
    [40, 0.5102],
  ])('Topp, Davis & Annan (1980, Water Resour. Res. 16:574–582): Ka = %d gives θv = %f', (ka, theta) => {
    expect(toppVwc(ka)).toBeCloseTo(theta, 6);
  });

  it('clamps Topp at 0 where the polynomial turns negative (Ka = 1, air: −0.024346)', () => {
    expect(toppVwc(1)).toBe(0);
  });

  it('evaluates a site calibration polynomial with ascending coefficients, clamped at 0', () => {
    // θ = 0.05 + 0.02·x − 0.0001·x²
    expect(polynomialVwc(10, [0.05, 0.02, -0.0001])).toBeCloseTo(0.24, 12);
    expect(polynomialVwc(-10, [0.05, 0.02])).toBe(0);
    expect(polynomialVwc(3, [])).toBeNaN();
  });
});
