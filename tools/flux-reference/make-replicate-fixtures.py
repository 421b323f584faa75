#!/usr/bin/env python3
"""Reference mean and sample standard deviation (n - 1 denominator) of probe replicates, computed
with Python's standard library `statistics.mean` / `statistics.stdev` (exact rational arithmetic
on the floats, then rounded once), written as a JSON fixture for shared/model/probe-replicates.spec.ts.

Run:  /usr/bin/python3 tools/flux-reference/make-replicate-fixtures.py   (standard library only)
Writes shared/model/fixtures/python-replicate-stats.json.
"""
import json
import os
import random
import statistics
import sys

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
OUT = os.path.join(ROOT, 'shared', 'model', 'fixtures', 'python-replicate-stats.json')


def cases():
    rng = random.Random(20261204)
    fixed = [
        [23.4, 25.1, 24.0],            # three VWC insertions around a collar, %
        [12.1, 12.3],                   # two soil temperatures, degC
        [0.0, 0.0, 0.0],                # no spread
        [-3.5, -2.25, -4.0, -3.0],      # frozen soil
        [1e9 + 1, 1e9 + 2, 1e9 + 3],    # large offset: a naive sum-of-squares formula loses digits
        [31.7, 31.7000001, 31.6999999], # tiny spread
    ]
    for values in fixed:
        yield values
    for n in (2, 3, 3, 4, 5, 8, 12):
        yield [round(rng.uniform(5, 45), 1) for _ in range(n)]


def main():
    out = {
        'source': f'Python {sys.version.split()[0]} statistics.mean / statistics.stdev (sample SD, n - 1)',
        'cases': [{'values': v, 'mean': statistics.mean(v), 'sd': statistics.stdev(v)} for v in cases()],
    }
    with open(OUT, 'w') as f:
        json.dump(out, f, indent=1)
        f.write('\n')
    print(f'wrote {OUT} ({len(out["cases"])} cases)')


if __name__ == '__main__':
    main()
