/**
 * Input checks and the fit window of a closure: every sample with t ≥ t0 (end of the settle
 * time, even when the first usable sample comes later) and finite values, less the samples
 * the lab left out, converted to dry mole fraction. The arrays returned are scratch buffers reused by the next call.
 */
import type { ClosureInput } from './closure-input';
import { dryMoleFractionPpm, waterMoleFraction } from './dry-mole-fraction';

export interface ClosureWindow {
  n: number;
  t0S: number;
  /** τ = t − t0, ascending. */
  tau: Float64Array;
  /** Dry CO2 mole fraction, ppm. */
  chi: Float64Array;
  tauMax: number;
  gapsDropped: boolean;
  noWaterData: boolean;
  /** χw, p and T of the first sample used. */
  waterMolFraction: number;
  pressureKpa: number;
  tempC: number;
}

export type WindowOutcome = { ok: true; window: ClosureWindow } | { ok: false; error: string };

let tauBuf = new Float64Array(512);
let chiBuf = new Float64Array(512);
let idxBuf = new Int32Array(512);

const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

function sameLength(v: unknown, n: number): boolean {
  return !Array.isArray(v) || v.length === n;
}

/** First finite value of a per-sample array at the used indices, starting at the first one. */
function atFirstUsed(v: number | readonly (number | null)[], idx: Int32Array, n: number): number {
  if (!Array.isArray(v)) return isNum(v) ? v : NaN;
  for (let k = 0; k < n; k++) {
    const x = v[idx[k]];
    if (isNum(x)) return x;
  }
  return NaN;
}

export function checkInput(input: ClosureInput): string | null {
  if (!input || typeof input !== 'object') return 'input is not an object';
  const { tS, co2Ppm } = input;
  if (!Array.isArray(tS) || !Array.isArray(co2Ppm)) return 'time and CO2 series are required';
  const len = tS.length;
  if (co2Ppm.length !== len) return `unequal array lengths: t ${len}, co2 ${co2Ppm.length}`;
  for (const [name, v] of [
    ['h2o', input.h2oMmolMol],
    ['pressure', input.pressureKpa],
    ['temperature', input.tempC],
  ] as const) {
    if (!sameLength(v, len)) return `unequal array lengths: t ${len}, ${name} ${(v as unknown[]).length}`;
  }
  if (!isNum(input.settleS) || input.settleS < 0) return 'missing settle time';
  if (!Array.isArray(input.pressureKpa) && !(isNum(input.pressureKpa) && input.pressureKpa > 0)) return 'missing pressure';
  if (!Array.isArray(input.tempC) && !(isNum(input.tempC) && input.tempC > -273.15)) return 'missing temperature';
  if (!(isNum(input.volumeCm3) && input.volumeCm3 > 0)) return 'missing volume';
  if (!(isNum(input.areaCm2) && input.areaCm2 > 0)) return 'missing area';
  if (input.slopeAt != null && input.slopeAt !== 'closure' && input.slopeAt !== 'settle_end') {
    return `unknown slope basis ${JSON.stringify(input.slopeAt)} (use "closure" or "settle_end")`;
  }
  return null;
}

/** The series fields that decide which samples a fit uses. */
export type WindowSeries = Pick<ClosureInput, 'tS' | 'co2Ppm' | 'h2oMmolMol' | 'co2IsDry' | 'settleS' | 'windowEndS' | 'excludedIndices'>;

interface Collected {
  n: number;
  gaps: boolean;
  sorted: boolean;
  useWater: boolean;
  h2oArray: readonly (number | null)[] | null;
  h2oConst: number;
}

/**
 * The one rule for which samples a fit uses: finite t within [t0, window end], not left out by
 * the lab (`excludedIndices`), finite CO2 and, when the closure has water data, a usable H2O
 * value. Fills the scratch buffers; a left-out sample is not a gap.
 */
function collectWindow(input: WindowSeries): Collected {
  const { tS, co2Ppm } = input;
  const len = tS.length;
  if (tauBuf.length < len) {
    tauBuf = new Float64Array(len * 2);
    chiBuf = new Float64Array(len * 2);
    idxBuf = new Int32Array(len * 2);
  }
  const t0 = input.settleS;
  const end = isNum(input.windowEndS) ? input.windowEndS : Infinity;
  const h2o = input.h2oMmolMol;
  const h2oArray = Array.isArray(h2o) ? h2o : null;
  const h2oConst = isNum(h2o) ? h2o : NaN;
  const useWater = h2oArray ? h2oArray.some(isNum) : isNum(h2o);
  const alreadyDry = input.co2IsDry === true;
  const left = input.excludedIndices?.length ? excludedMask(input.excludedIndices, len) : null;
  let n = 0;
  let seenWindow = false;
  let gaps = false;
  let sorted = true;
  for (let i = 0; i < len; i++) {
    const t = tS[i];
    if (!isNum(t)) {
      if (seenWindow) gaps = true;
      continue;
    }
    if (t < t0 || t > end) continue;
    seenWindow = true;
    if (left && left[i]) continue;
    const c = co2Ppm[i];
    const w = h2oArray ? h2oArray[i] : h2oConst;
    if (!isNum(c) || (useWater && !(isNum(w) && w < 1000))) {
      gaps = true;
      continue;
    }
    const tau = t - t0;
    if (n > 0 && tau < tauBuf[n - 1]) sorted = false;
    tauBuf[n] = tau;
    chiBuf[n] = useWater && !alreadyDry ? dryMoleFractionPpm(c, w as number) : c;
    idxBuf[n] = i;
    n++;
  }
  return { n, gaps, sorted, useWater, h2oArray, h2oConst };
}

function excludedMask(indices: readonly number[], len: number): Uint8Array {
  const mask = new Uint8Array(len);
  for (const i of indices) if (Number.isInteger(i) && i >= 0 && i < len) mask[i] = 1;
  return mask;
}

/** How many samples a fit of this series would use (the window rule of collectWindow). */
export function usablePointCount(input: WindowSeries): number {
  if (!Array.isArray(input.tS) || !Array.isArray(input.co2Ppm) || !isNum(input.settleS)) return 0;
  return collectWindow(input).n;
}

export function extractWindow(input: ClosureInput): WindowOutcome {
  const error = checkInput(input);
  if (error) return { ok: false, error };
  const { n, gaps, sorted, useWater, h2oArray, h2oConst } = collectWindow(input);
  if (n === 0) return { ok: false, error: 'no usable points after the settle time' };
  if (!sorted) sortByTau(n);
  const p = atFirstUsed(input.pressureKpa, idxBuf, n);
  const temp = atFirstUsed(input.tempC, idxBuf, n);
  if (!(p > 0)) return { ok: false, error: 'missing pressure' };
  if (!(temp > -273.15)) return { ok: false, error: 'missing temperature' };
  const w0 = useWater ? (h2oArray ? (h2oArray[idxBuf[0]] as number) : h2oConst) : 0;
  return {
    ok: true,
    window: {
      n,
      t0S: input.settleS,
      tau: tauBuf,
      chi: chiBuf,
      tauMax: tauBuf[n - 1],
      gapsDropped: gaps,
      noWaterData: !useWater,
      waterMolFraction: waterMoleFraction(w0),
      pressureKpa: p,
      tempC: temp,
    },
  };
}

/** Out-of-order timestamps are rare (clock corrections); sort the three buffers together. */
function sortByTau(n: number): void {
  const order = Array.from({ length: n }, (_, k) => k).sort((a, b) => tauBuf[a] - tauBuf[b]);
  const tau = order.map((k) => tauBuf[k]);
  const chi = order.map((k) => chiBuf[k]);
  const idx = order.map((k) => idxBuf[k]);
  for (let k = 0; k < n; k++) {
    tauBuf[k] = tau[k];
    chiBuf[k] = chi[k];
    idxBuf[k] = idx[k];
  }
}
