import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { splitClosures } from './closure-split';
import { suggestMapping, type LoggerMapping } from './logger-mapping';
import { readLoggerRows } from './logger-rows';
import { guessLayout, splitRows } from './logger-text';

const fixture = (name: string) => readFileSync(join(__dirname, '../../test/fixtures/logger', name), 'utf8');

function read(name: string, timeZone: string, adjust: (m: LoggerMapping) => LoggerMapping = (m) => m) {
  const text = fixture(name);
  const layout = guessLayout(text);
  const mapping = adjust(suggestMapping(layout.headers, layout, timeZone)!);
  return { layout, mapping, ...readLoggerRows(splitRows(text, mapping.delimiter), mapping) };
}

describe('reading logger files we make (test/fixtures/logger)', () => {
  it('when a file uses semicolons and decimal commas after a preamble, then both are detected and the numbers read as decimals', () => {
    const r = read('semicolon-decimal-comma.csv', 'Europe/Berlin', (m) => ({
      ...m,
      time: { kind: 'timestamp', column: 0, format: 'DD.MM.YYYY HH:mm:ss', timeZone: 'Europe/Berlin' },
    }));
    expect(r.layout).toMatchObject({ delimiter: ';', decimalComma: true, headerRow: 2 });
    expect(r.layout.headers).toEqual(['timestamp', 'co2_ppm', 'h2o_mmol_mol', 'pressure_kpa', 'temp_c']);
    expect(r.problems).toEqual([]);
    expect(r.samples).toHaveLength(61);
    // 12.06.2025 09:14:00 in Berlin is summer time, UTC+2.
    expect(new Date(r.samples[0].atMs!).toISOString()).toBe('2025-06-12T07:14:00.000Z');
    expect(r.samples[1]).toMatchObject({ line: 5, co2Ppm: 416.52, h2oMmolMol: 14.21, pressureKpa: 97.81, tempC: 18.405 });
  });

  it('when a tab file gives elapsed seconds and temperature in kelvin, then two closures split where the time starts again', () => {
    const r = read('tab-elapsed.txt', 'UTC', (m) => ({ ...m, temp: { column: 4, unit: 'K' } }));
    expect(r.layout).toMatchObject({ delimiter: '\t', decimalComma: false, headerRow: 0 });
    expect(r.mapping.time).toEqual({ kind: 'elapsed', column: 0, unit: 's' });
    expect(r.samples[0]).toMatchObject({ atMs: null, elapsedS: 0, co2Ppm: 418, pressureKpa: 99.2 });
    expect(r.samples[0].tempC).toBeCloseTo(18.4, 10); // 291.55 K − 273.15
    const split = splitClosures(r.samples);
    expect(split.method).toBe('gaps');
    expect(split.pieces.map((p) => [p.firstLine, p.lastLine, p.samples.length])).toEqual([
      [2, 47, 46],
      [48, 93, 46],
    ]);
  });

  it('when wall times repeat the autumn hour in Europe/Berlin, then the repeated 02:xx rows follow on in UTC without a jump', () => {
    const r = read('dst-autumn-berlin.csv', 'Europe/Berlin');
    expect(r.problems).toEqual([]);
    const utc = r.samples.map((s) => s.atMs!);
    const steps = new Set(utc.slice(1).map((t, i) => (t - utc[i]) / 1000));
    expect([...steps]).toEqual([10]);
    expect(new Date(utc[0]).toISOString()).toBe('2025-10-26T00:58:00.000Z'); // 02:58:00 CEST
    // Line 14 is the first 02:00:00 after the change: 01:00 UTC (CET, UTC+1), not 00:00 UTC.
    expect(r.samples.find((s) => s.line === 14)!.atMs).toBe(Date.parse('2025-10-26T01:00:00Z'));
    expect(new Date(utc[utc.length - 1]).toISOString()).toBe('2025-10-26T01:02:00.000Z');
  });

  it('when a file holds three closures with pauses between them, then gaps split it into three pieces of 61 samples', () => {
    const r = read('three-closures-gaps.csv', 'America/Chicago');
    expect(r.layout.delimiter).toBe(',');
    const split = splitClosures(r.samples);
    expect(split.method).toBe('gaps');
    expect(split.pieces.map((p) => p.samples.length)).toEqual([61, 61, 61]);
    // 10:05:13 in Chicago in July is CDT, UTC−5.
    expect(split.pieces.map((p) => new Date(p.startMs!).toISOString())).toEqual([
      '2025-07-03T15:05:13.000Z',
      '2025-07-03T15:12:43.000Z',
      '2025-07-03T15:21:03.000Z',
    ]);
  });

  it('when one line is garbage, then it is reported with its line number and every other row is kept', () => {
    const r = read('garbage-line.csv', 'UTC', (m) => ({
      ...m,
      time: { kind: 'timestamp', column: 0, format: 'ISO-8601 with offset', timeZone: 'UTC' },
    }));
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0].line).toBe(14);
    expect(r.problems[0].message).toMatch(/^Line 14: /);
    expect(r.samples).toHaveLength(30);
    expect(r.samples.map((s) => s.line)).not.toContain(14);
    const split = splitClosures(r.samples);
    expect(split).toMatchObject({ method: 'closureId', outside: 0 });
    expect(split.pieces.map((p) => [p.key, p.samples.length])).toEqual([['K07-1', 30]]);
  });
});
