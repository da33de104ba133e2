"""Times the reference periodogram (astropy LombScargle) for the benchmark.

Run:  MALLOC_MMAP_THRESHOLD_=4294967296 MALLOC_TRIM_THRESHOLD_=4294967296 \
      MALLOC_TOP_PAD_=268435456 /usr/bin/python3 scripts/reference/periodogram_timing.py [--quick]
With --auto-grid F0 DF M also times astropy's default call ls.power(f) (method 'auto') on that grid
for N = 1000 ("auto_1000", ms) and its max error against the exact sums ("auto_1000_err", of the peak).
Prints one JSON object: {"cython_1000", "fast_1000", "fast_10000", "fast_100000"} in ms
(best of a few repeats) plus "versions". The data and grid match scripts/bench-periodogram.ts:
t uniform on [0, 1000) d (sorted), sinusoid P = 7.3 d, K = 10 m/s plus N(0, 1..3) noise,
grid f_k = f0 + k*df with f0 = 1/1000 c/d, df chosen so that f_max = 1/1.1 c/d.
"""
import json
import sys
import time

import astropy
import numpy as np
from astropy.timeseries import LombScargle


def dataset(n, seed):
    rng = np.random.default_rng(seed)
    t = np.sort(rng.uniform(0.0, 1000.0, n))
    dy = rng.uniform(1.0, 3.0, n)
    y = 10.0 * np.sin(2 * np.pi * t / 7.3) + dy * rng.standard_normal(n)
    return t, y, dy


def grid(m):
    f0 = 1.0 / 1000.0
    fmax = 1.0 / 1.1
    df = (fmax - f0) / (m - 1)
    return f0 + df * np.arange(m)


def best_ms(fn, repeats):
    best = float('inf')
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, (time.perf_counter() - t0) * 1000.0)
    return best


def main():
    quick = '--quick' in sys.argv
    out = {}
    t, y, dy = dataset(1000, 1)
    f = grid(100_000)
    ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')
    out['cython_1000'] = best_ms(lambda: ls.power(f, method='cython', assume_regular_frequency=True), 1 if quick else 2)
    out['fast_1000'] = best_ms(lambda: ls.power(f, method='fast', assume_regular_frequency=True), 3 if quick else 7)
    t, y, dy = dataset(10_000, 2)
    ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')
    out['fast_10000'] = best_ms(lambda: ls.power(f, method='fast', assume_regular_frequency=True), 3 if quick else 7)
    t, y, dy = dataset(100_000, 3)
    f = grid(1_000_000)
    ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')
    out['fast_100000'] = best_ms(lambda: ls.power(f, method='fast', assume_regular_frequency=True), 2 if quick else 4)
    # astropy's default call (method='auto') on the grid our periodogram() uses by default for the
    # N = 1000 data set (f0, df, M given by scripts/bench-periodogram.ts: --auto-grid F0 DF M), and
    # its max error against the exact sums (method='cython') as a fraction of the peak
    if '--auto-grid' in sys.argv:
        k = sys.argv.index('--auto-grid')
        f0, df, m = float(sys.argv[k + 1]), float(sys.argv[k + 2]), int(sys.argv[k + 3])
        t, y, dy = dataset(1000, 1)
        fa = f0 + df * np.arange(m)
        ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')
        out['auto_1000'] = best_ms(lambda: ls.power(fa), 3 if quick else 7)
        exact = ls.power(fa, method='cython')
        out['auto_1000_err'] = float(np.max(np.abs(ls.power(fa) - exact)) / np.max(exact))
        out['auto_1000_m'] = m
    out['versions'] = {'astropy': astropy.__version__, 'numpy': np.__version__, 'python': sys.version.split()[0]}
    print(json.dumps(out))


if __name__ == '__main__':
    main()
