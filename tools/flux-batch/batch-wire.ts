/**
 * Wire shapes of the batch CLI (snake_case JSON) and their mapping to the flux engine.
 * Beyond the contract, every result carries `min_detectable_flux_umol_m2_s`, each model's `aicc`,
 * the exponential p3 and the quadratic fit (for its slope at closure); `--full` adds all model
 * parameters and the fit window. The lean default matters: writing numbers is a third of a
 * batch's cost.
 *
 * Slope basis: a run may carry `"slope_at": "closure" | "settle_end"` (default "closure").
 * `slope_ppm_s`/`flux_umol_m2_s` of each model are at the start of the fit window (t0);
 * curved models add `slope_at_closure_ppm_s`/`flux_at_closure_umol_m2_s` (t = 0); `selected`
 * names its `basis` and its flux follows it.
 */
import { fitClosure, invalidFit, type AtClosure, type ClosureFitResult, type ClosureInput, type ModelFit } from '../../shared/flux/index';

export interface WireModel {
  slope_ppm_s: number;
  flux_umol_m2_s: number;
  r2: number;
  rmse: number;
  aic: number;
  aicc: number;
  n: number;
  [extra: string]: number | null;
}

export interface WireResult {
  id: unknown;
  linear: WireModel | null;
  exponential: WireModel | null;
  quadratic?: WireModel | null;
  exponential_rejected_reason: string | null;
  selected: { model: string; basis: string; flux_umol_m2_s: number; slope_ppm_s: number; reason: string } | null;
  flags: string[];
  error: string | null;
  window?: { t0_s: number; first_t_s: number; last_t_s: number; n: number } | null;
  min_detectable_flux_umol_m2_s: number | null;
}

/**
 * One run as the batch reads it (snake_case JSON). The CLI passes values through unchecked: the
 * engine validates every one and answers a bad value with its own error, so a run is read as this
 * shape once, in processRun, and mapped field by field.
 */
export interface BatchRun {
  id?: unknown;
  t_s: ClosureInput['tS'];
  co2_ppm: ClosureInput['co2Ppm'];
  co2_is_dry?: unknown;
  h2o_mmol_mol?: ClosureInput['h2oMmolMol'];
  pressure_kpa: ClosureInput['pressureKpa'];
  temp_c: ClosureInput['tempC'];
  volume_cm3: number;
  area_cm2: number;
  settle_s: number;
  window_end_s?: unknown;
  ambient_ppm?: unknown;
  ambient_margin_ppm?: unknown;
  precision_ppm?: unknown;
  model?: unknown;
  slope_at?: ClosureInput['slopeAt'] | null;
  pressure_is_default?: unknown;
  offset_after?: unknown;
}

const optionalNumber = (v: unknown): number | undefined => (typeof v === 'number' ? v : undefined);

/** Maps one wire run to the engine input. Values are passed through; the engine validates them. */
export function runToInput(run: BatchRun): ClosureInput {
  const model = run.model;
  return {
    tS: run.t_s,
    co2Ppm: run.co2_ppm,
    co2IsDry: run.co2_is_dry === true,
    h2oMmolMol: run.h2o_mmol_mol,
    pressureKpa: run.pressure_kpa,
    tempC: run.temp_c,
    volumeCm3: run.volume_cm3,
    areaCm2: run.area_cm2,
    settleS: run.settle_s,
    windowEndS: optionalNumber(run.window_end_s),
    ambientPpm: optionalNumber(run.ambient_ppm),
    ambientMarginPpm: optionalNumber(run.ambient_margin_ppm),
    precisionPpm: optionalNumber(run.precision_ppm),
    model: model === 'linear' || model === 'exponential' || model === 'quadratic' || model === 'auto' ? model : undefined,
    slopeAt: run.slope_at ?? undefined,
    pressureIsDefault: run.pressure_is_default === true,
    offsetAfter: run.offset_after === true,
  };
}

function wireModel(m: ModelFit | null, extra: Record<string, number>): WireModel | null {
  if (!m) return null;
  return { slope_ppm_s: m.slopePpmS, flux_umol_m2_s: m.fluxUmolM2S, r2: m.r2, rmse: m.rmse, aic: m.aic, aicc: m.aicc, n: m.n, ...extra };
}

const atClosure = (m: AtClosure) => ({ slope_at_closure_ppm_s: m.slopeAtClosurePpmS, flux_at_closure_umol_m2_s: m.fluxAtClosureUmolM2S });

export function resultToWire(id: unknown, r: ClosureFitResult, full = false): WireResult {
  const e = r.exponential;
  const q = r.quadratic;
  const out: WireResult = {
    id,
    linear: wireModel(r.linear, full && r.linear ? { intercept_ppm: r.linear.interceptPpm } : {}),
    exponential: wireModel(
      e,
      e ? { ...atClosure(e), ...(full ? { p1: e.p1, p2: e.p2, p3: e.p3, p3_tau_max: e.p3TauMax } : { p3: e.p3 }) } : {},
    ),
    quadratic: wireModel(q, q ? { ...atClosure(q), ...(full ? { b0: q.b0, b1: q.b1, b2: q.b2 } : {}) } : {}),
    exponential_rejected_reason: r.exponentialRejectedReason,
    selected: r.selected && {
      model: r.selected.model,
      basis: r.selected.basis,
      flux_umol_m2_s: r.selected.fluxUmolM2S,
      slope_ppm_s: r.selected.slopePpmS,
      reason: r.selected.reason,
    },
    flags: r.flags,
    error: r.error,
    min_detectable_flux_umol_m2_s: r.minDetectableFluxUmolM2S,
  };
  if (full) {
    out.window = r.window && { t0_s: r.window.t0S, first_t_s: r.window.firstTS, last_t_s: r.window.lastTS, n: r.window.n };
  }
  return out;
}

/** One run in, one result out; a run that is not even an object still gets a result. */
export function processRun(run: unknown, full = false): WireResult {
  if (!run || typeof run !== 'object' || Array.isArray(run)) {
    return resultToWire(null, invalidFit('run is not an object'), full);
  }
  const r = run as BatchRun; // unchecked JSON: the engine validates each value (see BatchRun)
  let result: ClosureFitResult;
  try {
    result = fitClosure(runToInput(r));
  } catch (err) {
    // The engine validates its input; this only guards the batch against an engine bug.
    result = { ...fitClosure({} as ClosureInput), error: `internal error: ${(err as Error).message}` };
  }
  return resultToWire(r.id ?? null, result, full);
}
