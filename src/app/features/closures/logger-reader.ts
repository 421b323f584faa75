import type { LoggerMapping, LoggerRead } from '../../../../shared/logger';
import { parseLoggerText, type ParseMessage } from './logger-parse';

/** Parses in a Web Worker (progress reported as 0…1); in-thread only where workers do not exist. */
export function readLoggerFile(text: string, mapping: LoggerMapping, progress: (fraction: number) => void): Promise<LoggerRead> {
  if (typeof Worker === 'undefined') return Promise.resolve(parseLoggerText(text, mapping, progress));
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL('./logger-parse.worker', import.meta.url), { type: 'module' });
    worker.onmessage = ({ data }: MessageEvent<ParseMessage>) => {
      if (data.type === 'progress') progress(data.fraction);
      else {
        worker.terminate();
        if (data.type === 'done') resolve(data.read);
        else reject(new Error(data.message));
      }
    };
    worker.onerror = (e) => {
      worker.terminate();
      reject(new Error(e.message || 'The file could not be read'));
    };
    worker.postMessage({ text, mapping });
  });
}
