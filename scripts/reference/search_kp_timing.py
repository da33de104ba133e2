#!/usr/bin/python3
"""Timing reference for the Keplerian periodogram (scripts/bench-search.ts): at each trial period and
each (e, periastron phase) cell, the weighted linear least squares of [cos nu + e, sin nu, one
indicator per instrument] solved for all cells of a period at once with numpy (vectorised normal
equations, numpy.linalg.solve on the stacked systems). Exact Kepler solutions (Newton, vectorised).
Reads the JSON written by the bench (data, frequencies, cells, stride); prints ms and the largest
difference from the product's values on the periods it ran. Run by the bench with /usr/bin/python3.
"""
import json, sys, time
import numpy as np


def kepler_E(M, e):
    E = M + e * np.sin(M) if e < 0.8 else np.pi * np.ones_like(M)
    for _ in range(40):
        E = E - (E - e * np.sin(E) - M) / (1 - e * np.cos(E))
    return E


def main():
    d = json.load(open(sys.argv[1]))
    t = np.array(d['t']); y = np.array(d['y']); dy = np.array(d['dy']); inst = np.array(d['instrument']); nI = d['nInst']
    f_all = np.array(d['frequency']); stride = d['stride']
    w = 1 / dy ** 2
    tmin = t.min(); tau = t - tmin
    ind = np.stack([(inst == k).astype(float) for k in range(nI)], axis=1)
    t0 = time.perf_counter()
    out = []
    df = f_all[1] - f_all[0]
    for f0 in f_all[::stride]:
        best = 0.0
        for c in d['cells']:
            if 1 / f0 < c['minPeriod']:
                continue
            e = c['e']; nph = c['phases']; sub = c['substeps']
            for j in range(sub):
                f = f0 if sub == 1 else f0 + df * ((j + 0.5) / sub - 0.5)
                ph = np.arange(nph)[:, None] / nph
                M = 2 * np.pi * (np.mod(tau[None, :] * f - ph, 1.0))
                if e == 0:
                    A = np.cos(M); B = np.sin(M)
                else:
                    E = kepler_E(M, e); den = 1 - e * np.cos(E)
                    A = (np.cos(E) - e) / den + e; B = np.sqrt(1 - e * e) * np.sin(E) / den
                X = np.concatenate([A[:, :, None], B[:, :, None], np.broadcast_to(ind, (nph,) + ind.shape)], axis=2)
                Xw = X * w[None, :, None]
                G = np.einsum('cni,cnj->cij', Xw, X)
                b = np.einsum('cni,n->ci', Xw, y)
                coef = np.linalg.solve(G, b[:, :, None])[:, :, 0]
                chi2 = np.sum(w * y * y) - np.einsum('ci,ci->c', b, coef)
                # offsets-only chi2
                W = ind.T @ w; m = (ind.T @ (w * y)) / W
                chi0 = np.sum(w * (y - ind @ m) ** 2)
                best = max(best, float(np.max(chi0 - chi2)))
        out.append(best)
    ms = (time.perf_counter() - t0) * 1000
    diff = float(np.max(np.abs(np.array(out) - np.array(d['ours']))))
    print(json.dumps({'ms': ms, 'numpy': np.__version__, 'maxDiff': diff, 'peak': max(out)}))


if __name__ == '__main__':
    main()
