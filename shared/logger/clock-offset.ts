/**
 * The analyzer's clock offset from the phone: offsetS = logger clock − phone clock, so a logger
 * time L is L − offsetS on the phone's clock. Estimated from the chamber taps (phone) against the
 * closures found in the file (logger): the shift that lines up the most tap windows with pieces,
 * refined to the median of the lined-up differences (robust to one slow tap).
 */

export interface TimedWindow {
  key: string;
  startMs: number;
  endMs: number | null;
}

export interface OffsetEstimate {
  offsetS: number;
  /** Tap ↔ piece pairs that agree with the offset. */
  pairs: { tapKey: string; pieceKey: string; diffS: number }[];
  /** Largest disagreement of a pair with the offset, seconds. */
  spreadS: number;
}

const median = (v: number[]) => {
  const s = [...v].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};

function pairDiffS(tap: TimedWindow, p: TimedWindow): number {
  const on = (p.startMs - tap.startMs) / 1000;
  if (tap.endMs === null || p.endMs === null) return on;
  return (on + (p.endMs - tap.endMs) / 1000) / 2;
}

/** One-to-one pairs within `tolS` of a trial offset (nearest first). */
function pairUp(taps: readonly TimedWindow[], pieces: readonly TimedWindow[], offsetS: number, tolS: number) {
  const all: { tap: TimedWindow; piece: TimedWindow; diffS: number; err: number }[] = [];
  for (const tap of taps) {
    for (const piece of pieces) {
      const diffS = pairDiffS(tap, piece);
      const err = Math.abs(diffS - offsetS);
      if (err <= tolS) all.push({ tap, piece, diffS, err });
    }
  }
  all.sort((a, b) => a.err - b.err);
  const usedT = new Set<string>();
  const usedP = new Set<string>();
  const pairs: typeof all = [];
  for (const c of all) {
    if (usedT.has(c.tap.key) || usedP.has(c.piece.key)) continue;
    usedT.add(c.tap.key);
    usedP.add(c.piece.key);
    pairs.push(c);
  }
  return pairs;
}

/**
 * @param taps chamber-on/off on the phone's clock
 * @param pieces closures found in the file, on the logger's clock
 * @param tolS how far a tap may be from the piece once shifted (common practice: a tap is pressed
 *   within seconds of seating the chamber; 20 s by default)
 * @param maxS largest offset considered (a wrong time zone on the analyzer is hours; 12 h by default)
 */
export function estimateClockOffset(
  taps: readonly TimedWindow[],
  pieces: readonly TimedWindow[],
  tolS = 20,
  maxS = 43_200,
): OffsetEstimate | null {
  let best: ReturnType<typeof pairUp> = [];
  let bestCost = Infinity;
  for (const tap of taps) {
    for (const piece of pieces) {
      const trial = pairDiffS(tap, piece);
      if (Math.abs(trial) > maxS) continue;
      const pairs = pairUp(taps, pieces, trial, tolS);
      const cost = pairs.reduce((s, p) => s + p.err * p.err, 0);
      if (pairs.length > best.length || (pairs.length === best.length && cost < bestCost)) {
        best = pairs;
        bestCost = cost;
      }
    }
  }
  if (!best.length) return null;
  const offsetS = Math.round(median(best.map((p) => p.diffS)) * 10) / 10;
  const pairs = pairUp(taps, pieces, offsetS, tolS)
    .sort((a, b) => a.tap.startMs - b.tap.startMs)
    .map((p) => ({ tapKey: p.tap.key, pieceKey: p.piece.key, diffS: p.diffS }));
  return { offsetS, pairs, spreadS: Math.max(0, ...pairs.map((p) => Math.abs(p.diffS - offsetS))) };
}
