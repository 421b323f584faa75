import {
  estimateClockOffset,
  medianStepS,
  splitByTapsKeepingUntapped,
  splitClosures,
  type LoggerPiece,
  type LoggerSample,
  type PieceMatch,
  type SplitMethod,
  type SplitResult,
  type TapWindow,
  type VisitSlot,
} from '../../../../shared/logger';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { localDay } from '../../../../shared/time/site-time';

/** A visit of the round with its collar code and the closures still waiting for a series. */
export interface RoundVisit {
  visit: LocalRecord<'visit'>;
  collarCode: string;
  /** Tapped closures with no series yet, in tap order. */
  waiting: TappedClosure[];
}

/** A closure the crew tapped "chamber on" for (its chamberOnAt is set). */
export type TappedClosure = LocalRecord<'closure'> & { chamberOnAt: string };

const tapped = (c: LocalRecord<'closure'>): c is TappedClosure => c.chamberOnAt !== null;

/** Where the crew put one piece: a tapped closure, a new closure at a visit, or nowhere (kept in the file only). */
export type Assignment = { kind: 'closure'; closureId: string; visitId: string } | { kind: 'new'; visitId: string } | { kind: 'none' };

export async function loadRoundVisits(db: FluxDb, campaignId: string, round: number): Promise<RoundVisit[]> {
  const visits = await db
    .records('visit')
    .where('campaignId')
    .equals(campaignId)
    .filter((v) => !v.deleted && v.round === round)
    .toArray();
  const out: RoundVisit[] = [];
  for (const visit of visits) {
    const [collar, closures] = await Promise.all([
      db.records('collar').get(visit.collarId),
      db
        .records('closure')
        .where('visitId')
        .equals(visit.id)
        .filter((c) => !c.deleted)
        .toArray(),
    ]);
    const waiting = closures
      .filter(tapped)
      .filter((c) => !c.series.tS.length)
      .sort((a, b) => a.chamberOnAt.localeCompare(b.chamberOnAt));
    out.push({ visit, collarCode: collar?.code ?? '?', waiting });
  }
  return out.sort((a, b) => a.visit.arrivedAt.localeCompare(b.visit.arrivedAt));
}

/** The visits as the matcher sees them (phone clock). A tap still open counts until the next tap. */
export function visitSlots(visits: readonly RoundVisit[]): VisitSlot[] {
  return visits.map((v) => ({
    visitId: v.visit.id,
    arrivedMs: Date.parse(v.visit.arrivedAt),
    taps: v.waiting.map((c) => ({
      key: c.id,
      onMs: Date.parse(c.chamberOnAt),
      offMs: c.chamberOffAt ? Date.parse(c.chamberOffAt) : null,
    })),
  }));
}

/**
 * The taps as windows on the logger's clock (phone time + offset). A tap never closed with
 * "chamber off" runs until the next tap, at most `openS` (common practice: closures last minutes).
 */
export function tapWindows(visits: readonly VisitSlot[], offsetS: number, openS = 600): TapWindow[] {
  const taps = visits.flatMap((v) => v.taps).sort((a, b) => a.onMs - b.onMs);
  const shift = offsetS * 1000;
  return taps.map((t, i) => {
    const next = taps[i + 1]?.onMs ?? Infinity;
    const off = t.offMs ?? Math.min(next - 1, t.onMs + openS * 1000);
    return { key: t.key, onMs: t.onMs + shift, offMs: off + shift };
  });
}

/** The matcher's answer as a starting assignment; ambiguous and unmatched pieces wait for the crew. */
export function defaultAssignments(matches: readonly PieceMatch[]): Record<string, Assignment> {
  const out: Record<string, Assignment> = {};
  for (const m of matches) {
    if (m.status === 'matched' && m.tapKey && m.visitId) out[m.pieceKey] = { kind: 'closure', closureId: m.tapKey, visitId: m.visitId };
    else if (m.status === 'matched' && m.visitId) out[m.pieceKey] = { kind: 'new', visitId: m.visitId };
    else out[m.pieceKey] = { kind: 'none' };
  }
  return out;
}

/** Two pieces put into one closure would overwrite each other: name them instead. */
export function assignmentProblems(pieces: readonly LoggerPiece[], a: Record<string, Assignment>): string[] {
  const seen = new Map<string, string>();
  const problems: string[] = [];
  for (const p of pieces) {
    const x = a[p.key];
    if (x?.kind !== 'closure') continue;
    const other = seen.get(x.closureId);
    if (other) problems.push(`Lines ${p.firstLine}–${p.lastLine} and piece ${other} are both assigned to the same closure`);
    seen.set(x.closureId, p.key);
  }
  return problems;
}

/** Encodes an assignment for a <select> value and back. */
export const assignmentValue = (a: Assignment | undefined): string =>
  !a || a.kind === 'none' ? 'none' : a.kind === 'new' ? `new:${a.visitId}` : `closure:${a.visitId}:${a.closureId}`;
export function parseAssignment(v: string): Assignment {
  const [kind, visitId, closureId] = v.split(':');
  if (kind === 'new') return { kind: 'new', visitId };
  if (kind === 'closure') return { kind: 'closure', visitId, closureId };
  return { kind: 'none' };
}

/** How the file was first cut and the clock offset to start from. */
export interface FirstCut {
  own: SplitResult;
  offsetS: number;
  check: number | null;
  estimate: number | null;
  pairs: number;
  methods: SplitMethod[];
}

/**
 * Closure id column, else taps, else gaps. The taps need the clock offset first: the day's clock
 * check, else an estimate from the taps against the closures the gaps show.
 */
export function firstCut(samples: readonly LoggerSample[], slots: readonly VisitSlot[], check: number | null): FirstCut {
  const taps = slots.flatMap((v) => v.taps);
  const own = splitClosures(samples);
  const timed = samples.length > 0 && samples.every((s) => s.atMs !== null);
  const est =
    own.method === 'gaps' && timed
      ? estimateClockOffset(
          taps.map((t) => ({ key: t.key, startMs: t.onMs, endMs: t.offMs })),
          own.pieces.map((p) => ({ key: p.key, startMs: p.startMs!, endMs: p.endMs })),
        )
      : null;
  const byTaps = own.method === 'gaps' && timed && taps.length > 0;
  return {
    own,
    check: timed ? check : null,
    estimate: est?.offsetS ?? null,
    pairs: est?.pairs.length ?? 0,
    offsetS: (timed ? check : null) ?? est?.offsetS ?? 0,
    methods: own.method === 'closureId' ? ['closureId'] : byTaps ? ['taps', 'gaps'] : ['gaps'],
  };
}

/** The pieces for a method and offset (the taps move with the offset); closures without a tap are kept. */
export function cutBy(
  method: SplitMethod,
  samples: readonly LoggerSample[],
  own: SplitResult,
  slots: readonly VisitSlot[],
  offsetS: number,
): SplitResult {
  return method === 'taps' ? splitByTapsKeepingUntapped(samples, tapWindows(slots, offsetS), medianStepS(samples) / 2) : own;
}

/** Where the column mapping of an analyzer is kept on this device (one preset per analyzer). */
export const mappingPresetKey = (analyzerId: string | null): string => `fw.logger-preset.${analyzerId ?? 'none'}`;

/** The analyzer's clock offset from the latest clock check on the file's day (site zone), when one was taken. */
export async function dayClockCheck(
  db: FluxDb,
  siteId: string,
  analyzerId: string | null,
  firstMs: number,
  timeZone: string,
): Promise<number | null> {
  if (!analyzerId) return null;
  const day = localDay(new Date(firstMs).toISOString(), timeZone);
  const checks = await db
    .records('analyzerCheck')
    .where('siteId')
    .equals(siteId)
    .filter((c) => !c.deleted && c.kind === 'clock' && c.analyzerId === analyzerId && c.clockOffsetS !== null)
    .toArray();
  const today = checks.filter((c) => localDay(c.at, timeZone) === day).sort((a, b) => b.at.localeCompare(a.at));
  return today[0]?.clockOffsetS ?? null;
}
