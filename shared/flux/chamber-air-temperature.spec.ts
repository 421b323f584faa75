import { chamberAirTemperature, DEFAULT_SITE_AIR_TEMP_C } from './chamber-air-temperature';
import { fitClosure } from './closure-fit';
import { syntheticClosure } from './test-closures';

describe('Chamber air temperature: file, then visit, then site default', () => {
  it('uses the file column when it has a value, else the visit, else the site default', () => {
    expect(chamberAirTemperature([null, 21.5], 12, 15)).toEqual({ ok: true, tempC: [null, 21.5], source: 'series' });
    expect(chamberAirTemperature([null, null], 12, 15)).toEqual({ ok: true, tempC: 12, source: 'visit' });
    expect(chamberAirTemperature(null, null, 15)).toEqual({ ok: true, tempC: 15, source: 'site-default' });
    expect(chamberAirTemperature(null, null, null).ok).toBe(false);
  });

  it('the documented default is the US Standard Atmosphere 1976 sea-level temperature, 288.15 K', () => {
    expect(DEFAULT_SITE_AIR_TEMP_C + 273.15).toBeCloseTo(288.15, 12);
  });

  it('a visit temperature gives the ideal-gas flux at that temperature and is flagged', () => {
    // flux ∝ 1/T (ideal gas law): 5 °C instead of 25 °C raises it by 298.15/278.15.
    const c = syntheticClosure({ points: 121, dtS: 1, settleS: 20, c0: 420, slope: 0.5, p3: 0 });
    const at = (tempC: number, tempSource?: 'visit') =>
      fitClosure({ ...c, pressureKpa: 100, tempC, volumeCm3: 4000, areaCm2: 314.16, settleS: 20, tempSource });
    const warm = at(25);
    const cold = at(5, 'visit');
    expect(cold.selected!.fluxUmolM2S / warm.selected!.fluxUmolM2S).toBeCloseTo(298.15 / 278.15, 9);
    expect(cold.flags).toContain('temp-from-visit');
    expect(warm.flags).not.toContain('temp-from-visit');
  });
});
