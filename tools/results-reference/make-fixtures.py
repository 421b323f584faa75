#!/usr/bin/env python3
"""Reference results by statsmodels (Debian python3-statsmodels) for the results statistics' tests:
 - the additive cell + block model (plot-level treatments, blocks as a factor) and the split-plot
   stratum (collar-level treatments paired by plot) on balanced, unbalanced and missing-block data:
   OLS y ~ C(cell) + C(factor), residual df and mean square, each cell's least-squares mean (averaged
   over the factor's levels with equal weight) with its SE, and each factor level's effect (its
   least-squares mean, averaged over cells, minus the grand least-squares mean);
 - log-scale temperature responses: OLS of ln(flux) on x with 95 % t intervals.
Invented data of our own; the tests never run python.

Run:  /usr/bin/python3 tools/results-reference/make-fixtures.py   (needs numpy, pandas, statsmodels)
Writes server/results/fixtures/statsmodels-blocks.json and server/results/fixtures/statsmodels-log-response.json.
"""
import json
import os

import numpy as np
import pandas as pd
import statsmodels
import statsmodels.formula.api as smf

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
OUT = os.path.join(ROOT, 'server', 'results', 'fixtures')


def block_case(name, rows):
    df = pd.DataFrame(rows, columns=['cell', 'factor', 'y'])
    fit = smf.ols('y ~ C(cell) + C(factor)', data=df).fit()
    names = list(fit.params.index)
    cells = sorted(df['cell'].unique())
    factors = sorted(df['factor'].unique())
    cov = fit.cov_params().values

    def vec(cell=None, factor=None):
        v = np.zeros(len(names))
        v[0] = 1.0
        for c in cells[1:]:
            w = (1.0 / len(cells)) if cell is None else (1.0 if c == cell else 0.0)
            v[names.index(f'C(cell)[T.{c}]')] = w
        for f in factors[1:]:
            w = (1.0 / len(factors)) if factor is None else (1.0 if f == factor else 0.0)
            v[names.index(f'C(factor)[T.{f}]')] = w
        return v

    grand = float(vec() @ fit.params.values)
    lsmeans = {}
    for c in cells:
        v = vec(cell=c)
        lsmeans[c] = {'mean': float(v @ fit.params.values), 'se': float(np.sqrt(v @ cov @ v))}
    effects = {f: float(vec(factor=f) @ fit.params.values) - grand for f in factors}
    return {'name': name, 'rows': rows, 'df_resid': float(fit.df_resid), 'mse_resid': float(fit.mse_resid),
            'lsmeans': lsmeans, 'factor_effects': effects}


def block_cases():
    rng = np.random.default_rng(20261204)
    cell_eff = {'A': 3.0, 'B': 4.5, 'C': 5.2}
    block_eff = {'B1': -0.6, 'B2': 0.1, 'B3': 0.4, 'B4': 0.9}
    balanced = [[c, b, round(cell_eff[c] + block_eff[b] + rng.normal(0, 0.4), 4)] for c in cell_eff for b in block_eff]
    unbalanced = balanced + [['A', 'B2', round(cell_eff['A'] + block_eff['B2'] + rng.normal(0, 0.4), 4)],
                             ['C', 'B4', round(cell_eff['C'] + block_eff['B4'] + rng.normal(0, 0.4), 4)]]
    missing = [r for r in balanced if not (r[0] == 'B' and r[1] == 'B4')]
    # Split plot: collar-level cells X and Y paired inside plots P1..P5 (the pairing factor is the plot).
    plot_eff = {'P1': -0.8, 'P2': 0.3, 'P3': 0.0, 'P4': 1.1, 'P5': -0.2}
    split = [[c, p, round({'X': 1.6, 'Y': 2.7}[c] + plot_eff[p] + rng.normal(0, 0.25), 4)] for c in ('X', 'Y') for p in plot_eff]
    split_missing = [r for r in split if not (r[0] == 'Y' and r[1] == 'P5')]
    return [block_case('balanced blocks', balanced), block_case('unbalanced blocks', unbalanced),
            block_case('missing block', missing), block_case('split plot, balanced', split),
            block_case('split plot, one collar missing', split_missing)]


def log_response_cases():
    rng = np.random.default_rng(7)
    out = []
    for model, r10, beta in (('q10', 2.0, np.log(2.4)), ('lloyd-taylor', 1.5, 310.0)):
        t = np.sort(rng.uniform(2.0, 24.0, 14)).round(2)
        x = (t - 10.0) / 10.0 if model == 'q10' else 1.0 / (283.15 - 227.13) - 1.0 / (t + 273.15 - 227.13)
        y = (r10 * np.exp(beta * x) * np.exp(rng.normal(0.0, 0.2, t.size))).round(5)
        fit = smf.ols('ly ~ x', data=pd.DataFrame({'ly': np.log(y), 'x': x})).fit()
        ci = fit.conf_int(0.05).values
        out.append({'model': model, 'temp_c': t.tolist(), 'flux': y.tolist(),
                    'intercept': float(fit.params.iloc[0]), 'slope': float(fit.params.iloc[1]),
                    'intercept_ci': ci[0].tolist(), 'slope_ci': ci[1].tolist(),
                    'se_intercept': float(fit.bse.iloc[0]), 'se_slope': float(fit.bse.iloc[1])})
    return out


def main():
    os.makedirs(OUT, exist_ok=True)
    meta = {'generator': 'tools/results-reference/make-fixtures.py', 'statsmodels': statsmodels.__version__, 'numpy': np.__version__}
    with open(os.path.join(OUT, 'statsmodels-blocks.json'), 'w') as f:
        json.dump({**meta, 'cases': block_cases()}, f, indent=1)
    with open(os.path.join(OUT, 'statsmodels-log-response.json'), 'w') as f:
        json.dump({**meta, 'cases': log_response_cases()}, f, indent=1)


if __name__ == '__main__':
    main()
