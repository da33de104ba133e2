"""Reference posterior for the sampler tests, and the reference timing for the sampler benchmark.

Default mode writes fixtures/sampler/one-planet-emcee.json: a synthetic one-planet series with
jitter, and emcee's medians and 16/84 % percentiles of the posterior of the model
v = K[cos(nu + w) + e cos w] + offset with the likelihood of Ford (2006) (jitter s added in
quadrature) sampled in (ln P, ln K, sqrt(e) cos w, sqrt(e) sin w, Tc, offset, ln s) with priors
flat in P > 0, K > 0, e in [0, 0.99), w, Tc, offset and s > 0 (Jacobian ln P + ln K + ln s; the
sqrt(e) map has a constant Jacobian). Kepler's equation by vectorised Newton
(fit_kepler_model.py), independent of the TypeScript code.

  /usr/bin/python3 scripts/reference/sampler_emcee.py             # writes the fixture
  /usr/bin/python3 scripts/reference/sampler_emcee.py --converge F  # F: JSON {t, y, dy, instrument, nInst, start, scale,
        # walkers, maxSteps, checkEvery, groups, seed}: emcee run until every coordinate has
        # N > 50 tau (get_autocorr_time, a quarter discarded) and rank-normalised split-R-hat < 1.01
        # over `groups` walker groups; prints {"steps", "ms", "cpuMs", "tauMax", "rhatMax", "versions"}
  /usr/bin/python3 scripts/reference/sampler_emcee.py --fixed     # writes fixtures/sampler/fixed-e-emcee.json:
        # the same likelihood with e held fixed: (a) e = 0 (circular; coordinates ln P, ln K, Tc,
        # offset, ln s), (b) e = 0.3 fixed, omega sampled alone, flat on [w0 - pi, w0 + pi)
  /usr/bin/python3 scripts/reference/sampler_emcee.py --autocorr  # writes fixtures/sampler/autocorr-emcee.json:
        # a stored emcee chain (2-D correlated Gaussian, float32) and emcee's integrated
        # autocorrelation times of its prefixes, as get_autocorr_time(discard, thin) computes them
  /usr/bin/python3 scripts/reference/sampler_emcee.py --timing F  # F: JSON {t, y, dy, start, walkers, steps, seed}
                                                                  # prints {"ms", "cpuMs", "versions", ...}
"""
import json
import os
import sys
import time

import numpy as np
import emcee

sys.path.insert(0, os.path.dirname(__file__))
from fit_kepler_model import ecc_anomaly, tc_to_tp  # noqa: E402

E_MAX = 0.99


def make_log_prob(t, y, dy):
    dy2 = dy * dy
    n = len(t)
    const = n * np.log(2 * np.pi)

    def log_prob(x):
        lnP, lnK, h, k, tc, off, lns = x
        e = h * h + k * k
        if not e < E_MAX or abs(lnP) > 700 or abs(lnK) > 700 or abs(lns) > 350:
            return -np.inf
        P, K = np.exp(lnP), np.exp(lnK)
        w = np.arctan2(k, h) if e > 0 else 0.0
        tp = tc_to_tp(tc, P, e, w)
        E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
        nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
        r = y - (K * (np.cos(nu + w) + e * np.cos(w)) + off)
        V = dy2 + np.exp(2 * lns)
        return -0.5 * (np.sum(r * r / V + np.log(V)) + const) + lnP + lnK + lns

    return log_prob


def versions():
    return {'emcee': emcee.__version__, 'numpy': np.__version__, 'python': sys.version.split()[0]}


def timing(path):
    with open(path) as f:
        d = json.load(f)
    t, y, dy = (np.asarray(d[k], dtype=float) for k in ('t', 'y', 'dy'))
    lp = make_log_prob(t, y, dy)
    rng = np.random.default_rng(d.get('seed', 1))
    start = np.asarray(d['start'], dtype=float)
    scale = np.asarray(d['scale'], dtype=float)
    walkers, steps = int(d['walkers']), int(d['steps'])
    p0 = start + 0.1 * scale * rng.standard_normal((walkers, len(start)))
    sampler = emcee.EnsembleSampler(walkers, len(start), lp)
    sampler.random_state = np.random.RandomState(int(d.get('seed', 1))).get_state()
    t0, c0 = time.perf_counter(), time.process_time()
    sampler.run_mcmc(p0, steps, progress=False)
    ms = (time.perf_counter() - t0) * 1000
    cpu_ms = (time.process_time() - c0) * 1000
    print(json.dumps({'ms': ms, 'cpuMs': cpu_ms, 'acceptance': float(np.mean(sampler.acceptance_fraction)), 'versions': versions()}))


def truth_model(p, t):
    P, K, e, w, tc, off = p
    tp = tc_to_tp(tc, P, e, w)
    E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
    nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
    return K * (np.cos(nu + w) + e * np.cos(w)) + off


def fixture():
    seed = 20261202
    rng = np.random.default_rng(seed)
    n = 80
    t = np.sort(2458000 + rng.uniform(0, 400, n))
    dy = rng.uniform(1.5, 3.0, n)
    P, K, e, w, tc, off, jit = 15.8, 9.0, 0.3, 1.0, 2458203.1, -3.0, 2.5
    y = truth_model((P, K, e, w, tc, off), t) + np.sqrt(dy ** 2 + jit ** 2) * rng.standard_normal(n)
    lp = make_log_prob(t, y, dy)
    x0 = np.array([np.log(P), np.log(K), np.sqrt(e) * np.cos(w), np.sqrt(e) * np.sin(w), tc, off, np.log(jit)])
    walkers, steps, burn = 32, 20000, 4000
    p0 = x0 + 1e-3 * rng.standard_normal((walkers, 7))
    sampler = emcee.EnsembleSampler(walkers, 7, lp)
    sampler.random_state = np.random.RandomState(seed).get_state()  # emcee's own generator, seeded
    sampler.run_mcmc(p0, steps, progress=False)
    tau = sampler.get_autocorr_time(discard=burn, quiet=True)
    ch = sampler.get_chain(discard=burn, flat=True)
    Pd, Kd = np.exp(ch[:, 0]), np.exp(ch[:, 1])
    ed = ch[:, 2] ** 2 + ch[:, 3] ** 2
    wd = np.degrees(np.arctan2(ch[:, 3], ch[:, 2]))
    wd = np.degrees(w) + np.mod(wd - np.degrees(w) + 180, 360) - 180
    cols = {'P': Pd, 'K': Kd, 'e': ed, 'omegaDeg': wd, 'tc': ch[:, 4], 'offset': ch[:, 5], 'jitter': np.exp(ch[:, 6])}
    summary = {}
    for name, v in cols.items():
        q16, q50, q84 = np.percentile(v, [16, 50, 84])
        summary[name] = {'median': q50, 'lo': q16, 'hi': q84, 'sd': float(np.std(v, ddof=1))}
    out = {
        'provenance': {
            'tool': f"emcee {emcee.__version__} EnsembleSampler (default stretch move, a = 2), numpy {np.__version__}, python {sys.version.split()[0]}",
            'command': '/usr/bin/python3 scripts/reference/sampler_emcee.py',
            'model': 'v = K[cos(nu+w) + e cos w] + offset, Ford 2006 jitter likelihood; sampled in ln P, ln K, sqrt(e)cos w, sqrt(e)sin w, Tc, offset, ln s; priors flat in P, K, e<0.99, w, Tc, offset, s',
            'seed': seed,
            'truth': {'P': P, 'K': K, 'e': e, 'omegaDeg': float(np.degrees(w)), 'tc': tc, 'offset': off, 'jitter': jit},
            'run': {'walkers': walkers, 'steps': steps, 'burn': burn, 'tauSteps': [float(v) for v in tau],
                    'acceptance': float(np.mean(sampler.acceptance_fraction)), 'draws': int(ch.shape[0])},
            'versions': versions(),
        },
        'data': {'t': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist()},
        'summary': {k: {kk: float(vv) for kk, vv in v.items()} for k, v in summary.items()},
    }
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'sampler', 'one-planet-emcee.json')
    with open(path, 'w') as f:
        json.dump(out, f, indent=1)
    print(json.dumps(out['summary'], indent=1))
    print(json.dumps(out['provenance']['run']))


def make_log_prob_multi(t, y, dy, inst, n_inst):
    """One planet, an offset and a jitter per instrument: x = (ln P, ln K, sqrt(e) cos w, sqrt(e) sin w, Tc,
    offsets..., ln s...); priors as make_log_prob (Jacobian ln P + ln K + sum ln s)."""
    dy2 = dy * dy
    n = len(t)
    const = n * np.log(2 * np.pi)

    def log_prob(x):
        lnP, lnK, h, k, tc = x[:5]
        off = x[5:5 + n_inst]
        lns = x[5 + n_inst:5 + 2 * n_inst]
        e = h * h + k * k
        if not e < E_MAX or abs(lnP) > 700 or abs(lnK) > 700 or np.any(np.abs(lns) > 350):
            return -np.inf
        P, K = np.exp(lnP), np.exp(lnK)
        w = np.arctan2(k, h) if e > 0 else 0.0
        tp = tc_to_tp(tc, P, e, w)
        E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
        nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
        r = y - (K * (np.cos(nu + w) + e * np.cos(w)) + off[inst])
        V = dy2 + np.exp(2 * lns)[inst]
        return -0.5 * (np.sum(r * r / V + np.log(V)) + const) + lnP + lnK + np.sum(lns)

    return log_prob


def split_rhat(chain, groups):
    """Rank-normalised split-R-hat (Vehtari et al. 2021), max of bulk and folded, per coordinate;
    chain: steps x walkers x dims; walker w belongs to group w mod groups; each group's pooled draws in
    the first and second half of the steps form one chain each."""
    from scipy.stats import rankdata, norm
    n_steps, n_walkers, n_dim = chain.shape
    half = n_steps // 2
    parts = [chain[:half], chain[n_steps - half:]]

    def rhat(z):
        m, n = z.shape
        means = z.mean(axis=1)
        W = z.var(axis=1, ddof=1).mean()
        B = n * means.var(ddof=1)
        return np.sqrt(((n - 1) / n * W + B / n) / W)

    def rank_norm(x):
        r = rankdata(x.ravel(), method='average').reshape(x.shape)
        return norm.ppf((r - 0.375) / (x.size + 0.25))

    out = []
    for d in range(n_dim):
        chains = []
        for g in range(groups):
            for p in parts:
                chains.append(p[:, g::groups, d].ravel())
        x = np.array(chains)
        bulk = rhat(rank_norm(x))
        tail = rhat(rank_norm(np.abs(x - np.median(x))))
        out.append(max(bulk, tail))
    return np.array(out)


def converge(path):
    with open(path) as f:
        d = json.load(f)
    t, y, dy = (np.asarray(d[k], dtype=float) for k in ('t', 'y', 'dy'))
    inst = np.asarray(d['instrument'], dtype=int)
    lp = make_log_prob_multi(t, y, dy, inst, int(d['nInst']))
    rng = np.random.default_rng(d.get('seed', 1))
    start = np.asarray(d['start'], dtype=float)
    scale = np.asarray(d['scale'], dtype=float)
    walkers, max_steps, every, groups = int(d['walkers']), int(d['maxSteps']), int(d['checkEvery']), int(d['groups'])
    p0 = start + 0.1 * scale * rng.standard_normal((walkers, len(start)))
    sampler = emcee.EnsembleSampler(walkers, len(start), lp)
    sampler.random_state = np.random.RandomState(int(d.get('seed', 1))).get_state()
    t0, c0 = time.perf_counter(), time.process_time()
    state = p0
    tau_max = rhat_max = float('nan')
    while sampler.iteration < max_steps:
        state = sampler.run_mcmc(state, every, progress=False)
        n = sampler.iteration
        burn = n // 4
        tau = sampler.get_autocorr_time(discard=burn, quiet=True)
        rh = split_rhat(sampler.get_chain(discard=burn), groups)
        tau_max, rhat_max = float(np.max(tau)), float(np.max(rh))
        if np.all(n - burn > 50 * tau) and np.all(rh < 1.01):
            break
    ms = (time.perf_counter() - t0) * 1000
    cpu_ms = (time.process_time() - c0) * 1000
    print(json.dumps({'steps': int(sampler.iteration), 'ms': ms, 'cpuMs': cpu_ms, 'tauMax': tau_max, 'rhatMax': rhat_max,
                      'acceptance': float(np.mean(sampler.acceptance_fraction)), 'versions': versions()}))


def make_log_prob_fixed(t, y, dy, e_fixed, w0):
    """Posterior with e held at e_fixed. e_fixed == 0: x = (ln P, ln K, Tc, offset, ln s), w = 0.
    Otherwise x = (ln P, ln K, w, Tc, offset, ln s) with w flat on [w0 - pi, w0 + pi)."""
    dy2 = dy * dy
    n = len(t)
    const = n * np.log(2 * np.pi)
    circular = e_fixed == 0

    def log_prob(x):
        if circular:
            lnP, lnK, tc, off, lns = x
            w = 0.0
        else:
            lnP, lnK, w, tc, off, lns = x
            if not (w0 - np.pi <= w < w0 + np.pi):
                return -np.inf
        if abs(lnP) > 700 or abs(lnK) > 700 or abs(lns) > 350:
            return -np.inf
        P, K, e = np.exp(lnP), np.exp(lnK), e_fixed
        tp = tc_to_tp(tc, P, e, w)
        E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
        nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
        r = y - (K * (np.cos(nu + w) + e * np.cos(w)) + off)
        V = dy2 + np.exp(2 * lns)
        return -0.5 * (np.sum(r * r / V + np.log(V)) + const) + lnP + lnK + lns

    return log_prob


def run_fixed_case(name, seed, truth, e_fixed, n=60):
    rng = np.random.default_rng(seed)
    t = np.sort(2458000 + rng.uniform(0, 300, n))
    dy = rng.uniform(1.5, 3.0, n)
    P, K, e, w, tc, off, jit = truth
    y = truth_model((P, K, e, w, tc, off), t) + np.sqrt(dy ** 2 + jit ** 2) * rng.standard_normal(n)
    lp = make_log_prob_fixed(t, y, dy, e_fixed, w)
    if e_fixed == 0:
        x0 = np.array([np.log(P), np.log(K), tc, off, np.log(jit)])
        names = ['P', 'K', 'tc', 'offset', 'jitter']
    else:
        x0 = np.array([np.log(P), np.log(K), w, tc, off, np.log(jit)])
        names = ['P', 'K', 'omegaDeg', 'tc', 'offset', 'jitter']
    nd = len(x0)
    walkers, steps, burn = 32, 16000, 3000
    p0 = x0 + 1e-3 * rng.standard_normal((walkers, nd))
    sampler = emcee.EnsembleSampler(walkers, nd, lp)
    sampler.random_state = np.random.RandomState(seed).get_state()
    sampler.run_mcmc(p0, steps, progress=False)
    tau = sampler.get_autocorr_time(discard=burn, quiet=True)
    ch = sampler.get_chain(discard=burn, flat=True)
    cols = {'P': np.exp(ch[:, 0]), 'K': np.exp(ch[:, 1])}
    if e_fixed == 0:
        cols.update({'tc': ch[:, 2], 'offset': ch[:, 3], 'jitter': np.exp(ch[:, 4])})
    else:
        cols.update({'omegaDeg': np.degrees(ch[:, 2]), 'tc': ch[:, 3], 'offset': ch[:, 4], 'jitter': np.exp(ch[:, 5])})
    summary = {}
    for k in names:
        v = cols[k]
        q16, q50, q84 = np.percentile(v, [16, 50, 84])
        summary[k] = {'median': float(q50), 'lo': float(q16), 'hi': float(q84), 'sd': float(np.std(v, ddof=1))}
    return {
        'name': name, 'seed': seed, 'eFixed': e_fixed,
        'truth': {'P': P, 'K': K, 'e': e, 'omegaDeg': float(np.degrees(w)), 'tc': tc, 'offset': off, 'jitter': jit},
        'run': {'walkers': walkers, 'steps': steps, 'burn': burn, 'tauSteps': [float(v) for v in tau],
                'acceptance': float(np.mean(sampler.acceptance_fraction)), 'draws': int(ch.shape[0])},
        'data': {'t': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist()},
        'summary': summary,
    }


def fixed_fixture():
    cases = [
        run_fixed_case('circular', 20261203, (11.2, 7.0, 0.0, 0.0, 2458101.7, 4.0, 2.0), 0.0),
        run_fixed_case('e-fixed-0.3', 20261204, (23.5, 10.0, 0.3, 2.2, 2458120.4, -2.0, 2.0), 0.3),
    ]
    out = {
        'provenance': {
            'tool': f"emcee {emcee.__version__} EnsembleSampler (default stretch move, a = 2), numpy {np.__version__}, python {sys.version.split()[0]}",
            'command': '/usr/bin/python3 scripts/reference/sampler_emcee.py --fixed',
            'model': 'as one-planet-emcee.json with e held fixed: circular (e = 0; ln P, ln K, Tc, offset, ln s) and e = 0.3 '
                     '(ln P, ln K, omega in radians flat on [w0 - pi, w0 + pi) with w0 the true omega, Tc, offset, ln s); priors flat in P, K, Tc, offset, s',
            'versions': versions(),
        },
        'cases': cases,
    }
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'sampler', 'fixed-e-emcee.json')
    with open(path, 'w') as f:
        json.dump(out, f, indent=1)
    for c in cases:
        print(c['name'], json.dumps(c['run']), json.dumps(c['summary']))


def autocorr_fixture():
    import base64
    seed = 20261205
    rng = np.random.default_rng(seed)
    cov = np.array([[1.0, 0.98 * 3.0], [0.98 * 3.0, 9.0]])
    prec = np.linalg.inv(cov)

    def lp(x):
        return -0.5 * x @ prec @ x

    walkers, steps = 8, 4000
    p0 = 0.1 * rng.standard_normal((walkers, 2))
    sampler = emcee.EnsembleSampler(walkers, 2, lp)
    sampler.random_state = np.random.RandomState(seed).get_state()
    sampler.run_mcmc(p0, steps, progress=False)
    chain = sampler.get_chain().astype(np.float32)  # steps x walkers x 2, stored as float32
    x = chain.astype(np.float64)
    rows = []
    for n in (256, 512, 1024, 2048, 4000):
        discard = n // 4
        for thin in (1, 2, 4, 8):
            # what EnsembleSampler.get_autocorr_time(discard=discard, thin=thin) computes on the first n steps
            sub = x[:n][discard + thin - 1::thin]
            tau = thin * emcee.autocorr.integrated_time(sub, c=5, tol=0, quiet=True)
            rows.append({'steps': n, 'discard': discard, 'thin': thin, 'tau': [float(v) for v in tau]})
    out = {
        'provenance': {
            'tool': f"emcee {emcee.__version__} EnsembleSampler and emcee.autocorr.integrated_time (c = 5), numpy {np.__version__}, python {sys.version.split()[0]}",
            'command': '/usr/bin/python3 scripts/reference/sampler_emcee.py --autocorr',
            'target': '2-D Gaussian, sd 1 and 3, correlation 0.98', 'seed': seed,
            'note': 'tau[thin] = thin * integrated_time(chain[:steps][discard + thin - 1::thin]), as get_autocorr_time(discard, thin) does',
            'versions': versions(),
        },
        'walkers': walkers, 'steps': steps, 'dims': 2,
        'chainFloat32Base64': base64.b64encode(chain.tobytes()).decode('ascii'),
        'tau': rows,
    }
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'sampler', 'autocorr-emcee.json')
    with open(path, 'w') as f:
        json.dump(out, f, indent=1)
    print(json.dumps(rows))


if __name__ == '__main__':
    if len(sys.argv) >= 3 and sys.argv[1] == '--timing':
        timing(sys.argv[2])
    elif len(sys.argv) >= 3 and sys.argv[1] == '--converge':
        converge(sys.argv[2])
    elif len(sys.argv) >= 2 and sys.argv[1] == '--fixed':
        fixed_fixture()
    elif len(sys.argv) >= 2 and sys.argv[1] == '--autocorr':
        autocorr_fixture()
    else:
        fixture()
