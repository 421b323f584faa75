/** Linear scales and "nice" ticks for the small SVG charts of the results screens. */
export interface Scale {
  (v: number): number;
  ticks: number[];
}

export function linearScale(lo: number, hi: number, from: number, to: number, tickCount = 5): Scale {
  if (!(hi > lo)) hi = lo + 1;
  const f = ((v: number) => from + ((v - lo) / (hi - lo)) * (to - from)) as Scale;
  const raw = (hi - lo) / tickCount;
  const step = [1, 2, 5, 10].map((m) => m * 10 ** Math.floor(Math.log10(raw))).find((s) => s >= raw) ?? raw;
  f.ticks = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + 1e-9; t += step) f.ticks.push(Math.round(t * 1e6) / 1e6);
  return f;
}

/** Dry → wet as light sand → deep blue, so moisture reads at a glance beside temperature. */
export function moistureColour(vwc: number | null, lo: number, hi: number): string {
  if (vwc === null) return '#888';
  const k = hi > lo ? Math.min(1, Math.max(0, (vwc - lo) / (hi - lo))) : 0.5;
  const mix = (a: number, b: number) => Math.round(a + (b - a) * k);
  return `rgb(${mix(214, 24)}, ${mix(170, 72)}, ${mix(96, 160)})`;
}
