import { performance } from 'node:perf_hooks';
import { suggestMapping } from './logger-mapping';
import { readNumber } from './logger-rows';
import { guessLayout, splitRows } from './logger-text';
import { readTimestamp } from './zoned-time';

/** Far above what these readers need on a 2-core machine; the quadratic number pattern took seconds. */
const QUICK_MS = 250;
const timed = <T>(f: () => T): { value: T; ms: number } => {
  const s = performance.now();
  const value = f();
  return { value, ms: performance.now() - s };
};

describe('logger text readers on hostile cells stay linear', () => {
  it('when a number cell is 50 000 digits and a letter, then it is refused at once', () => {
    const { value, ms } = timed(() => readNumber(`${'1'.repeat(50_000)}x`, false));
    expect(value).toBeNaN();
    expect(ms).toBeLessThan(QUICK_MS);
  });

  it('when number cells are ordinary, then they read as before', () => {
    const cases: [string, boolean, number | null][] = [
      ['12', false, 12],
      ['12.', false, 12],
      ['.5', false, 0.5],
      ['-1.5E-2', false, -0.015],
      ['+3e2', false, 300],
      ['412,5', true, 412.5],
      ['', false, null],
      ['  7  ', false, 7],
    ];
    for (const [cell, comma, want] of cases) expect([cell, readNumber(cell, comma)]).toEqual([cell, want]);
    for (const bad of ['1.2.3', '1e', 'e5', '.', '1,5', '12 ppm']) expect(readNumber(bad, false)).toBeNaN();
  });

  it('when a header row and time cells are long runs of separators and spaces, then layout, mapping and times answer at once', () => {
    const text = `${'-'.repeat(100_000)};${' '.repeat(100_000)}co2\n${' '.repeat(100_000)}1;2\n`;
    const { ms } = timed(() => {
      const layout = guessLayout(text);
      splitRows(text, layout.delimiter);
      suggestMapping(layout.headers, { delimiter: layout.delimiter, decimalComma: false, headerRow: layout.headerRow }, 'UTC');
      readTimestamp(`${' '.repeat(100_000)}2026-07-01 12:00:00${' '.repeat(100_000)}x`, 'YYYY-MM-DD HH:mm:ss', 'UTC');
      readTimestamp(`${' '.repeat(100_000)}x`, 'ISO-8601 with offset', 'UTC');
    });
    expect(ms).toBeLessThan(QUICK_MS * 4);
  });
});
