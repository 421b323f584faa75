#!/usr/bin/env python3
"""Reference loop for the benchmark: per closure, the same window and dry-mole-fraction
conversion as the engine, then scipy.stats.linregress and scipy.optimize.curve_fit of
p1 + p2·exp(p3·τ). Times only the per-closure work (JSON reading excluded, in scipy's favour).
Usage: python3 scipy-loop.py runs.json [max_closures]"""
import json
import sys
import time
import warnings

import numpy as np
from scipy import stats
from scipy.optimize import OptimizeWarning, curve_fit


def model(tau, p1, p2, p3):
    return p1 + p2 * np.exp(p3 * tau)


def fit(run):
    t = np.array(run['t_s'], dtype=float)
    c = np.array(run['co2_ppm'], dtype=float)
    w = np.array(run['h2o_mmol_mol'], dtype=float)
    keep = (t >= run['settle_s']) & np.isfinite(t) & np.isfinite(c) & np.isfinite(w)
    tau = t[keep] - run['settle_s']
    y = c[keep] / (1.0 - w[keep] / 1000.0)
    lin = stats.linregress(tau, y)
    rise = y[-1] - y[0]
    p0 = (y[-1] + rise, -rise if rise != 0 else -1.0, -1.0 / tau[-1])
    try:
        popt, _ = curve_fit(model, tau, y, p0=p0)  # default maxfev (800 for 3 parameters)
        return lin.slope, popt[1] * popt[2], True
    except (RuntimeError, OptimizeWarning):
        return lin.slope, float('nan'), False


def main():
    runs = json.load(open(sys.argv[1]))['runs']
    limit = int(sys.argv[2]) if len(sys.argv) > 2 else len(runs)
    runs = runs[:limit]
    warnings.simplefilter('ignore')
    start = time.perf_counter()
    failures = 0
    ok_seconds = 0.0
    for run in runs:
        t0 = time.perf_counter()
        _, _, ok = fit(run)
        if ok:
            ok_seconds += time.perf_counter() - t0
        failures += not ok
    seconds = time.perf_counter() - start
    converged = len(runs) - failures
    # per_closure_converged_s: the cost where curve_fit converges (failures run to maxfev and
    # are slower); reported so that the ratio is not inflated by scipy's failures.
    print(json.dumps({'closures': len(runs), 'seconds': seconds, 'per_closure_s': seconds / len(runs),
                      'per_closure_converged_s': ok_seconds / converged if converged else None,
                      'curve_fit_failures': failures}))


if __name__ == '__main__':
    main()
