import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { guessLayout, splitClosures, suggestMapping } from '../../../../shared/logger';
import { parseLoggerText } from './logger-parse';

const fixture = (name: string) => readFileSync(join(__dirname, '../../../../test/fixtures/logger', name), 'utf8');

describe('parseLoggerText (papaparse, as the worker runs it)', () => {
  it('when a file is parsed in small chunks, then progress rises to 1 and every row keeps its line number', () => {
    const text = fixture('three-closures-gaps.csv');
    const layout = guessLayout(text);
    const mapping = suggestMapping(layout.headers, layout, 'America/Chicago')!;
    const seen: number[] = [];
    const read = parseLoggerText(text, mapping, (f) => seen.push(f));
    expect(read.samples).toHaveLength(183);
    expect(read.samples[0].line).toBe(2);
    expect(read.samples[182].line).toBe(184);
    expect(seen[seen.length - 1]).toBe(1);
    expect(splitClosures(read.samples).pieces.map((p) => p.samples.length)).toEqual([61, 61, 61]);
  });

  it('when one line is garbage, then the worker path reports the same line as the shared reader', () => {
    const text = fixture('garbage-line.csv');
    const layout = guessLayout(text);
    const mapping = {
      ...suggestMapping(layout.headers, layout, 'UTC')!,
      time: { kind: 'timestamp' as const, column: 0, format: 'ISO-8601 with offset' as const, timeZone: 'UTC' },
    };
    const read = parseLoggerText(text, mapping);
    expect(read.problems.map((p) => p.line)).toEqual([14]);
    expect(read.samples).toHaveLength(30);
  });
});
