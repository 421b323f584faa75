import type { ClosureSeries } from './closure-writes';

export type ManualRead = { ok: true; series: ClosureSeries } | { ok: false; message: string };

/**
 * A short series typed in by hand, one sample a line: "seconds CO2" (space, tab, semicolon or
 * comma between; a decimal comma is fine when the two values are not separated by a comma), with
 * the chamber air temperature given once for the closure.
 */
export function readManualSeries(text: string, tempC: number | null, pressureKpa: number | null): ManualRead {
  const tS: number[] = [];
  const co2: number[] = [];
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
  for (const [i, line] of lines.entries()) {
    const parts = line.includes(';') || line.includes('\t') || /\s/.test(line) ? line.split(/[;\t\s]+/) : line.split(',');
    const nums = parts.map((p) => Number(p.replace(',', '.')));
    if (nums.length !== 2 || nums.some((n) => !Number.isFinite(n)))
      return { ok: false, message: `Line ${i + 1}: write seconds and CO2, e.g. "30 421.5"` };
    if (tS.length && nums[0] <= tS[tS.length - 1]) return { ok: false, message: `Line ${i + 1}: time must increase` };
    tS.push(nums[0]);
    co2.push(nums[1]);
  }
  if (tS.length < 3) return { ok: false, message: 'Give at least 3 samples' };
  if (tempC === null) return { ok: false, message: 'Give the chamber air temperature' };
  return {
    ok: true,
    series: {
      tS,
      co2Ppm: co2,
      h2oMmolMol: null,
      pressureKpa: pressureKpa === null ? null : tS.map(() => pressureKpa),
      tempC: tS.map(() => tempC),
    },
  };
}
