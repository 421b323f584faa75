import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { estimateClockOffset } from './clock-offset';
import { splitClosures, type LoggerPiece } from './closure-split';
import { suggestMapping } from './logger-mapping';
import { readLoggerRows } from './logger-rows';
import { guessLayout, splitRows } from './logger-text';
import { matchPiecesToVisits, type VisitSlot } from './visit-match';

/** The three closures of test/fixtures/logger/three-closures-gaps.csv (Chicago, logger clock). */
function threePieces(): LoggerPiece[] {
  const text = readFileSync(join(__dirname, '../../test/fixtures/logger/three-closures-gaps.csv'), 'utf8');
  const layout = guessLayout(text);
  const mapping = suggestMapping(layout.headers, layout, 'America/Chicago')!;
  return splitClosures(readLoggerRows(splitRows(text, ','), mapping).samples).pieces;
}

const at = (iso: string) => Date.parse(iso);
// The phone's taps, 73 s behind the logger (the logger's clock runs 73 s ahead), with the
// few seconds of slack a person has between seating the chamber and tapping.
const V1 = 'visit-1';
const V2 = 'visit-2';
const tapsAtTwoVisits: VisitSlot[] = [
  {
    visitId: V1,
    arrivedMs: at('2025-07-03T15:02:00Z'),
    taps: [
      { key: 'c1', onMs: at('2025-07-03T15:04:02Z'), offMs: at('2025-07-03T15:06:00Z') },
      { key: 'c2', onMs: at('2025-07-03T15:11:28Z'), offMs: at('2025-07-03T15:13:31Z') },
    ],
  },
  { visitId: V2, arrivedMs: at('2025-07-03T15:18:00Z'), taps: [] },
];

describe('clock offset and matching closures to visits', () => {
  it('when the logger runs 73 s ahead, then the offset is estimated from the taps to within 2 s and the pairs are named', () => {
    const pieces = threePieces();
    const taps = tapsAtTwoVisits.flatMap((v) => v.taps).map((t) => ({ key: t.key, startMs: t.onMs, endMs: t.offMs }));
    const est = estimateClockOffset(
      taps,
      pieces.map((p) => ({ key: p.key, startMs: p.startMs!, endMs: p.endMs })),
    );
    expect(est).not.toBeNull();
    expect(Math.abs(est!.offsetS - 73)).toBeLessThanOrEqual(2);
    expect(est!.pairs.map((p) => [p.tapKey, p.pieceKey])).toEqual([
      ['c1', 'gap-1'],
      ['c2', 'gap-2'],
    ]);
  });

  it('when the offset is applied, then two closures land on one visit and the third on the visit arrived at before it', () => {
    const matches = matchPiecesToVisits(threePieces(), tapsAtTwoVisits, { offsetS: 73 });
    expect(matches.map((m) => [m.pieceKey, m.status, m.visitId, m.tapKey, m.how])).toEqual([
      ['gap-1', 'matched', V1, 'c1', 'tap'],
      ['gap-2', 'matched', V1, 'c2', 'tap'],
      ['gap-3', 'matched', V2, null, 'arrival'],
    ]);
    // Corrected onto the phone's clock: 15:05:13 logger − 73 s.
    expect(new Date(matches[0].correctedStartMs!).toISOString()).toBe('2025-07-03T15:04:00.000Z');
  });

  it('when the offset is not applied, then a closure falls outside its tap window rather than being put on the wrong one', () => {
    const matches = matchPiecesToVisits(threePieces(), tapsAtTwoVisits, { offsetS: 0, tolS: 10 });
    expect(matches[0]).toMatchObject({ status: 'matched', how: 'arrival', tapKey: null });
  });

  it('when no visit is near a piece, then it is surfaced as unmatched with no candidates', () => {
    const only = [{ visitId: V1, arrivedMs: at('2025-07-03T15:02:00Z'), taps: tapsAtTwoVisits[0].taps }];
    const matches = matchPiecesToVisits(threePieces(), only, { offsetS: 73, maxVisitS: 600 });
    expect(matches[2]).toMatchObject({ pieceKey: 'gap-3', status: 'unmatched', visitId: null, candidates: [] });
  });

  it('when two tap windows of different visits overlap a piece, then it is ambiguous and both visits are offered', () => {
    const overlapping: VisitSlot[] = [
      tapsAtTwoVisits[0],
      {
        visitId: V2,
        arrivedMs: at('2025-07-03T15:03:00Z'),
        taps: [{ key: 'x', onMs: at('2025-07-03T15:04:30Z'), offMs: at('2025-07-03T15:06:30Z') }],
      },
    ];
    const [first] = matchPiecesToVisits(threePieces(), overlapping, { offsetS: 73 });
    expect(first.status).toBe('ambiguous');
    expect(first.candidates).toEqual([
      { visitId: V1, tapKey: 'c1' },
      { visitId: V2, tapKey: 'x' },
    ]);
  });

  it('when an elapsed-time file has as many pieces as taps, then they match in order', () => {
    const pieces = threePieces()
      .slice(0, 2)
      .map((p) => ({ ...p, startMs: null, endMs: null }));
    const matches = matchPiecesToVisits(pieces, tapsAtTwoVisits, { offsetS: 0 });
    expect(matches.map((m) => [m.tapKey, m.how])).toEqual([
      ['c1', 'order'],
      ['c2', 'order'],
    ]);
  });
});
