import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { estimateClockOffset } from './clock-offset';
import { splitByTapsKeepingUntapped, splitClosures, type LoggerPiece } from './closure-split';
import { plainExportMapping } from './logger-mapping';
import { readLoggerRows } from './logger-rows';
import { guessLayout, splitRows } from './logger-text';
import { matchPiecesToVisits, type VisitSlot } from './visit-match';

/**
 * One logger file for a whole round: test/fixtures/logger/walk-two-collars.csv holds four closures
 * (two at each of two collars, 2026-12-03, Europe/Berlin); the analyzer's clock runs 73 s ahead of
 * the phone's taps at 08:41, 08:45 (collar A) and 08:55, 08:59 UTC (collar B), 120 s each.
 */
function roundPieces(): LoggerPiece[] {
  const text = readFileSync(join(__dirname, '../../test/fixtures/logger/walk-two-collars.csv'), 'utf8');
  const layout = guessLayout(text);
  const mapping = plainExportMapping(layout.headers, layout, 'Europe/Berlin')!;
  return splitClosures(readLoggerRows(splitRows(text, ','), mapping).samples).pieces;
}

const at = (iso: string) => Date.parse(iso);
const tap = (key: string, on: string, closed = true) => ({ key, onMs: at(on), offMs: closed ? at(on) + 120_000 : null });
const round = (): VisitSlot[] => [
  {
    visitId: 'visit-A',
    arrivedMs: at('2026-12-03T08:38:00Z'),
    taps: [tap('a1', '2026-12-03T08:41:00Z'), tap('a2', '2026-12-03T08:45:00Z')],
  },
  {
    visitId: 'visit-B',
    arrivedMs: at('2026-12-03T08:52:00Z'),
    taps: [tap('b1', '2026-12-03T08:55:00Z'), tap('b2', '2026-12-03T08:59:00Z')],
  },
];

describe('one logger file matched to every collar of the round', () => {
  it('when the file holds the closures of two collars, then each piece goes to its own tap at its own collar, with the clock offset estimated from the taps', () => {
    const pieces = roundPieces();
    expect(pieces).toHaveLength(4);
    const visits = round();
    const est = estimateClockOffset(
      visits.flatMap((v) => v.taps).map((t) => ({ key: t.key, startMs: t.onMs, endMs: t.offMs })),
      pieces.map((p) => ({ key: p.key, startMs: p.startMs!, endMs: p.endMs })),
    );
    expect(Math.abs(est!.offsetS - 73)).toBeLessThanOrEqual(1);
    const m = matchPiecesToVisits(pieces, visits, { offsetS: est!.offsetS });
    expect(m.map((x) => [x.status, x.visitId, x.tapKey, x.how])).toEqual([
      ['matched', 'visit-A', 'a1', 'tap'],
      ['matched', 'visit-A', 'a2', 'tap'],
      ['matched', 'visit-B', 'b1', 'tap'],
      ['matched', 'visit-B', 'b2', 'tap'],
    ]);
  });

  it('when the crew did not tap the last closure, then that piece goes to the collar they had arrived at (a new closure there), the others still to their taps', () => {
    const visits = round();
    visits[1].taps.pop();
    const m = matchPiecesToVisits(roundPieces(), visits, { offsetS: 73 });
    expect(m.map((x) => [x.status, x.visitId, x.tapKey, x.how])).toEqual([
      ['matched', 'visit-A', 'a1', 'tap'],
      ['matched', 'visit-A', 'a2', 'tap'],
      ['matched', 'visit-B', 'b1', 'tap'],
      ['matched', 'visit-B', null, 'arrival'],
    ]);
  });

  it('when two taps were never closed, then the piece both could hold is ambiguous (for the crew), and no piece is dropped', () => {
    const visits = round();
    visits[1].taps = [tap('b1', '2026-12-03T08:55:00Z', false), tap('b2', '2026-12-03T08:59:00Z', false)];
    const m = matchPiecesToVisits(roundPieces(), visits, { offsetS: 73 });
    expect(m).toHaveLength(4);
    expect(m[2]).toMatchObject({ status: 'matched', tapKey: 'b1' });
    expect(m[3]).toMatchObject({
      status: 'ambiguous',
      tapKey: null,
      candidates: [
        { visitId: 'visit-B', tapKey: 'b1' },
        { visitId: 'visit-B', tapKey: 'b2' },
      ],
    });
  });

  it('when a piece lies before any visit of the round, then it is unmatched (not forced onto a collar)', () => {
    const visits = round().map((v) => ({
      ...v,
      arrivedMs: v.arrivedMs + 3 * 3600_000,
      taps: v.taps.map((t) => ({ ...t, onMs: t.onMs + 3 * 3600_000, offMs: t.offMs! + 3 * 3600_000 })),
    }));
    const m = matchPiecesToVisits(roundPieces(), visits, { offsetS: 73 });
    expect(m.every((x) => x.status === 'unmatched' && x.visitId === null)).toBe(true);
  });
});

describe('cutting a round file by the taps', () => {
  const windows = (visits: VisitSlot[], offsetS: number) =>
    visits.flatMap((v) => v.taps).map((t) => ({ key: t.key, onMs: t.onMs + offsetS * 1000, offMs: t.offMs! + offsetS * 1000 }));
  const samples = () => roundPieces().flatMap((p) => p.samples);

  it('when a closure in the file has no tap, then it is kept as a piece of its own (for the crew), the tapped ones are cut by their taps', () => {
    const visits = round();
    visits[1].taps.pop();
    const cut = splitByTapsKeepingUntapped(samples(), windows(visits, 73), 1);
    expect(cut.pieces.map((p) => [p.key, p.samples.length])).toEqual([
      ['a1', 61],
      ['a2', 61],
      ['b1', 61],
      ['gap-4', 61],
    ]);
    expect(cut.outside).toBe(0);
    const m = matchPiecesToVisits(cut.pieces, visits, { offsetS: 73 });
    expect(m[3]).toMatchObject({ pieceKey: 'gap-4', status: 'matched', visitId: 'visit-B', tapKey: null, how: 'arrival' });
  });

  it('when the log runs on between closures, then the stretches between taps are not made into closures', () => {
    const all = samples();
    // One continuous log: the same samples with the pauses closed up, so no gap separates closures.
    const t0 = all[0].atMs!;
    const continuous = all.map((s, i) => ({ ...s, atMs: t0 + i * 2000 }));
    const taps = [{ key: 'x', onMs: t0 + 10_000, offMs: t0 + 60_000 }];
    const cut = splitByTapsKeepingUntapped(continuous, taps, 1);
    expect(cut.pieces.map((p) => p.key)).toEqual(['x']);
    expect(cut.outside).toBe(continuous.length - cut.pieces[0].samples.length);
  });
});
