"""Times scipy.optimize.least_squares on the benchmark's one-planet fit (same data and start as
scripts/bench.ts, which writes them to a JSON file and passes its path).

Run: /usr/bin/python3 scripts/reference/fit_timing.py DATA.json
Prints one JSON object: {"ms": best-of-repeats wall time, "params": [...], "chi2": ..., "nfev": ..., "versions": {...}}.
"""
import json
import os
import sys
import time

import numpy as np
import scipy
from scipy.optimize import least_squares

sys.path.insert(0, os.path.dirname(__file__))
from fit_kepler_model import model  # noqa: E402


def main():
    with open(sys.argv[1]) as f:
        d = json.load(f)
    t, y, dy = (np.array(d[k]) for k in ('t', 'y', 'dy'))
    start = np.array(d['start'])

    def resid(p):
        return (y - model(p, t)) / dy

    best = float('inf')
    sol = None
    for _ in range(7):
        t0 = time.perf_counter()
        sol = least_squares(resid, start)  # default method 'trf', default tolerances
        best = min(best, (time.perf_counter() - t0) * 1000)
    print(json.dumps({
        'ms': best, 'params': sol.x.tolist(), 'chi2': float(np.sum(sol.fun ** 2)), 'nfev': int(sol.nfev),
        'versions': {'scipy': scipy.__version__, 'numpy': np.__version__},
    }))


if __name__ == '__main__':
    main()
