/**
 * Pieces of a logger file → visits, by corrected time (logger time − clock offset). A piece goes
 * to the chamber tap whose window holds its middle; without taps, to the visit the crew had
 * arrived at last before it began. A piece with no candidate is `unmatched`, one with several (or
 * one that shares its tap with another piece) is `ambiguous`: both are shown for the crew to
 * assign, none is dropped.
 */
import type { LoggerPiece } from './closure-split';

export interface VisitSlot {
  visitId: string;
  /** Phone clock, UTC ms. */
  arrivedMs: number;
  /** Chamber taps at this visit (closure records), phone clock. */
  taps: { key: string; onMs: number; offMs: number | null }[];
}

export type MatchStatus = 'matched' | 'unmatched' | 'ambiguous';

export interface PieceMatch {
  pieceKey: string;
  status: MatchStatus;
  visitId: string | null;
  /** The tap (closure record) the piece fills, when it matched one. */
  tapKey: string | null;
  how: 'tap' | 'arrival' | 'order' | null;
  candidates: { visitId: string; tapKey: string | null }[];
  /** On the phone's clock (null for elapsed-time files). */
  correctedStartMs: number | null;
  correctedEndMs: number | null;
}

export interface MatchOptions {
  /** Logger clock − phone clock, seconds. */
  offsetS: number;
  /** Slack around a tap window, seconds (default 30). */
  tolS?: number;
  /** Longest time after arriving that a closure still belongs to the visit without a tap (default 30 min). */
  maxVisitS?: number;
}

export function matchPiecesToVisits(pieces: readonly LoggerPiece[], visits: readonly VisitSlot[], opts: MatchOptions): PieceMatch[] {
  const tol = (opts.tolS ?? 30) * 1000;
  const maxVisit = (opts.maxVisitS ?? 1800) * 1000;
  const shift = opts.offsetS * 1000;
  const allTaps = visits.flatMap((v) => v.taps.map((t) => ({ ...t, visitId: v.visitId }))).sort((a, b) => a.onMs - b.onMs);

  if (pieces.some((p) => p.startMs === null)) return matchByOrder(pieces, allTaps);

  const out = pieces.map((p): PieceMatch => {
    const cs = p.startMs! - shift;
    const ce = (p.endMs ?? p.startMs!) - shift;
    const mid = (cs + ce) / 2;
    const byTap = allTaps
      .filter((t) => mid >= t.onMs - tol && mid <= (t.offMs ?? t.onMs + maxVisit) + tol)
      .map((t) => ({ visitId: t.visitId, tapKey: t.key as string | null }));
    let candidates = byTap;
    let how: PieceMatch['how'] = byTap.length ? 'tap' : null;
    if (!byTap.length) {
      // No tap covers it: the visit arrived at last before it started, if recent enough.
      const before = visits.filter((v) => v.arrivedMs <= cs + tol && cs - v.arrivedMs <= maxVisit);
      const latest = Math.max(...before.map((v) => v.arrivedMs));
      candidates = before.filter((v) => v.arrivedMs === latest).map((v) => ({ visitId: v.visitId, tapKey: null }));
      how = candidates.length ? 'arrival' : null;
    }
    const one = candidates.length === 1 ? candidates[0] : null;
    return {
      pieceKey: p.key,
      status: one ? 'matched' : candidates.length ? 'ambiguous' : 'unmatched',
      visitId: one?.visitId ?? null,
      tapKey: one?.tapKey ?? null,
      how,
      candidates,
      correctedStartMs: cs,
      correctedEndMs: ce,
    };
  });
  // Two pieces in one tap window: the crew says which one is the closure (the other may be a redo).
  const claims = new Map<string, number>();
  for (const m of out) if (m.tapKey) claims.set(m.tapKey, (claims.get(m.tapKey) ?? 0) + 1);
  for (const m of out) {
    if (m.tapKey && claims.get(m.tapKey)! > 1) Object.assign(m, { status: 'ambiguous', visitId: null, tapKey: null });
  }
  return out;
}

/** Elapsed-time files carry no clock: pieces go to the taps in order when the counts agree. */
function matchByOrder(pieces: readonly LoggerPiece[], taps: { key: string; visitId: string }[]): PieceMatch[] {
  const same = pieces.length === taps.length;
  return pieces.map((p, i) => ({
    pieceKey: p.key,
    status: same ? 'matched' : 'unmatched',
    visitId: same ? taps[i].visitId : null,
    tapKey: same ? taps[i].key : null,
    how: same ? 'order' : null,
    candidates: same ? [{ visitId: taps[i].visitId, tapKey: taps[i].key }] : [],
    correctedStartMs: null,
    correctedEndMs: null,
  }));
}
