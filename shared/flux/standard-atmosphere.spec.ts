import { pressureFromElevationKpa } from './standard-atmosphere';

describe('default pressure from elevation (U.S. Standard Atmosphere 1976 / ICAO Doc 7488)', () => {
  it.each([
    [0, 101.325],
    [1000, 89.8746],
    [2000, 79.4952],
    [3000, 70.1085],
  ])('at geopotential height %d m gives the tabulated %f kPa', (h, p) => {
    expect(pressureFromElevationKpa(h, { geopotential: true })).toBeCloseTo(p, 3);
  });

  it.each([
    [0, 101.325],
    [1000, 89.8763],
    [2000, 79.5014],
  ])('at geometric elevation %d m (map/GPS, the default) gives %f kPa', (z, p) => {
    expect(pressureFromElevationKpa(z)).toBeCloseTo(p, 3);
  });

  it('refuses elevations outside the troposphere layer or not numbers', () => {
    expect(pressureFromElevationKpa(15000)).toBeNaN();
    expect(pressureFromElevationKpa(Number.NaN)).toBeNaN();
  });
});
