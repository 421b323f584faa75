import { statSync, utimesSync } from 'node:fs';
import path from 'node:path';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const { ensureBuilt, isStale } = require('./launch.js') as { ensureBuilt(rel: string): string; isStale(js: string): boolean };

const root = path.resolve(__dirname, '..', '..');

/** Sets a file's modification time into the future for the length of one check, then puts it back. */
function touchedLater<T>(file: string, check: () => T): T {
  const { atime, mtime } = statSync(file);
  utimesSync(file, atime, new Date(Date.now() + 60_000));
  try {
    return check();
  } finally {
    utimesSync(file, atime, mtime);
  }
}

describe('flux CLI launcher: compiles again when anything the compiler read has changed', () => {
  jest.setTimeout(120_000);

  it('when a source imported from another folder changes, then the compiled benchmark counts as stale', () => {
    // The in-process benchmark imports the CLI's wire code from tools/flux-batch, beside neither its own folder nor shared/flux.
    const js = ensureBuilt('tools/bench-flux.d/bench-in-process.ts');
    expect(isStale(js)).toBe(false);
    expect(touchedLater(path.join(root, 'tools/flux-batch/batch-wire.ts'), () => isStale(js))).toBe(true);
    expect(touchedLater(path.join(root, 'shared/flux/linear-fit.ts'), () => isStale(js))).toBe(true);
    expect(touchedLater(path.join(root, 'server/tsconfig.json'), () => isStale(js))).toBe(true);
    expect(isStale(js)).toBe(false);
  });
});
