// Closure capture reads files in a module Web Worker (import.meta, not loadable under CommonJS
// jest): here the same parser runs in the test's thread.
jest.mock('../closures/logger-reader', () => ({
  readLoggerFile: (text: string, mapping: unknown, progress: (f: number) => void) =>
    Promise.resolve(jest.requireActual('../closures/logger-parse').parseLoggerText(text, mapping, progress)),
}));
import { leakPieces } from './leak-file';

describe('leak-check file pieces', () => {
  it('when the logger writes clock times, then each piece names its start in the site’s zone, not the device’s', async () => {
    // The file's clock is the site's (Auckland, NZST = UTC+12 in June); the device runs in UTC.
    const csv =
      'timestamp,co2_ppm\n2026-06-02 09:00:00,420\n2026-06-02 09:00:10,420.1\n2026-06-02 09:00:20,420.2\n2026-06-02 09:00:30,420.3\n';
    const pieces = await leakPieces(csv, 'Pacific/Auckland', null);
    expect(pieces.map((p) => p.label)).toEqual(['Piece 1: lines 2–5, 09:00:00 NZST, 4 samples']);
  });
});
