"""Writes fixtures/fit/scipy-one-planet.json: a synthetic one-planet series and scipy's least-squares
solution of it (best fit and 1-sigma errors from inv(J^T J) of the whitened residuals, J by central
differences at the solution: the `jac` that least_squares returns for method 'lm' is the last
iteration's forward-difference one and was off by up to a factor 8 here), for the fit test.

Run: /usr/bin/python3 scripts/reference/fit_reference.py
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy.optimize import least_squares

sys.path.insert(0, os.path.dirname(__file__))
from fit_kepler_model import model  # noqa: E402


def main():
    rng = np.random.default_rng(20261201)
    n = 150
    t = np.sort(2456000 + rng.uniform(0, 1200, n))
    dy = rng.uniform(1.0, 3.0, n)
    truth = np.array([61.0, 21.0, np.sqrt(0.4) * np.cos(2.0), np.sqrt(0.4) * np.sin(2.0), 2456612.3, -5.0])
    y = model(truth, t) + dy * rng.standard_normal(n)
    start = truth * np.array([1.001, 0.9, 0.9, 1.1, 1, 1]) + np.array([0, 0, 0, 0, 0.8, 1.0])

    def resid(p):
        return (y - model(p, t)) / dy

    sol = least_squares(resid, start, method='lm', xtol=1e-14, ftol=1e-14, gtol=1e-14)
    J = np.empty((n, 6))
    steps = [1e-6 * sol.x[0], 1e-6 * sol.x[1], 1e-6, 1e-6, 1e-5, 1e-5]  # absolute: Tc is a full JD
    for j in range(6):
        h = steps[j]
        up, dn = sol.x.copy(), sol.x.copy()
        up[j] += h
        dn[j] -= h
        J[:, j] = (resid(up) - resid(dn)) / (2 * h)
    cov = np.linalg.inv(J.T @ J)
    out = {
        'provenance': {
            'tool': f'scipy {scipy.__version__} scipy.optimize.least_squares(method="lm"); errors from a central-difference Jacobian; numpy {np.__version__}',
            'command': '/usr/bin/python3 scripts/reference/fit_reference.py',
            'model': 'v = K[cos(nu+w) + e cos w] + offset; params P, K, sqrt(e)cos w, sqrt(e)sin w, Tc, offset; no jitter',
            'seed': 20261201,
        },
        'data': {'t': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist()},
        'truth': truth.tolist(),
        'start': start.tolist(),
        'solution': {
            'params': sol.x.tolist(),
            'errors': np.sqrt(np.diag(cov)).tolist(),
            'chi2': float(np.sum(sol.fun ** 2)),
            'status': int(sol.status),
        },
    }
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'fit', 'scipy-one-planet.json')
    with open(path, 'w') as f:
        json.dump(out, f, indent=1)
    print('wrote', os.path.normpath(path), 'chi2', out['solution']['chi2'])


if __name__ == '__main__':
    main()
