import { parseLoggerText, type ParseMessage, type ParseRequest } from './logger-parse';

// Big files (hours at 1 Hz or faster) are parsed off the main thread so the screen stays responsive.
addEventListener('message', ({ data }: MessageEvent<ParseRequest>) => {
  let last = 0;
  try {
    const read = parseLoggerText(data.text, data.mapping, (fraction) => {
      if (fraction - last >= 0.02 || fraction === 1) {
        last = fraction;
        postMessage({ type: 'progress', fraction } satisfies ParseMessage);
      }
    });
    postMessage({ type: 'done', read } satisfies ParseMessage);
  } catch (err) {
    postMessage({ type: 'error', message: err instanceof Error ? err.message : String(err) } satisfies ParseMessage);
  }
});
