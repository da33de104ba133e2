"""Reference posterior of "one planet + GP noise" (emcee driving a dense numpy/scipy GP likelihood),
for tests/shared/rv/sampler-gp-emcee.spec.ts (decay time and shape held), sampler-gp-free-emcee.spec.ts
(every hyperparameter free) and the GP row of scripts/bench-gp.ts.

Model: v = K[cos(nu + w) + e cos w] + offset; residuals r ~ N(0, C) with
  C_ij = h^2 kappa(t_i - t_j) + delta_ij (dy_i^2 + s^2),
  kappa(tau) = sum_{j=1,2} w_j exp(-|tau|/L) [cos(om_j tau) + sin(om_j |tau|)/(om_j L)], om_j = 2 pi j / Prot,
  w_1 = 1/(1+f), w_2 = f/(1+f)
(two damped oscillators at Prot and Prot/2, Foreman-Mackey et al. 2017, AJ 154, 220, §4), built element by
element and factored by scipy.linalg.cho_factor: ln L = -1/2 (r^T C^-1 r + ln det C + n ln 2 pi).
Coordinates (ln P, ln K, sqrt(e) cos w, sqrt(e) sin w, Tc, offset, ln s, ln h, ln L, Prot, f); priors:
flat in P (Jacobian + ln P) on (0, 5 T] and within the stated uniform range [pmin, pmax], Tc within P/2 of the
start's Tc (one revolution), flat in K (+ ln K),
e < 0.99, flat in w, Tc, offset, flat in s (+ ln s); h log-uniform on [0.01, 1000]; L log-uniform on
(Prot/2, 10 max(T, Prot)) with its normalisation -ln ln(20 max(T, Prot)/Prot); Prot ~ N(mu, sigma);
f uniform on [0, 1]. Kepler's equation by vectorised Newton (fit_kepler_model.py).

  /usr/bin/python3 scripts/reference/sampler_gp_emcee.py IN.json OUT.json
      IN: {t, y, dy, start, scale, walkers, maxSteps, checkEvery, groups, seed, prot: {mu, sigma}, period: {min, max},
           fixed: {decayTime, shape} (optional: held at these values, their coordinates left out)}
      runs emcee until every coordinate has N > 50 tau (get_autocorr_time, a quarter discarded) and
      rank-normalised split-R-hat < 1.01; writes medians, 16/84 % of the physical parameters, the
      Monte-Carlo error of each median (sd / sqrt(N / tau)), steps, wall and CPU ms, versions.
  /usr/bin/python3 scripts/reference/sampler_gp_emcee.py --log-prob IN.json OUT.json
      IN as above plus `points` (coordinate vectors): writes the data, the priors' settings, the points and
      the unnormalised ln posterior at each (null where it is -inf), for a point-by-point check of priors,
      Jacobians and likelihood.
"""
import json
import os
import sys
import time

import numpy as np
import scipy
import scipy.linalg
import emcee

sys.path.insert(0, os.path.dirname(__file__))
from fit_kepler_model import ecc_anomaly, tc_to_tp  # noqa: E402
from sampler_emcee import split_rhat  # noqa: E402

E_MAX = 0.99
LN2PI = np.log(2 * np.pi)


def make_log_prob(t, y, dy, prot_mu, prot_sigma, pmin, pmax, fixed=None, tc0=0.0):
    n = len(t)
    dy2 = dy * dy
    T = t.max() - t.min()
    tau = np.abs(t[:, None] - t[None, :])

    fixed = fixed or {}

    def log_prob(x):
        if fixed:
            lnP, lnK, hh, kk, tc, off, lns, lnh, prot = x
            lnL, f = np.log(fixed['decayTime']), fixed['shape']
        else:
            lnP, lnK, hh, kk, tc, off, lns, lnh, lnL, prot, f = x
        e = hh * hh + kk * kk
        if not e < E_MAX or abs(lnP) > 700 or abs(lnK) > 700 or abs(lns) > 350:
            return -np.inf
        P, K = np.exp(lnP), np.exp(lnK)
        if not (pmin <= P <= pmax and P <= 5 * T) or abs(tc - tc0) > P / 2:
            return -np.inf
        if not (np.log(0.01) <= lnh <= np.log(1000)) or not (0 <= f <= 1) or not prot > 0 or lnL > 700:
            return -np.inf
        L = np.exp(lnL)
        hi = 10 * max(T, prot)
        if not (prot / 2 < L < hi):
            return -np.inf
        lp = lnP + lnK + lns - 0.5 * ((prot - prot_mu) / prot_sigma) ** 2 - (0 if fixed else np.log(np.log(hi / (prot / 2))))
        w = np.arctan2(kk, hh) if e > 0 else 0.0
        tp = tc_to_tp(tc, P, e, w)
        E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
        nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
        r = y - (K * (np.cos(nu + w) + e * np.cos(w)) + off)
        h = np.exp(lnh)
        kern = np.zeros_like(tau)
        for j, wj in ((1, 1 / (1 + f)), (2, f / (1 + f))):
            om = 2 * np.pi * j / prot
            kern += wj * (np.cos(om * tau) + np.sin(om * tau) / (om * L))
        C = h * h * np.exp(-tau / L) * kern
        C[np.diag_indices(n)] += dy2 + np.exp(2 * lns)
        try:
            cf = scipy.linalg.cho_factor(C, lower=True, check_finite=False)
        except np.linalg.LinAlgError:
            return -np.inf
        alpha = scipy.linalg.cho_solve(cf, r, check_finite=False)
        logdet = 2 * np.sum(np.log(np.diag(cf[0])))
        return lp - 0.5 * (r @ alpha + logdet + n * LN2PI)

    return log_prob


def physical(chain, fixed):
    if fixed:
        lnP, lnK, hh, kk, tc, off, lns, lnh, prot = chain.T
    else:
        lnP, lnK, hh, kk, tc, off, lns, lnh, lnL, prot, f = chain.T
    e = hh * hh + kk * kk
    out = {
        'P b': np.exp(lnP), 'K b': np.exp(lnK), 'e b': e, 'Tc b': tc, 'offset North': off, 'jitter North': np.exp(lns),
        'GP amplitude': np.exp(lnh), 'rotation period': prot,
    }
    if not fixed:
        out['GP decay time'] = np.exp(lnL)
        out['GP shape'] = f
    return out


def read_input(inp):
    """The input file, the held hyperparameters (or None) and the log posterior it defines."""
    with open(inp) as fh:
        d = json.load(fh)
    t, y, dy = (np.asarray(d[k], dtype=float) for k in ('t', 'y', 'dy'))
    fixed = d.get('fixed')
    lp = make_log_prob(t, y, dy, d['prot']['mu'], d['prot']['sigma'], d['period']['min'], d['period']['max'], fixed, float(d['start'][4]))
    return d, fixed, lp


def main(inp, out):
    d, fixed, lp = read_input(inp)
    seed = int(d.get('seed', 1))
    rng = np.random.default_rng(seed)
    start = np.asarray(d['start'], dtype=float)
    scale = np.asarray(d['scale'], dtype=float)
    walkers, max_steps, every, groups = int(d['walkers']), int(d['maxSteps']), int(d['checkEvery']), int(d['groups'])
    ndim = len(start)
    p0 = np.empty((walkers, ndim))
    for i in range(walkers):
        while True:
            p = start + 0.1 * scale * rng.standard_normal(ndim)
            if np.isfinite(lp(p)):
                break
        p0[i] = p
    sampler = emcee.EnsembleSampler(walkers, ndim, lp)
    sampler.random_state = np.random.RandomState(seed).get_state()
    t0, c0 = time.perf_counter(), time.process_time()
    state = p0
    tau = np.full(ndim, np.nan)
    rh = np.full(ndim, np.nan)
    converged = False
    while sampler.iteration < max_steps:
        state = sampler.run_mcmc(state, every, progress=False)
        n = sampler.iteration
        burn = n // 4
        tau = sampler.get_autocorr_time(discard=burn, quiet=True)
        rh = split_rhat(sampler.get_chain(discard=burn), groups)
        print(json.dumps({'steps': int(n), 'tauMax': float(np.max(tau)), 'rhatMax': float(np.max(rh)), 'cpuS': round(time.process_time() - c0, 1)}), file=sys.stderr, flush=True)
        if np.all(n - burn > 50 * tau) and np.all(rh < 1.01):
            converged = True
            break
    ms = (time.perf_counter() - t0) * 1000
    cpu_ms = (time.process_time() - c0) * 1000
    n = sampler.iteration
    burn = n // 4
    flat = sampler.get_chain(discard=burn, flat=True)
    n_eff = (n - burn) * walkers / float(np.max(tau))
    summary = {}
    for name, v in physical(flat, fixed).items():
        q16, q50, q84 = np.percentile(v, [16, 50, 84])
        summary[name] = {'median': q50, 'lo': q16, 'hi': q84, 'mcError': float(np.std(v) / np.sqrt(n_eff))}
    res = {
        'source': 'emcee EnsembleSampler (stretch move) with a dense numpy/scipy GP likelihood (scipy.linalg.cho_factor)',
        'fixed': fixed, 'converged': converged, 'steps': int(n), 'walkers': walkers, 'tauMax': float(np.max(tau)), 'rhatMax': float(np.max(rh)),
        'acceptance': float(np.mean(sampler.acceptance_fraction)), 'ms': ms, 'cpuMs': cpu_ms,
        'versions': {'python': sys.version.split()[0], 'numpy': np.__version__, 'scipy': scipy.__version__, 'emcee': emcee.__version__},
        'parameters': summary,
    }
    with open(out, 'w') as fh:
        json.dump(res, fh, indent=1)
    print(json.dumps({k: res[k] for k in ('converged', 'steps', 'tauMax', 'rhatMax', 'ms', 'cpuMs')}))


def log_prob_at(inp, out):
    d, fixed, lp = read_input(inp)
    vals = [lp(np.asarray(x, dtype=float)) for x in d['points']]
    res = {
        'source': 'ln posterior (unnormalised) of scripts/reference/sampler_gp_emcee.py: dense numpy/scipy GP likelihood (scipy.linalg.cho_factor) and the priors of its docstring',
        'fixed': fixed, 'tc0': float(d['start'][4]),
        'versions': {'python': sys.version.split()[0], 'numpy': np.__version__, 'scipy': scipy.__version__},
        't': d['t'], 'y': d['y'], 'dy': d['dy'], 'prot': d['prot'], 'period': d['period'],
        'points': d['points'], 'logProb': [float(v) if np.isfinite(v) else None for v in vals],
    }
    with open(out, 'w') as fh:
        json.dump(res, fh, indent=1)


if __name__ == '__main__':
    if sys.argv[1] == '--log-prob':
        log_prob_at(sys.argv[2], sys.argv[3])
    else:
        main(sys.argv[1], sys.argv[2])
