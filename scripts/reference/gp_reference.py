"""Writes fixtures/gp/reference.json: Gaussian-process noise-model references for tests/shared/rv/gp.

1. qpSklearn: one instrument, the quasi-periodic kernel h^2 exp(-tau^2/(2 lam^2) - Gamma sin^2(pi tau/P))
   as scikit-learn's ConstantKernel * ExpSineSquared(length_scale=sqrt(2/Gamma), periodicity=P) * RBF(lam)
   + WhiteKernel(jitter^2), per-point errors through alpha=dy^2, optimizer=None: log marginal likelihood
   and predictive mean/std (std includes the WhiteKernel, the latent variance is std^2 - jitter^2), and
   the same numbers from a dense numpy/scipy Cholesky.
2. qpTwoInstruments: two instruments with their own amplitude and jitter, full JD times, dense
   scipy.linalg.cho_factor: log-likelihood, log-determinant, C^-1 y, predictive mean and variance.
3. rotation: the two-oscillator rotation kernel (shared/rv/gp/kernels.ts module comment), built element by
   element in numpy, two instruments, unsorted times: numpy slogdet, numpy.linalg.solve, log-likelihood,
   predictive mean and variance.

Run: /usr/bin/python3 scripts/reference/gp_reference.py
"""
import json
import os

import numpy as np
import scipy
import scipy.linalg
import sklearn
from sklearn.gaussian_process import GaussianProcessRegressor
from sklearn.gaussian_process.kernels import RBF, ConstantKernel, ExpSineSquared, WhiteKernel


def qp(tau, period, lam, gamma):
    return np.exp(-tau ** 2 / (2 * lam ** 2) - gamma * np.sin(np.pi * tau / period) ** 2)


def rotation(tau, period, decay, shape):
    x = np.abs(tau)
    out = np.zeros_like(x)
    for j, w in ((1, 1 / (1 + shape)), (2, shape / (1 + shape))):
        om = 2 * np.pi * j / period
        out += w * (np.cos(om * x) + np.sin(om * x) / (om * decay))
    return np.exp(-x / decay) * out


def dense(t, scale, noise_var, kappa, y, t_star, scale_star):
    c = scale[:, None] * scale[None, :] * kappa(t[:, None] - t[None, :]) + np.diag(noise_var)
    cf = scipy.linalg.cho_factor(c, lower=True)
    alpha = scipy.linalg.cho_solve(cf, y)
    logdet = 2 * np.sum(np.log(np.diag(cf[0])))
    lnl = -0.5 * (y @ alpha + logdet + len(t) * np.log(2 * np.pi))
    ks = scale_star * scale[None, :] * kappa(t_star[:, None] - t[None, :])
    mean = ks @ alpha
    v = scipy.linalg.solve_triangular(cf[0], ks.T, lower=True)
    var = scale_star ** 2 * kappa(np.zeros(1))[0] - np.sum(v ** 2, axis=0)
    return {'lnL': float(lnl), 'logDet': float(logdet), 'alpha': alpha.tolist(), 'mean': mean.tolist(), 'variance': var.tolist()}, c


def draw(rng, c):
    return np.linalg.cholesky(c) @ rng.standard_normal(c.shape[0])


def main():
    rng = np.random.default_rng(20261202)
    out = {'provenance': {
        'tool': f'scikit-learn {sklearn.__version__} GaussianProcessRegressor; scipy {scipy.__version__} linalg.cho_factor/cho_solve; numpy {np.__version__} slogdet/solve',
        'command': '/usr/bin/python3 scripts/reference/gp_reference.py',
        'seed': 20261202,
    }}

    # 1. quasi-periodic, one instrument, against scikit-learn
    n = 80
    t = np.sort(rng.uniform(0, 300, n))
    dy = rng.uniform(1.0, 2.5, n)
    h, period, lam, gamma, jit = 4.0, 23.5, 45.0, 1.7, 0.8
    kappa = lambda tau: qp(tau, period, lam, gamma)  # noqa: E731
    c = h * h * kappa(t[:, None] - t[None, :]) + np.diag(dy ** 2 + jit ** 2)
    y = draw(rng, c)
    t_star = np.linspace(-10, 310, 41)
    kernel = (ConstantKernel(h * h, 'fixed') * ExpSineSquared(np.sqrt(2 / gamma), period, 'fixed', 'fixed')
              * RBF(lam, 'fixed') + WhiteKernel(jit ** 2, 'fixed'))
    gpr = GaussianProcessRegressor(kernel=kernel, alpha=dy ** 2, optimizer=None, normalize_y=False).fit(t[:, None], y)
    mean, std = gpr.predict(t_star[:, None], return_std=True)
    ref, _ = dense(t, np.full(n, h), dy ** 2 + jit ** 2, kappa, y, t_star, h)
    out['qpSklearn'] = {
        'kernel': {'amplitude': h, 'period': period, 'decayTime': lam, 'roughness': gamma, 'jitter': jit},
        't': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist(), 'tStar': t_star.tolist(),
        'sklearn': {'lnL': float(gpr.log_marginal_likelihood_value_), 'mean': mean.tolist(),
                    'latentVariance': (std ** 2 - jit ** 2).tolist()},
        'numpy': ref,
    }

    # 2. quasi-periodic, two instruments, full JD times
    n = 120
    t = np.sort(2458000 + rng.uniform(0, 400, n))
    inst = rng.integers(0, 2, n)
    dy = rng.uniform(0.8, 3.0, n)
    amp, jits = np.array([5.0, 2.5]), np.array([1.0, 2.0])
    period, lam, gamma = 18.2, 30.0, 0.9
    kappa = lambda tau: qp(tau, period, lam, gamma)  # noqa: E731
    scale = amp[inst]
    noise = dy ** 2 + jits[inst] ** 2
    c = scale[:, None] * scale[None, :] * kappa(t[:, None] - t[None, :]) + np.diag(noise)
    y = draw(rng, c)
    t_star = 2458000 + np.linspace(0, 400, 37)
    ref0, _ = dense(t, scale, noise, kappa, y, t_star, amp[0])
    ref1, _ = dense(t, scale, noise, kappa, y, t_star, amp[1])
    out['qpTwoInstruments'] = {
        'kernel': {'period': period, 'decayTime': lam, 'roughness': gamma}, 'amplitude': amp.tolist(), 'jitter': jits.tolist(),
        't': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist(), 'instrument': inst.tolist(), 'tStar': t_star.tolist(),
        'instrument0': ref0, 'instrument1': {'mean': ref1['mean'], 'variance': ref1['variance']},
    }

    # 3. rotation kernel, two instruments, unsorted full JD times; numpy slogdet and solve
    n = 300
    t = 2459000 + rng.uniform(0, 600, n)
    inst = rng.integers(0, 2, n)
    dy = rng.uniform(1.0, 3.0, n)
    amp, jits = np.array([6.0, 3.0]), np.array([0.5, 1.5])
    period, decay, shape = 23.5, 40.0, 0.6
    kappa = lambda tau: rotation(tau, period, decay, shape)  # noqa: E731
    scale = amp[inst]
    noise = dy ** 2 + jits[inst] ** 2
    c = scale[:, None] * scale[None, :] * kappa(t[:, None] - t[None, :]) + np.diag(noise)
    y = draw(rng, c)
    sign, logdet = np.linalg.slogdet(c)
    alpha = np.linalg.solve(c, y)
    t_star = 2459000 + np.linspace(-20, 620, 33)
    ref1, _ = dense(t, scale, noise, kappa, y, t_star, amp[1])
    out['rotation'] = {
        'kernel': {'period': period, 'decayTime': decay, 'shape': shape}, 'amplitude': amp.tolist(), 'jitter': jits.tolist(),
        't': t.tolist(), 'y': y.tolist(), 'dy': dy.tolist(), 'instrument': inst.tolist(), 'tStar': t_star.tolist(),
        'numpy': {'sign': float(sign), 'logDet': float(logdet), 'alpha': alpha.tolist(),
                  'lnL': float(-0.5 * (y @ alpha + logdet + n * np.log(2 * np.pi)))},
        'instrument1': {'mean': ref1['mean'], 'variance': ref1['variance']},
    }

    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'gp', 'reference.json')
    with open(path, 'w') as f:
        json.dump(out, f)
    print('wrote', os.path.normpath(path))


if __name__ == '__main__':
    main()
