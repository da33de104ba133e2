#!/usr/bin/python3
"""Independent maximum-likelihood fits of the synthetic search survey (fixtures/search/survey-*.json).

For each case: the model of the case's true structure (its number of planets, its trend kind,
one offset and one jitter per instrument), likelihood
    ln L = -1/2 sum_i [ r_i^2 / (s_i^2 + j_k^2) + ln 2 pi (s_i^2 + j_k^2) ]
(the common Gaussian likelihood with jitter added in quadrature). Offsets and trend are solved by
weighted linear least squares inside every evaluation (profiled); the planets (log period,
log K, sqrt(e) cos w, sqrt(e) sin w, mean anomaly at the epoch) and log jitters are searched by
scipy.optimize.differential_evolution (global, seeded), then polished by
scipy.optimize.least_squares on the same likelihood written as a sum of squares:
    -2 ln L = sum_i r_i^2/V_i + sum_i (ln 2 pi V_i + C)  - N C,  with C making every term >= 0.

Search windows (stated, independent of the product): each planet's frequency within +-20/baseline
of its true value (about 40 peak widths), K in [0.1, 5 K_true + 10] m/s, e < 0.95; jitters in
[0.01, 50] m/s. For cases with an alias partner the same fit is also made in a window around the
partner (frequency within +-20/baseline of it, and above half of it), so the likelihood gap between
the true period and its alias is measured independently.

Output: fixtures/search/reference.json. Run: /usr/bin/python3 scripts/reference/search_reference.py
(Debian's python3-scipy; not the pyenv python).
"""
import json
import glob
import os
import sys
import numpy as np
import scipy
from scipy.optimize import differential_evolution, least_squares

HERE = os.path.dirname(os.path.abspath(__file__))
FIX = os.path.join(HERE, '..', '..', 'fixtures', 'search')


def kepler_E(M, e):
    M = np.mod(M, 2 * np.pi)
    E = M + e * np.sin(M) if e < 0.8 else np.pi * np.ones_like(M)
    for _ in range(60):
        f = E - e * np.sin(E) - M
        dE = f / (1 - e * np.cos(E))
        E = E - dE
        if np.max(np.abs(dE)) < 1e-13:  # Newton converged (the next step would be below 1e-26)
            break
    return E


def rv_planet(t, P, K, e, w, M0, epoch):
    M = 2 * np.pi * (t - epoch) / P + M0
    E = kepler_E(M, e)
    nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
    return K * (np.cos(nu + w) + e * np.cos(w))


class Model:
    def __init__(self, d, trend, windows):
        self.t = np.array(d['t'])
        self.y = np.array(d['y'])
        self.dy = np.array(d['dy'])
        self.inst = np.array(d['instrument'])
        self.nI = len(d['instrumentNames'])
        self.epoch = float(np.mean(self.t))
        self.trend = trend
        self.windows = windows  # per planet: (fmin, fmax, Kmax)
        cols = [(self.inst == k).astype(float) for k in range(self.nI)]
        dt = self.t - self.epoch
        if trend in ('linear', 'quadratic'):
            cols.append(dt)
        if trend == 'quadratic':
            cols.append(dt * dt)
        self.X = np.stack(cols, axis=1)
        self.C = 1.0 - np.log(2 * np.pi * np.min(self.dy) ** 2)

    def bounds(self):
        b = []
        for (fmin, fmax, kmax) in self.windows:
            b += [(np.log(fmin), np.log(fmax)), (np.log(0.1), np.log(kmax)), (-0.97, 0.97), (-0.97, 0.97), (0, 2 * np.pi)]
        b += [(np.log(0.01), np.log(50))] * self.nI
        return b

    def unpack(self, x):
        planets = []
        for p in range(len(self.windows)):
            lf, lk, a, b, M0 = x[5 * p:5 * p + 5]
            e = a * a + b * b
            planets.append((1 / np.exp(lf), np.exp(lk), e, np.arctan2(b, a), M0))
        jit = np.exp(np.asarray(x[5 * len(self.windows):]))
        return planets, jit

    def resid(self, x):
        planets, jit = self.unpack(x)
        m = np.zeros_like(self.t)
        for (P, K, e, w, M0) in planets:
            if e >= 0.95:
                return None
            m += rv_planet(self.t, P, K, e, w, M0, self.epoch)
        V = self.dy ** 2 + jit[self.inst] ** 2
        sw = 1 / np.sqrt(V)
        r0 = self.y - m
        beta, *_ = np.linalg.lstsq(self.X * sw[:, None], r0 * sw, rcond=None)
        r = r0 - self.X @ beta
        return r, V

    def neg2lnl(self, x):
        out = self.resid(x)
        if out is None:
            return 1e30
        r, V = out
        return float(np.sum(r * r / V + np.log(2 * np.pi * V)))

    def ls_vector(self, x):
        out = self.resid(x)
        if out is None:
            return np.full(2 * len(self.t), 1e6)
        r, V = out
        return np.concatenate([r / np.sqrt(V), np.sqrt(np.log(2 * np.pi * V) + self.C)])


def fit(d, trend, windows, seed):
    mdl = Model(d, trend, windows)
    if not windows:
        x0 = np.array([np.log(1.0)] * mdl.nI)
        best = min((least_squares(mdl.ls_vector, np.full(mdl.nI, np.log(j)), method='trf') for j in (0.3, 3, 10)), key=lambda r: mdl.neg2lnl(r.x))
        x = best.x
    else:
        # large data sets: a smaller population (each evaluation costs N = 2000 Kepler solves per planet)
        big = len(mdl.t) > 1000
        de = differential_evolution(mdl.neg2lnl, mdl.bounds(), seed=seed, popsize=12 if big else 25, maxiter=800 if big else 3000, tol=1e-10,
                                    mutation=(0.5, 1.0), recombination=0.7, polish=False, init='sobol')
        x = de.x
        lo = np.array([b[0] for b in mdl.bounds()])
        hi = np.array([b[1] for b in mdl.bounds()])
        # the phase is periodic: leave it unbounded in the polish
        for p in range(len(windows)):
            lo[5 * p + 4], hi[5 * p + 4] = -np.inf, np.inf
        try:
            ls = least_squares(mdl.ls_vector, np.clip(x, lo + 1e-9, hi - 1e-9), bounds=(lo, hi), method='trf', x_scale='jac', xtol=1e-12, ftol=1e-12)
            if mdl.neg2lnl(ls.x) < mdl.neg2lnl(x):
                x = ls.x
        except ValueError:
            pass
    planets, jit = mdl.unpack(x)
    return {
        'lnL': -0.5 * mdl.neg2lnl(x),
        'planets': [{'period': P, 'K': K, 'e': e} for (P, K, e, w, M0) in planets],
        'jitter': list(map(float, jit)),
    }


def main():
    out = {
        'provenance': f'scripts/reference/search_reference.py with scipy {scipy.__version__}, numpy {np.__version__} '
                      '(differential_evolution + least_squares, seeded); run /usr/bin/python3 scripts/reference/search_reference.py',
        'cases': {},
    }
    only = set(sys.argv[1:])
    path = os.path.join(FIX, 'reference.json')
    if only and os.path.exists(path):
        out['cases'] = json.load(open(path))['cases']
    files = sorted(glob.glob(os.path.join(FIX, 'survey-*.json')))
    if only:
        files = [os.path.join(FIX, f'survey-{name}.json') for name in sys.argv[1:]]
    for f in files:
        d = json.load(open(f))
        c = d['case']
        T = max(d['t']) - min(d['t'])
        win = [(max(1 / p['period'] - 20 / T, 0.2 / T), 1 / p['period'] + 20 / T, 5 * p['K'] + 10) for p in c['planets']]
        res = fit(d, c['trend'], win, seed=c['seed'])
        entry = {'nPlanets': len(c['planets']), 'trend': c['trend'], **res}
        if c.get('aliasPeriod'):
            fa = 1 / c['aliasPeriod']
            aw = [(max(fa - 20 / T, fa / 2), fa + 20 / T, 5 * c['planets'][0]['K'] + 10)]
            entry['alias'] = {'period': c['aliasPeriod'], **fit(d, c['trend'], aw, seed=c['seed'] + 1)}
        out['cases'][c['name']] = entry
        print(c['name'], entry['lnL'], [round(p['period'], 4) for p in res['planets']], entry.get('alias', {}).get('lnL'), flush=True)
        json.dump(out, open(path, 'w'), indent=1)  # after every case: a long run keeps what it has done


if __name__ == '__main__':
    main()
