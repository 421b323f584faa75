import { probeFlags } from './probe-plausibility';

// Ranges are common practice for gross-error range tests (see probe-plausibility.ts).
describe('probe plausibility flags', () => {
  it('flags a 5 cm soil temperature of 65 °C and a VWC of 99 %, and nothing in a normal reading', () => {
    expect(probeFlags({ soilTemps: [{ depthCm: 5, tempC: 65 }], moistureRaw: 99, moistureKind: 'vwc' })).toEqual([
      'soil-temp-implausible',
      'vwc-implausible',
    ]);
    expect(
      probeFlags({
        soilTemps: [
          { depthCm: 5, tempC: 14.2 },
          { depthCm: 10, tempC: 12 },
        ],
        moistureRaw: 28,
        moistureKind: 'vwc',
      }),
    ).toEqual([]);
  });
  it('leaves the top centimetre alone, judges permittivity on its own range and calibrated VWC on the VWC range', () => {
    expect(probeFlags({ soilTemps: [{ depthCm: 1, tempC: 62 }], moistureRaw: null, moistureKind: null })).toEqual([]);
    expect(probeFlags({ soilTemps: [], moistureRaw: 85, moistureKind: 'permittivity', vwcPct: 70 })).toEqual([
      'vwc-implausible',
      'permittivity-implausible',
    ]);
    expect(probeFlags({ soilTemps: [{ depthCm: 10, tempC: -31 }], moistureRaw: 20, moistureKind: 'permittivity', vwcPct: 34 })).toEqual([
      'soil-temp-implausible',
    ]);
  });
  it('flags a temperature further than the site tolerance from the site probe depth, and none within it', () => {
    const at = (depthCm: number, toleranceCm: number) =>
      probeFlags({ soilTemps: [{ depthCm, tempC: 9 }], moistureRaw: null, moistureKind: null, probeDepth: { depthCm: 5, toleranceCm } });
    expect(at(10, 1)).toEqual(['soil-temp-off-depth']);
    expect(at(6, 1)).toEqual([]);
    expect(at(6.5, 1)).toEqual(['soil-temp-off-depth']);
    expect(at(6.5, 2)).toEqual([]);
    expect(at(7.5, 2)).toEqual(['soil-temp-off-depth']);
    expect(probeFlags({ soilTemps: [{ depthCm: 10, tempC: 9 }], moistureRaw: null, moistureKind: null })).toEqual([]);
  });
});
