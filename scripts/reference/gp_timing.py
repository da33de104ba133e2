"""Times the dense GP reference on the benchmark's data (scripts/bench-gp.ts writes it and passes the path):
builds the same quasi-periodic covariance with numpy and times scipy.linalg.cho_factor on it (and the
whole log-likelihood: cho_factor + cho_solve + log-determinant), best of 15 repeats, wall and CPU time.

Run: /usr/bin/python3 scripts/reference/gp_timing.py DATA.json
Prints one JSON object: {"choMs": wall, "choCpuMs": CPU time of the process (all BLAS threads), "lnLMs": ..., "lnL": ..., "versions": {...}}.
"""
import json
import sys
import time

import numpy as np
import scipy
import scipy.linalg


def main():
    with open(sys.argv[1]) as f:
        d = json.load(f)
    t, y, noise = (np.array(d[k]) for k in ('t', 'y', 'noiseVar'))
    h, period, lam, gamma = d['amplitude'], d['period'], d['decayTime'], d['roughness']
    tau = t[:, None] - t[None, :]
    c = h * h * np.exp(-tau ** 2 / (2 * lam ** 2) - gamma * np.sin(np.pi * tau / period) ** 2) + np.diag(noise)
    best_cho = best_lnl = best_cpu = float('inf')
    lnl = None
    for _ in range(15):
        t0, p0 = time.perf_counter(), time.process_time()
        cf = scipy.linalg.cho_factor(c, lower=True)
        best_cho = min(best_cho, (time.perf_counter() - t0) * 1000)
        best_cpu = min(best_cpu, (time.process_time() - p0) * 1000)
        t0 = time.perf_counter()
        cf = scipy.linalg.cho_factor(c, lower=True)
        alpha = scipy.linalg.cho_solve(cf, y)
        lnl = -0.5 * (y @ alpha + 2 * np.sum(np.log(np.diag(cf[0]))) + len(t) * np.log(2 * np.pi))
        best_lnl = min(best_lnl, (time.perf_counter() - t0) * 1000)
    print(json.dumps({'choMs': best_cho, 'choCpuMs': best_cpu, 'lnLMs': best_lnl, 'lnL': float(lnl),
                      'versions': {'scipy': scipy.__version__, 'numpy': np.__version__}}))


if __name__ == '__main__':
    main()
