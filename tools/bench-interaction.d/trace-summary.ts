import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { CDPSession } from 'playwright-core';

/**
 * BENCH_TRACE=dir: one Chromium trace (open it in DevTools' Performance panel) and one V8 CPU
 * profile per measured step, and a short summary printed beside the step: main-thread time by
 * kind (script, style, layout, paint, GC), the longest task, and the functions with the most
 * self time (names as the production build spells them; its source maps are not shipped).
 */
const CATEGORIES = [
  'devtools.timeline',
  'disabled-by-default-devtools.timeline',
  'v8',
  'v8.execute',
  'blink.user_timing',
  'loading',
  'disabled-by-default-devtools.timeline.frame',
].join(',');

interface TraceEvent {
  name: string;
  ph: string;
  ts: number;
  dur?: number;
  /** The thread's own CPU time in the event (µs): what a loaded machine's waiting does not inflate. */
  tdur?: number;
  pid: number;
  tid: number;
  args?: { name?: string };
}
interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
}
interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

/** Main-thread kinds of work, by the trace event names Chromium uses for them. */
const KINDS: Record<string, string> = {
  FunctionCall: 'script',
  EvaluateScript: 'script',
  'v8.callFunction': 'script',
  TimerFire: 'script',
  FireAnimationFrame: 'script',
  EventDispatch: 'script',
  RunMicrotasks: 'script',
  'V8.GCScavenger': 'gc',
  MinorGC: 'gc',
  MajorGC: 'gc',
  'V8.GCFinalizeMC': 'gc',
  UpdateLayoutTree: 'style',
  RecalculateStyles: 'style',
  Layout: 'layout',
  PrePaint: 'paint',
  Paint: 'paint',
  Layerize: 'paint',
  'Document::updateStyleAndLayout': 'layout',
  HitTest: 'layout',
};

export class StepTrace {
  private chunks: TraceEvent[] = [];

  private constructor(
    private readonly cdp: CDPSession,
    private readonly dir: string,
  ) {}

  static fromEnv(cdp: CDPSession): StepTrace | null {
    const dir = process.env['BENCH_TRACE'];
    if (!dir) return null;
    mkdirSync(dir, { recursive: true });
    return new StepTrace(cdp, dir);
  }

  async start(): Promise<void> {
    this.chunks = [];
    await this.cdp.send('Profiler.enable');
    await this.cdp.send('Profiler.setSamplingInterval', { interval: 250 });
    await this.cdp.send('Profiler.start');
    await this.cdp.send('Tracing.start', { categories: CATEGORIES, transferMode: 'ReportEvents' });
  }

  /** Stops both recordings, writes them as `<name>.json` / `<name>.cpuprofile` and returns the summary lines. */
  async stop(name: string): Promise<string[]> {
    const collect = (e: { value: object[] }) => {
      // CDP's typings give trace chunks as plain objects; they are Chrome trace events.
      this.chunks.push(...(e.value as unknown as TraceEvent[]));
    };
    this.cdp.on('Tracing.dataCollected', collect);
    const done = new Promise<void>((resolve) => this.cdp.once('Tracing.tracingComplete', () => resolve()));
    await this.cdp.send('Tracing.end');
    await done;
    this.cdp.off('Tracing.dataCollected', collect);
    // CDP's Profiler.Profile, read as the fields this summary uses.
    const { profile } = (await this.cdp.send('Profiler.stop')) as unknown as { profile: CpuProfile };
    writeFileSync(path.join(this.dir, `${name}.json`), JSON.stringify({ traceEvents: this.chunks }));
    writeFileSync(path.join(this.dir, `${name}.cpuprofile`), JSON.stringify(profile));
    return [...this.mainThread(), ...topFunctions(profile, 8)];
  }

  private mainThread(): string[] {
    const named = this.chunks.find((e) => e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
    if (!named) return ['  (no renderer main thread in the trace)'];
    const main = this.chunks.filter((e) => e.pid === named.pid && e.tid === named.tid && e.ph === 'X' && e.dur);
    const byKind: Record<string, number> = {};
    // Only outermost events of each kind count, so nested FunctionCall/EventDispatch are not added twice.
    const open: Record<string, number> = {};
    for (const e of [...main].sort((a, b) => a.ts - b.ts)) {
      const kind = KINDS[e.name];
      if (!kind || (open[kind] ?? 0) > e.ts) continue;
      byKind[kind] = (byKind[kind] ?? 0) + e.dur! / 1000;
      open[kind] = e.ts + e.dur!;
    }
    const tasks = main.filter((e) => e.name === 'RunTask' || e.name === 'ThreadControllerImpl::RunTask');
    const top = tasks.reduce<TraceEvent | null>((m, e) => (!m || e.dur! > m.dur! ? e : m), null);
    const longest = (top?.dur ?? 0) / 1000;
    // Thread time is the CPU the main thread got; a wall time far above it is waiting (for a core on a loaded machine, or the throttle).
    const cpu = top?.tdur !== undefined ? `, ${(top.tdur / 1000).toFixed(0)} ms of it on the CPU` : '';
    const busyCpu = tasks.reduce((a, e) => a + (e.tdur ?? 0), 0) / 1000;
    const kinds = Object.entries(byKind)
      .sort((a, b) => b[1] - a[1])
      .map(([k, ms]) => `${k} ${ms.toFixed(0)} ms`)
      .join(', ');
    return [
      `    main thread: ${kinds || 'idle'}; longest task ${longest.toFixed(0)} ms${cpu} (${tasks.filter((t) => t.dur! > 50_000).length} over 50 ms); ` +
        `tasks' CPU time ${busyCpu.toFixed(0)} ms`,
    ];
  }
}

/** The functions with the most self time in a V8 CPU profile. */
export function topFunctions(profile: CpuProfile, n: number): string[] {
  const byNode = new Map<number, number>();
  profile.samples.forEach((id, i) => byNode.set(id, (byNode.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
  const byFunction = new Map<string, number>();
  for (const node of profile.nodes) {
    const us = byNode.get(node.id);
    if (!us) continue;
    const f = node.callFrame;
    if (f.functionName === '(idle)' || f.functionName === '(program)') continue;
    const where = f.url ? `${f.url.split('/').pop()}:${f.lineNumber + 1}:${f.columnNumber + 1}` : '';
    const key = `${f.functionName || '(anonymous)'} ${where}`.trim();
    byFunction.set(key, (byFunction.get(key) ?? 0) + us);
  }
  return [...byFunction]
    .sort((a, b) => b[1] - a[1])
    .slice(0, n)
    .map(([k, us]) => `    ${(us / 1000).toFixed(1).padStart(7)} ms  ${k}`);
}
