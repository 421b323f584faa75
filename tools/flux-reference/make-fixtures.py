#!/usr/bin/env python3
"""Reference fits by general-purpose libraries (scipy.optimize.curve_fit, scipy.stats), written
as JSON fixtures for the flux engine's tests. Synthetic closures of our own invented scenario;
the engine must agree wherever scipy converges.

Run:  python3 tools/flux-reference/make-fixtures.py   (needs numpy and scipy)
Writes shared/flux/fixtures/scipy-exponential.json and shared/flux/fixtures/scipy-temperature.json.
"""
import json
import os
import warnings

import numpy as np
import scipy
from scipy import stats
from scipy.optimize import OptimizeWarning, curve_fit

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
OUT = os.path.join(ROOT, 'shared', 'flux', 'fixtures')


def exp_model(tau, p1, p2, p3):
    return p1 + p2 * np.exp(p3 * tau)


def closures():
    rng = np.random.default_rng(20240611)
    cases = []
    for u in (-20.0, -8.0, -4.0, -2.0, -1.0, -0.3, 0.0, 0.5):
        for slope in (2.0, 0.4, -0.6):
            for noise in (0.2, 1.0):
                n = 60
                tau = np.arange(n) * 2.0          # 2 s sampling after the settle time
                tmax = tau[-1]
                p3 = u / tmax
                f = tau if p3 == 0 else np.expm1(p3 * tau) / p3
                y = 415.0 + slope * f + rng.normal(0.0, noise, n)
                cases.append({'u_true': u, 'slope_true': slope, 'noise': noise,
                              'tau': tau.round(3).tolist(), 'y': y.round(4).tolist()})
    return cases


def fit_exponential(case):
    tau = np.array(case['tau'])
    y = np.array(case['y'])
    tmax = tau[-1]
    # A typical hand-made start: saturation a bit beyond the last value, time constant = closure.
    rise = y[-1] - y[0]
    p0 = (y[-1] + rise, -rise if rise != 0 else -1.0, -1.0 / tmax)
    lin = stats.linregress(tau, y)
    out = {'linear_slope': float(lin.slope), 'p0': list(map(float, p0))}
    try:
        with warnings.catch_warnings():
            warnings.simplefilter('error', OptimizeWarning)
            popt, pcov = curve_fit(exp_model, tau, y, p0=p0, maxfev=5000)
        rss = float(np.sum((y - exp_model(tau, *popt)) ** 2))
        u = float(popt[2] * tmax)
        # Stalled: LM crept towards p3 → 0 with a huge p2 (a straight line written as an
        # exponential); curve_fit reports success, but this is not the least-squares optimum.
        stalled = bool(abs(u) < 1e-2 and abs(popt[1]) > 100 * (y.max() - y.min()))
        ok = bool(np.all(np.isfinite(pcov)) and -40 < u < 10 and not stalled)
        out.update({'converged': ok, 'stalled': stalled, 'p1': float(popt[0]), 'p2': float(popt[1]), 'p3': float(popt[2]),
                    'slope': float(popt[1] * popt[2]), 'rss': rss, 'u': u})
    except (RuntimeError, OptimizeWarning) as exc:
        out.update({'converged': False, 'failure': str(exc).splitlines()[0][:120]})
    return out


def temperature_sets():
    rng = np.random.default_rng(7)
    sets = []
    for (r10, q10, noise, n) in ((2.0, 2.2, 0.15, 24), (1.1, 3.0, 0.3, 12), (0.4, 1.6, 0.1, 8)):
        t = np.sort(rng.uniform(2.0, 24.0, n))
        y = r10 * q10 ** ((t - 10.0) / 10.0) + rng.normal(0.0, noise, n)
        sets.append({'temp_c': t.round(2).tolist(), 'flux': y.round(4).tolist()})
    return sets


def fit_temperature(s):
    t = np.array(s['temp_c'])
    y = np.array(s['flux'])
    n = len(t)
    tq = float(stats.t.ppf(0.975, n - 2))
    # Q10 in the form R10·exp(θ (T − 10)), θ = ln Q10 / 10; interval on θ transformed to Q10.
    q_model = lambda T, r10, th: r10 * np.exp(th * (T - 10.0))
    popt, pcov = curve_fit(q_model, t, y, p0=(1.0, 0.07))
    se = np.sqrt(np.diag(pcov))
    q10 = {'r10': popt[0], 'r10_lo': popt[0] - tq * se[0], 'r10_hi': popt[0] + tq * se[0],
           'q10': np.exp(10 * popt[1]), 'q10_lo': np.exp(10 * (popt[1] - tq * se[1])),
           'q10_hi': np.exp(10 * (popt[1] + tq * se[1]))}
    # Lloyd & Taylor (1994) Eq. 11 with T0 = 227.13 K fixed.
    lt_model = lambda T, r10, e0: r10 * np.exp(e0 * (1 / 56.02 - 1 / (T + 273.15 - 227.13)))
    popt, pcov = curve_fit(lt_model, t, y, p0=(1.0, 300.0))
    se = np.sqrt(np.diag(pcov))
    lt = {'r10': popt[0], 'r10_lo': popt[0] - tq * se[0], 'r10_hi': popt[0] + tq * se[0],
          'e0': popt[1], 'e0_lo': popt[1] - tq * se[1], 'e0_hi': popt[1] + tq * se[1]}
    return {'t975': tq, 'q10': {k: float(v) for k, v in q10.items()}, 'lloyd_taylor': {k: float(v) for k, v in lt.items()}}


def main():
    os.makedirs(OUT, exist_ok=True)
    meta = {'generator': 'tools/flux-reference/make-fixtures.py', 'scipy': scipy.__version__, 'numpy': np.__version__}
    cases = closures()
    for c in cases:
        c['scipy'] = fit_exponential(c)
    with open(os.path.join(OUT, 'scipy-exponential.json'), 'w') as fh:
        json.dump({**meta, 'model': 'p1 + p2*exp(p3*tau), scipy.optimize.curve_fit (LM)', 'closures': cases}, fh)
    sets = temperature_sets()
    for s in sets:
        s['scipy'] = fit_temperature(s)
    quantiles = [{'p': p, 'df': df, 't': float(stats.t.ppf(p, df))} for p in (0.975, 0.95) for df in (1, 2, 3, 6, 10, 22, 100)]
    with open(os.path.join(OUT, 'scipy-temperature.json'), 'w') as fh:
        json.dump({**meta, 'sets': sets, 'student_t': quantiles}, fh)
    ok = sum(c['scipy']['converged'] for c in cases)
    print(f'{len(cases)} closures, scipy converged on {ok}; {len(sets)} temperature sets')


if __name__ == '__main__':
    main()
