/**
 * One logger file → pieces, one per closure: by the file's closure-id column when it has one,
 * else by the chamber taps (windows on the file's clock), else by gaps in time. Rows that fall in
 * no piece are counted and shown, never dropped without a word.
 */
import type { LoggerSample } from './logger-rows';
import type { LoggerMapping } from './logger-mapping';

export type SplitMethod = 'closureId' | 'taps' | 'gaps';

export interface LoggerPiece {
  /** Stable within one import: the closure id, the tap's id, or "gap-n". */
  key: string;
  closureId: string | null;
  firstLine: number;
  lastLine: number;
  /** Logger clock, UTC ms (null for elapsed-time files). */
  startMs: number | null;
  endMs: number | null;
  samples: LoggerSample[];
}

export interface SplitResult {
  method: SplitMethod;
  pieces: LoggerPiece[];
  /** Rows outside every piece (chamber open between closures, or outside every tap window). */
  outside: number;
}

/** A tap window already moved onto the logger's clock (phone time + clock offset). */
export interface TapWindow {
  key: string;
  onMs: number;
  offMs: number;
}

function piece(key: string, samples: LoggerSample[], closureId: string | null = null): LoggerPiece {
  return {
    key,
    closureId,
    samples,
    firstLine: samples[0].line,
    lastLine: samples[samples.length - 1].line,
    startMs: samples[0].atMs,
    endMs: samples[samples.length - 1].atMs,
  };
}

export function splitByClosureId(samples: readonly LoggerSample[]): SplitResult {
  const pieces: LoggerPiece[] = [];
  let outside = 0;
  let run: LoggerSample[] = [];
  const seen = new Map<string, number>();
  const close = () => {
    if (!run.length) return;
    const id = run[0].closureId!;
    const n = (seen.get(id) ?? 0) + 1;
    seen.set(id, n);
    // The same id twice (a logger restarted its counter) stays two pieces.
    pieces.push(piece(n === 1 ? id : `${id}#${n}`, run, id));
    run = [];
  };
  for (const s of samples) {
    if (s.closureId === null) {
      close();
      outside++;
    } else {
      if (run.length && run[0].closureId !== s.closureId) close();
      run.push(s);
    }
  }
  close();
  return { method: 'closureId', pieces, outside };
}

/** Sampling interval (median step), seconds. */
export function medianStepS(samples: readonly LoggerSample[]): number {
  const steps: number[] = [];
  for (let i = 1; i < samples.length; i++) {
    const a = samples[i - 1];
    const b = samples[i];
    const d = a.atMs !== null && b.atMs !== null ? (b.atMs - a.atMs) / 1000 : (b.elapsedS ?? 0) - (a.elapsedS ?? 0);
    if (d > 0) steps.push(d);
  }
  steps.sort((x, y) => x - y);
  return steps.length ? steps[Math.floor(steps.length / 2)] : 1;
}

/**
 * Splits where time jumps by more than `gapS` (default: 5 sampling intervals, at least 10 s) or
 * runs backwards (an elapsed-time file starts again at 0 for each closure).
 */
export function splitByGaps(samples: readonly LoggerSample[], gapS?: number): SplitResult {
  const limit = gapS ?? Math.max(10, 5 * medianStepS(samples));
  const pieces: LoggerPiece[] = [];
  let run: LoggerSample[] = [];
  const close = () => {
    if (run.length) pieces.push(piece(`gap-${pieces.length + 1}`, run));
    run = [];
  };
  for (const s of samples) {
    const prev = run[run.length - 1];
    if (prev) {
      const d = prev.atMs !== null && s.atMs !== null ? (s.atMs - prev.atMs) / 1000 : (s.elapsedS ?? 0) - (prev.elapsedS ?? 0);
      if (d > limit || d < 0) close();
    }
    run.push(s);
  }
  close();
  return { method: 'gaps', pieces, outside: 0 };
}

/**
 * The samples inside each tap window (a continuous log: the chamber taps say where closures are).
 * `slackS` widens each window on both sides: an estimated clock offset is only known to within
 * the sampling step, and a sample half a step outside still belongs to the closure.
 */
export function splitByTaps(samples: readonly LoggerSample[], taps: readonly TapWindow[], slackS = 0): SplitResult {
  const pieces: LoggerPiece[] = [];
  let inside = 0;
  const slack = slackS * 1000;
  for (const tap of [...taps].sort((a, b) => a.onMs - b.onMs)) {
    const run = samples.filter((s) => s.atMs !== null && s.atMs >= tap.onMs - slack && s.atMs <= tap.offMs + slack);
    inside += run.length;
    if (run.length) pieces.push(piece(tap.key, run));
  }
  return { method: 'taps', pieces, outside: Math.max(0, samples.length - inside) };
}

/**
 * The taps first; a closure the file's own gaps show wholly outside every tap window (one the crew
 * did not tap) is kept as a piece of its own for the crew to place, never dropped. A continuous log
 * has no such gaps, so its open-chamber stretches between taps stay outside.
 */
export function splitByTapsKeepingUntapped(
  samples: readonly LoggerSample[],
  taps: readonly TapWindow[],
  slackS = 0,
  gapS?: number,
): SplitResult {
  const byTaps = splitByTaps(samples, taps, slackS);
  const slack = slackS * 1000;
  const inWindow = (ms: number) => taps.some((t) => ms >= t.onMs - slack && ms <= t.offMs + slack);
  const untapped = splitByGaps(samples, gapS).pieces.filter((p) => p.samples.every((x) => x.atMs !== null && !inWindow(x.atMs)));
  const pieces = [...byTaps.pieces, ...untapped].sort((a, b) => a.firstLine - b.firstLine);
  return { method: 'taps', pieces, outside: byTaps.outside - untapped.reduce((n, p) => n + p.samples.length, 0) };
}

/** How a file is cut into closures: a closure-id column first, else taps (timestamp files only), else gaps. */
export function splitClosures(
  samples: readonly LoggerSample[],
  opts: { taps?: readonly TapWindow[]; gapS?: number; slackS?: number } = {},
): SplitResult {
  if (samples.some((s) => s.closureId !== null)) return splitByClosureId(samples);
  if (opts.taps?.length && samples.every((s) => s.atMs !== null)) return splitByTaps(samples, opts.taps, opts.slackS);
  return splitByGaps(samples, opts.gapS);
}

/**
 * A piece as a closure series: elapsed seconds from its first sample; an all-empty column becomes
 * null. A mapping whose CO2 column is already dry marks the series `co2IsDry`.
 */
export function pieceSeries(
  p: LoggerPiece,
  mapping?: Pick<LoggerMapping, 'co2'> | null,
): {
  tS: number[];
  co2Ppm: number[];
  h2oMmolMol: (number | null)[] | null;
  pressureKpa: (number | null)[] | null;
  tempC: (number | null)[] | null;
  co2IsDry?: true;
} {
  const s0 = p.samples[0];
  const tS = p.samples.map((s) =>
    round3(s.atMs !== null && s0.atMs !== null ? (s.atMs - s0.atMs) / 1000 : (s.elapsedS ?? 0) - (s0.elapsedS ?? 0)),
  );
  const col = (f: (s: LoggerSample) => number | null) => {
    const v = p.samples.map(f);
    return v.some((x) => x !== null) ? v : null;
  };
  return {
    tS,
    co2Ppm: p.samples.map((s) => s.co2Ppm),
    h2oMmolMol: col((s) => s.h2oMmolMol),
    pressureKpa: col((s) => s.pressureKpa),
    tempC: col((s) => s.tempC),
    ...(mapping?.co2.dry ? { co2IsDry: true as const } : {}),
  };
}

const round3 = (v: number) => Math.round(v * 1000) / 1000;
