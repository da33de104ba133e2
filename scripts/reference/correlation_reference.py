"""Writes fixtures/activity/correlation.json: Pearson and Spearman coefficients with two-sided p-values by
scipy.stats.pearsonr and scipy.stats.spearmanr on seeded synthetic pairs (some with ties, one strongly
correlated with a tiny p-value, one short), for tests/shared/rv/correlation.spec.ts.

Run: /usr/bin/python3 scripts/reference/correlation_reference.py
"""
import json
import os

import numpy as np
import scipy
from scipy import stats


def main():
    rng = np.random.default_rng(20261203)
    cases = []

    def add(name, x, y):
        pr = stats.pearsonr(x, y)
        sr = stats.spearmanr(x, y)
        cases.append({'name': name, 'x': list(map(float, x)), 'y': list(map(float, y)),
                      'pearson': {'r': float(pr[0]), 'p': float(pr[1])},
                      'spearman': {'rho': float(sr[0]), 'p': float(sr[1])}})

    x = rng.standard_normal(30)
    add('weak, n = 30', x, 0.3 * x + rng.standard_normal(30))
    x = rng.standard_normal(100)
    add('strong negative, n = 100', x, -0.95 * x + 0.2 * rng.standard_normal(100))
    x = np.round(rng.uniform(0, 5, 40))
    add('ties in both, n = 40', x, np.round(x + rng.uniform(-2, 2, 40)))
    x = rng.standard_normal(5)
    add('short, n = 5', x, x + rng.standard_normal(5))
    x = rng.standard_normal(60)
    add('none, n = 60', x, rng.standard_normal(60))
    t = rng.uniform(0, 300, 80)
    add('monotone but non-linear, n = 80', t, np.exp(t / 60) + rng.standard_normal(80))

    out = {'provenance': {
        'tool': f'scipy {scipy.__version__} stats.pearsonr, stats.spearmanr (two-sided); numpy {np.__version__}',
        'command': '/usr/bin/python3 scripts/reference/correlation_reference.py', 'seed': 20261203,
    }, 'cases': cases}
    path = os.path.join(os.path.dirname(__file__), '..', '..', 'fixtures', 'activity', 'correlation.json')
    with open(path, 'w') as f:
        json.dump(out, f)
    print('wrote', os.path.normpath(path))


if __name__ == '__main__':
    main()
