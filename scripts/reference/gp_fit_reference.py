"""Writes fixtures/gp/scipy-gp-fit.json: an independent "planet + GP" fit for tests/shared/rv/gp/gp-fit-scipy.spec.ts.

A seeded synthetic spotted star (invented): one instrument, 120 points over 400 d, a 12.3-d planet
(K = 7 m/s, e = 0.1) and rotational activity drawn from the rotation kernel of shared/rv/gp/kernels.ts
(P_rot = 23.5 d, decay time 120 d, shape 0.2, amplitude 9 m/s), errors 1.5 m/s, a 0.8 m/s jitter.
The same posterior as shared/rv/gp-fit.ts — ln N(r | 0, C) with C dense, built element by element in
numpy, the offset profiled by generalised least squares, a Gaussian prior N(23.5, 2.35^2) on P_rot and
flat-in-ln priors inside the stated bounds — maximised by scipy.optimize.minimize (Powell, then
Nelder-Mead to polish) from a start near the truth. Parameters: ln P, ln K, sqrt(e) cos w, sqrt(e) sin w,
Tc, ln amplitude, ln decay, ln P_rot, shape, ln jitter.

Run: /usr/bin/python3 scripts/reference/gp_fit_reference.py
"""
import json
import os
import sys

import numpy as np
import scipy
import scipy.linalg
from scipy.optimize import minimize

sys.path.insert(0, os.path.dirname(__file__))
from fit_kepler_model import model  # noqa: E402
from gp_reference import rotation  # noqa: E402

PROT0, PSIG = 23.5, 2.35


def neg_log_post(x, t, y, dy, span):
    lnP, lnK, a, b, tc, lnA, lnD, lnR, f, lnJ = x
    P, K, amp, decay, prot, jit = np.exp([lnP, lnK, lnA, lnD, lnR, lnJ])
    if a * a + b * b >= 0.95 or not (0.01 <= amp <= 1000) or not (0.001 <= jit <= 1000) or not (0 <= f <= 1):
        return np.inf
    if not (prot / 2 < decay < 10 * max(span, prot)):
        return np.inf
    r0 = y - model([P, K, a, b, tc, 0.0], t)
    c = amp * amp * rotation(t[:, None] - t[None, :], prot, decay, f) + np.diag(dy ** 2 + jit ** 2)
    try:
        cf = scipy.linalg.cho_factor(c, lower=True)
    except np.linalg.LinAlgError:
        return np.inf
    one = np.ones_like(t)
    ci1, cir = scipy.linalg.cho_solve(cf, one), scipy.linalg.cho_solve(cf, r0)
    theta = (one @ cir) / (one @ ci1)
    quad = r0 @ cir - theta * (one @ cir)
    logdet = 2 * np.sum(np.log(np.diag(cf[0])))
    lnl = -0.5 * (quad + logdet + len(t) * np.log(2 * np.pi))
    return -(lnl - 0.5 * ((prot - PROT0) / PSIG) ** 2)


def main():
    rng = np.random.default_rng(20261204)
    n = 120
    t = np.sort(2459000 + rng.uniform(0, 400, n))
    act_c = 81.0 * rotation(t[:, None] - t[None, :], 23.5, 120.0, 0.2) + 1e-8 * np.eye(n)
    activity = np.linalg.cholesky(act_c) @ rng.standard_normal(n)
    truth = [12.3, 7.0, np.sqrt(0.1) * np.cos(1.0), np.sqrt(0.1) * np.sin(1.0), 2459003.4]
    dy = np.full(n, 1.5)
    y = model(truth + [4.0], t) + activity + np.sqrt(1.5 ** 2 + 0.8 ** 2) * rng.standard_normal(n)
    span = t[-1] - t[0]
    x0 = np.array([np.log(12.3), np.log(6.0), 0.2, 0.2, 2459003.0, np.log(7.0), np.log(60.0), np.log(23.0), 0.5, np.log(0.5)])
    args = (t, y, dy, span)
    r1 = minimize(neg_log_post, x0, args=args, method='Powell', options={'xtol': 1e-8, 'ftol': 1e-12, 'maxfev': 200000})
    r2 = minimize(neg_log_post, r1.x, args=args, method='Nelder-Mead', options={'xatol': 1e-9, 'fatol': 1e-11, 'maxfev': 200000, 'adaptive': True})
    best = r2 if r2.fun <= r1.fun else r1
    x = best.x
    prot = float(np.exp(x[7]))
    lnl = -best.fun - 0.5 * ((prot - PROT0) / PSIG) ** 2
    out = {
        'provenance': {
            'tool': f'scipy {scipy.__version__} optimize.minimize (Powell, then Nelder-Mead) on a dense numpy/scipy GP likelihood; numpy {np.__version__}',
            'command': '/usr/bin/python3 scripts/reference/gp_fit_reference.py', 'seed': 20261204,
        },
        'data': {'t': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist()},
        'truth': {'period': 12.3, 'K': 7.0, 'e': 0.1, 'omega': 1.0, 'tc': 2459003.4, 'rotationPeriod': 23.5},
        'prior': {'rotationPeriod': PROT0, 'sigma': PSIG},
        'start': x0.tolist(),
        'solution': {
            'x': x.tolist(), 'period': float(np.exp(x[0])), 'K': float(np.exp(x[1])), 'secosw': float(x[2]), 'sesinw': float(x[3]), 'tc': float(x[4]),
            'amplitude': float(np.exp(x[5])), 'decayTime': float(np.exp(x[6])), 'rotationPeriod': prot, 'shape': float(x[8]), 'jitter': float(np.exp(x[9])),
            'lnPosterior': float(-best.fun), 'lnL': float(lnl), 'nfev': int(r1.nfev + r2.nfev),
        },
    }
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'gp', 'scipy-gp-fit.json')
    with open(path, 'w') as f:
        json.dump(out, f)
    print('wrote', os.path.normpath(path), out['solution'])


if __name__ == '__main__':
    main()
