/// <reference lib="dom" />
/**
 * The device side of a logger import as one browser bundle: parse in a Web Worker (the app's own
 * parseLoggerText, progress messages as the app's worker sends them), then split into closures and
 * fit each one with the shared fit. Exposed as window.runLoggerPipeline (worker) and
 * window.runInThread for tools/bench-logger.
 */
import { parseLoggerText } from '../../src/app/features/closures/logger-parse';
import { detectDelimiter, findHeaderRow, headLines, splitLine, splitClosures, pieceSeries, suggestMapping } from '../../shared/logger';
import { fitClosure } from '../../shared/flux/closure-fit';

interface Done {
  parseMs: number;
  splitMs: number;
  fitMs: number;
  pieces: number;
  fitted: number;
  samples: number;
  progressMessages: number;
}

function pipeline(text: string, progress: (f: number) => void): Done {
  const t0 = performance.now();
  const lines = headLines(text);
  const delimiter = detectDelimiter(lines);
  const rows = lines.map((l) => splitLine(l, delimiter));
  const headerRow = findHeaderRow(rows);
  const mapping = suggestMapping(rows[headerRow], { delimiter, decimalComma: false, headerRow }, 'UTC');
  if (!mapping) throw new Error('no mapping for the bench file');
  let last = 0;
  const read = parseLoggerText(text, mapping, (f) => {
    if (f - last >= 0.02 || f === 1) {
      last = f;
      progress(f);
    }
  });
  const t1 = performance.now();
  // The bench file has no closure id column: closures come from the gaps, as without taps.
  const split = splitClosures(read.samples.map((s) => ({ ...s, closureId: null })));
  const t2 = performance.now();
  let fitted = 0;
  for (const p of split.pieces) {
    const s = pieceSeries(p, mapping);
    const r = fitClosure({
      ...s,
      pressureKpa: s.pressureKpa ?? 101.3,
      tempC: s.tempC ?? 20,
      volumeCm3: 4000,
      areaCm2: 314.16,
      settleS: 20,
    });
    if (r.selected) fitted++;
  }
  return {
    parseMs: t1 - t0,
    splitMs: t2 - t1,
    fitMs: performance.now() - t2,
    pieces: split.pieces.length,
    fitted,
    samples: read.samples.length,
    progressMessages: 0,
  };
}

function inWorker(): void {
  addEventListener('message', ({ data }: MessageEvent<{ text: string }>) => {
    const done = pipeline(data.text, (fraction) => postMessage({ type: 'progress', fraction }));
    postMessage({ type: 'done', done });
  });
}

if (typeof window === 'undefined') inWorker();
else {
  // CDP's CPU throttling slows the page's main thread, not its workers: the same work in-thread
  // under throttling is the slow-phone compute time.
  // Globals this bundle installs for the bench page: not in TypeScript's Window.
  (window as unknown as { runInThread: (text: string) => Done }).runInThread = (text) => {
    let n = 0;
    return { ...pipeline(text, () => n++), progressMessages: n };
  };
  // Globals this bundle installs for the bench page: not in TypeScript's Window.
  (window as unknown as { runLoggerPipeline: (src: string, text: string) => Promise<Done & { progress: number[] }> }).runLoggerPipeline = (
    src,
    text,
  ) =>
    new Promise((resolve, reject) => {
      const worker = new Worker(src);
      const progress: number[] = [];
      // What the dialog does with each message: a determinate Material progress bar's value.
      worker.onmessage = ({ data }) => {
        if (data.type === 'progress') progress.push(data.fraction);
        else {
          worker.terminate();
          resolve({ ...data.done, progressMessages: progress.length, progress });
        }
      };
      worker.onerror = (e) => {
        worker.terminate();
        reject(new Error(e.message));
      };
      worker.postMessage({ text });
    });
}
