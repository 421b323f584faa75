import { pieceSeries, splitByTaps, splitClosures, type TapWindow } from './closure-split';
import type { LoggerSample } from './logger-rows';

// A continuous 1 Hz log (the analyzer never stops between closures): ambient 420 ppm, rising
// 0.5 ppm/s while the chamber is closed at 10:02:13–10:04:13 and 10:08:13–10:10:13 (logger clock).
const T0 = Date.parse('2025-07-03T10:00:00Z');
const closedS = [
  [133, 253],
  [493, 613],
];
const sample = (i: number, closureId: string | null = null): LoggerSample => {
  const inside = closedS.find(([a, b]) => i >= a && i <= b);
  return {
    line: i + 2,
    atMs: T0 + i * 1000,
    elapsedS: null,
    co2Ppm: inside ? 420 + 0.5 * (i - inside[0]) : 420,
    h2oMmolMol: null,
    pressureKpa: null,
    tempC: 20,
    closureId,
  };
};
const continuous = Array.from({ length: 900 }, (_, i) => sample(i));
// The phone's taps, 73 s behind the logger, moved onto the logger's clock with that offset.
const OFFSET_MS = 73_000;
const tapsOnLogger: TapWindow[] = [
  { key: 'tap-a', onMs: T0 + 60_000 + OFFSET_MS, offMs: T0 + 180_000 + OFFSET_MS },
  { key: 'tap-b', onMs: T0 + 420_000 + OFFSET_MS, offMs: T0 + 540_000 + OFFSET_MS },
];

describe('splitting a logger file into closures', () => {
  it('when the log runs on between closures, then the taps (moved by the clock offset) cut out each closure and the rest is counted outside', () => {
    const split = splitClosures(continuous, { taps: tapsOnLogger });
    expect(split.method).toBe('taps');
    expect(split.pieces.map((p) => [p.key, p.firstLine, p.lastLine, p.samples.length])).toEqual([
      ['tap-a', 135, 255, 121],
      ['tap-b', 495, 615, 121],
    ]);
    expect(split.pieces[0].samples[0].co2Ppm).toBe(420);
    expect(split.pieces[0].samples[120].co2Ppm).toBe(480);
    expect(split.outside).toBe(900 - 242);
  });

  it('when the same continuous log has no taps, then gaps cannot split it and it stays one piece', () => {
    const split = splitClosures(continuous);
    expect(split.method).toBe('gaps');
    expect(split.pieces).toHaveLength(1);
  });

  it('when the offset is known only to a tenth of a second, then half a sampling step of slack keeps the edge samples', () => {
    const late = [{ ...tapsOnLogger[0], onMs: tapsOnLogger[0].onMs + 100, offMs: tapsOnLogger[0].offMs + 100 }];
    expect(splitByTaps(continuous, late).pieces[0].samples.length).toBe(120);
    expect(splitByTaps(continuous, late, 0.5).pieces[0].samples.length).toBe(121);
  });

  it('when the file has a closure id column, then it decides over the taps', () => {
    const labelled = continuous.map((s, i) =>
      closedS.some(([a, b]) => i >= a && i <= b) ? { ...s, closureId: i < 300 ? 'K1' : 'K2' } : s,
    );
    const split = splitClosures(labelled, { taps: tapsOnLogger });
    expect(split.method).toBe('closureId');
    expect(split.pieces.map((p) => p.key)).toEqual(['K1', 'K2']);
  });
});

describe('a closure series from a logger piece', () => {
  it('is marked co2IsDry only when the mapping says the CO2 column is already dry', () => {
    const piece = splitClosures(continuous.map((x) => ({ ...x, h2oMmolMol: 12 }))).pieces[0];
    expect(pieceSeries(piece, { co2: { column: 1, unit: 'µmol/mol (ppm)', dry: true } }).co2IsDry).toBe(true);
    expect(pieceSeries(piece, { co2: { column: 1, unit: 'µmol/mol (ppm)' } }).co2IsDry).toBeUndefined();
    expect(pieceSeries(piece).co2IsDry).toBeUndefined();
  });
});
