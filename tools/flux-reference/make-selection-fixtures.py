#!/usr/bin/python3
"""Reference values from general-purpose libraries for the quadratic fit, AICc and the model choice,
written as JSON fixtures for the flux engine's tests. Synthetic closures of our own invented scenario.

Run with Debian's python3 (packages python3-numpy, python3-scipy, python3-statsmodels):
    /usr/bin/python3 tools/flux-reference/make-selection-fixtures.py
Writes shared/flux/fixtures/numpy-quadratic.json and shared/flux/fixtures/statsmodels-aicc.json.

numpy-quadratic.json: numpy.polyfit(tau, chi, 2) on the samples after the settle time; the slopes
are numpy.polyder of that polynomial evaluated at tau = 0 (end of the settle time) and at
tau = -settle (chamber closure, t = 0).

statsmodels-aicc.json: AICc = statsmodels.tools.eval_measures.aicc(llf, nobs, K) with K = regression
parameters + 1 for the error variance (Hurvich & Tsai 1989; Burnham & Anderson 2002). The line's
llf comes from statsmodels OLS; the exponential a + b*(exp(p3*tau) - 1)/p3 is fitted with scipy
(a profile grid over p3 with numpy.linalg.lstsq, refined by scipy.optimize.minimize_scalar and
curve_fit) and its
Gaussian llf = -n/2*(ln(2*pi) + ln(RSS/n) + 1). The expected choice applies the documented rule
(shared/flux/model-selection.ts) computed here independently: exponential when p3 < 0 and
n_eff*ln(RSS_lin/RSS_exp) - [pen(4) - pen(3)] > 2, pen(K) = 2K + 2K(K+1)/(n_eff - K - 1),
n_eff = n(1 - rho)/(1 + rho), rho = lag-1 autocorrelation of the exponential residuals in [0, 0.95].
"""
import json
import math
import os
import warnings

import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy.optimize import OptimizeWarning, curve_fit, minimize_scalar
from statsmodels.tools.eval_measures import aicc

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
OUT = os.path.join(ROOT, 'shared', 'flux', 'fixtures')
SETTLE = 20.0
MARGIN = 2.0


def shape(tau, p3):
    return tau if p3 == 0 else np.expm1(p3 * tau) / p3


def series(rng, n, dt, p3, noise, phi):
    """Closure from t = 0 with slope 1 ppm/s at closure; samples every dt from the settle time on."""
    t = SETTLE + np.arange(n) * dt
    e = np.empty(n)
    e[0] = rng.normal()
    for i in range(1, n):
        e[i] = phi * e[i - 1] + math.sqrt(1 - phi * phi) * rng.normal()
    y = 415.0 + shape(t, p3) + noise * e
    return t.round(3), y.round(4)


def quadratic_cases():
    rng = np.random.default_rng(20261204)
    cases = []
    for n, dt, p3, noise in [(130, 1, -0.01, 0.5), (130, 1, 0.0, 1.0), (30, 4, -0.02, 0.3), (10, 10, -0.005, 0.2), (6, 15, -0.01, 0.1)]:
        t, y = series(rng, n, dt, p3, noise, 0.0)
        tau = t - SETTLE
        p = np.polyfit(tau, y, 2)
        d = np.polyder(p)
        rss = float(np.sum((y - np.polyval(p, tau)) ** 2))
        cases.append({'t_s': t.tolist(), 'co2_ppm': y.tolist(), 'settle_s': SETTLE,
                      'b2': float(p[0]), 'b1': float(p[1]), 'b0': float(p[2]), 'rss': rss,
                      'slope_at_settle_end': float(np.polyval(d, 0.0)), 'slope_at_closure': float(np.polyval(d, -SETTLE))})
    return cases


def profile_rss(tau, y, p3):
    X = np.column_stack([np.ones_like(tau), shape(tau, p3)])
    coef, *_ = np.linalg.lstsq(X, y, rcond=None)
    return float(np.sum((y - X @ coef) ** 2)), coef[0], coef[1]


def fit_exponential(tau, y):
    tmax = tau[-1]
    best = None
    for u in np.linspace(-40, 10, 501):
        p3 = u / tmax
        X = np.column_stack([np.ones_like(tau), shape(tau, p3)])
        coef, *_ = np.linalg.lstsq(X, y, rcond=None)
        rss = float(np.sum((y - X @ coef) ** 2))
        if best is None or rss < best[0]:
            best = (rss, coef[0], coef[1], p3)
    # Refine p3 on the profile (a, b by least squares for each p3) with scipy's bounded Brent search.
    step = 0.1 / tmax
    prof = lambda p3: profile_rss(tau, y, p3)[0]
    res = minimize_scalar(prof, bounds=(best[3] - step, best[3] + step), method='bounded', options={'xatol': 1e-12})
    if res.fun < best[0]:
        rss, a, b = profile_rss(tau, y, res.x)
        best = (rss, a, b, float(res.x))
    _, a0, b0, p30 = best
    if p30 == 0:
        p30 = 1e-9
    model = lambda x, a, b, p3: a + b * shape(x, p3)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter('error', OptimizeWarning)
            popt, _ = curve_fit(model, tau, y, p0=(a0, b0, p30), maxfev=20000)
        rss = float(np.sum((y - model(tau, *popt)) ** 2))
        if rss <= best[0]:
            return rss, popt[0], popt[1], popt[2]
    except (RuntimeError, OptimizeWarning):
        pass
    return best


def penalty(k, n_eff):
    return 2 * k + 2 * k * (k + 1) / (n_eff - k - 1) if n_eff - k - 1 > 0 else math.inf


def selection_cases():
    rng = np.random.default_rng(19890301)
    cases = []
    for n, dt in [(6, 15), (10, 10), (30, 4), (130, 1)]:
        for p3 in (0.0, -0.01, -0.03):
            for noise, phi in [(0.3, 0.0), (1.0, 0.0), (1.0, 0.8)]:
                for _ in range(2):
                    t, y = series(rng, n, dt, p3, noise, phi)
                    tau = t - SETTLE
                    ols = sm.OLS(y, sm.add_constant(tau)).fit()
                    aicc_lin = float(aicc(ols.llf, n, 3))
                    rss_exp, a, b, p3_fit = fit_exponential(tau, y)
                    llf_exp = -n / 2 * (math.log(2 * math.pi) + math.log(rss_exp / n) + 1)
                    aicc_exp = float(aicc(llf_exp, n, 4))
                    r = y - (a + b * shape(tau, p3_fit))
                    rho = min(0.95, max(0.0, float(np.sum(r[1:] * r[:-1]) / np.sum(r * r))))
                    n_eff = n * (1 - rho) / (1 + rho)
                    pen = penalty(4, n_eff) - penalty(3, n_eff)
                    adv = n_eff * math.log(float(ols.ssr) / rss_exp) - pen if math.isfinite(pen) else -math.inf
                    choice = 'exponential' if p3_fit < 0 and adv > MARGIN else 'linear'
                    cases.append({'t_s': t.tolist(), 'co2_ppm': y.tolist(), 'settle_s': SETTLE, 'p3_true': p3, 'noise': noise, 'phi': phi,
                                  'aicc_linear': aicc_lin, 'aicc_exponential': aicc_exp, 'rss_linear': float(ols.ssr), 'rss_exponential': rss_exp,
                                  'p3': float(p3_fit), 'rho': rho, 'advantage': adv if math.isfinite(adv) else None,
                                  'near_margin': bool(math.isfinite(adv) and abs(adv - MARGIN) < 0.05), 'choice': choice})
    return cases


def main():
    versions = {'numpy': np.__version__, 'scipy': scipy.__version__, 'statsmodels': statsmodels.__version__}
    with open(os.path.join(OUT, 'numpy-quadratic.json'), 'w') as f:
        json.dump({'generator': 'tools/flux-reference/make-selection-fixtures.py', 'versions': versions, 'closures': quadratic_cases()}, f)
    with open(os.path.join(OUT, 'statsmodels-aicc.json'), 'w') as f:
        json.dump({'generator': 'tools/flux-reference/make-selection-fixtures.py', 'versions': versions, 'margin': MARGIN,
                   'closures': selection_cases()}, f)


if __name__ == '__main__':
    main()
