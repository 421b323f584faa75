#!/usr/bin/env python3
"""Reference fits of closures with points left out, by a general-purpose library (numpy), for the
Bench's point exclusion: the engine's fit with some sample indices excluded must equal numpy's
fit of the remaining samples (ordinary least squares: numpy.polyfit degree 1 and 2; R² = 1 − RSS/TSS).
Synthetic closures of our own invented scenario, each with a spike (a run of samples lifted by a
disturbance) and single outliers, and the indices the lab leaves out.

Run:  /usr/bin/python3 tools/flux-reference/make-exclusion-fixtures.py   (needs python3-numpy)
Writes shared/flux/fixtures/numpy-exclusions.json.
"""
import json
import os

import numpy as np

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
OUT = os.path.join(ROOT, 'shared', 'flux', 'fixtures', 'numpy-exclusions.json')


def cases():
    rng = np.random.default_rng(20261204)
    out = []
    for n, dt, settle, slope, curve, spike_at, spike_len, singles in (
        (90, 1.0, 20.0, 0.8, 0.0, 45, 4, [70]),
        (60, 2.0, 30.0, 0.3, -0.0015, 30, 3, [12, 50]),
        (120, 1.0, 15.0, -0.2, 0.0, 100, 6, []),
        (40, 3.0, 20.0, 1.5, -0.004, 20, 2, [35]),
        (25, 5.0, 20.0, 0.5, 0.0, 10, 1, [3, 22]),
    ):
        t = np.arange(n) * dt
        tau = t - settle
        y = 420.0 + slope * tau + curve * np.clip(tau, 0, None) ** 2 + rng.normal(0.0, 0.4, n)
        y[spike_at:spike_at + spike_len] += 35.0          # the spike
        for i in singles:
            y[i] -= 18.0                                  # single bad points
        excluded = list(range(spike_at, spike_at + spike_len)) + singles
        out.append({'t_s': t.round(3).tolist(), 'co2_ppm': y.round(4).tolist(), 'settle_s': settle,
                    'excluded': sorted(excluded)})
    return out


def reference(c):
    t = np.array(c['t_s'])
    y = np.array(c['co2_ppm'])
    keep = np.ones(len(t), dtype=bool)
    keep[c['excluded']] = False
    keep &= t >= c['settle_s']
    tau = t[keep] - c['settle_s']
    yk = y[keep]
    tss = float(np.sum((yk - yk.mean()) ** 2))
    b1, b0 = np.polyfit(tau, yk, 1)
    rss1 = float(np.sum((yk - (b0 + b1 * tau)) ** 2))
    q2, q1, q0 = np.polyfit(tau, yk, 2)
    rss2 = float(np.sum((yk - (q0 + q1 * tau + q2 * tau ** 2)) ** 2))
    return {'n_used': int(keep.sum()),
            'linear': {'slope': float(b1), 'intercept': float(b0), 'rss': rss1, 'r2': 1 - rss1 / tss},
            'quadratic': {'b0': float(q0), 'b1': float(q1), 'b2': float(q2), 'rss': rss2, 'r2': 1 - rss2 / tss}}


def main():
    rows = []
    for c in cases():
        c.update(reference(c))
        rows.append(c)
    with open(OUT, 'w') as f:
        json.dump({'generator': 'tools/flux-reference/make-exclusion-fixtures.py',
                   'versions': {'numpy': np.__version__}, 'closures': rows}, f)
    print(f'wrote {OUT}: {len(rows)} closures')


if __name__ == '__main__':
    main()
