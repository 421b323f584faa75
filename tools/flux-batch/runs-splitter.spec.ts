import { forEachRun, MalformedJson } from './runs-splitter';

function collect(text: string): { runs: unknown[]; sawRuns: boolean } {
  const runs: unknown[] = [];
  const sawRuns = forEachRun(text, (r) => runs.push(r));
  return { runs, sawRuns };
}

describe('runs splitter (one JSON.parse per run)', () => {
  it('yields the same runs as JSON.parse of the whole document, whatever the spacing, key order and string content', () => {
    const doc = {
      note: 'braces } ] and "quotes" in strings, ünïcødé',
      runs: [{ id: 'a{]', t_s: [0, 1.5e2, null], nested: { x: [[1], []] } }, 7, 'text', null, []],
      after: { runs: 'not this one' },
    };
    for (const text of [JSON.stringify(doc), JSON.stringify(doc, null, 2), `\n ${JSON.stringify(doc)} \r\n`]) {
      const out = collect(text);
      expect(out.sawRuns).toBe(true);
      expect(out.runs).toEqual(doc.runs);
    }
  });

  it('accepts an empty runs array and reports a document without one', () => {
    expect(collect('{"runs":[]}')).toEqual({ runs: [], sawRuns: true });
    expect(collect('{"other":1}').sawRuns).toBe(false);
    expect(collect('[1,2]').sawRuns).toBe(false);
    expect(collect('{"runs":5}').sawRuns).toBe(false);
  });

  it.each([
    ['{"runs":[{"id":1,}]}'],
    ['{"runs":[1 2]}'],
    ['{"runs":[1]'],
    ['{"runs":[1]} x'],
    ['{"a":tru,"runs":[]}'],
    ['{runs:[]}'],
    [''],
    ['{"runs":["unterminated]}'],
  ])('throws MalformedJson for %j', (text) => {
    expect(() => collect(text)).toThrow(MalformedJson);
  });
});
