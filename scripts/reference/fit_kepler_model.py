"""Keplerian RV model shared by the fit reference scripts (numpy; independent of the TypeScript code).

v(t) = K [cos(nu + omega) + e cos omega]; parameters (P, K, sqrt(e) cos w, sqrt(e) sin w, Tc, offset),
Tc the time of inferior conjunction (nu + omega = pi/2). Kepler's equation by vectorised Newton.
"""
import numpy as np


def ecc_anomaly(M, e):
    M = np.mod(M + np.pi, 2 * np.pi) - np.pi
    E = M + 0.85 * e * np.sign(np.sin(M))
    for _ in range(50):
        f = E - e * np.sin(E) - M
        E = E - f / (1 - e * np.cos(E))
        if np.max(np.abs(f)) < 1e-14:
            break
    return E


def tc_to_tp(tc, P, e, w):
    nu = np.pi / 2 - w
    E = 2 * np.arctan2(np.sqrt(1 - e) * np.sin(nu / 2), np.sqrt(1 + e) * np.cos(nu / 2))
    return tc - P * (E - e * np.sin(E)) / (2 * np.pi)


def model(p, t):
    P, K, a, b, tc, off = p
    e = a * a + b * b
    w = np.arctan2(b, a) if e > 0 else 0.0
    tp = tc_to_tp(tc, P, e, w)
    E = ecc_anomaly(2 * np.pi * (t - tp) / P, e)
    nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
    return K * (np.cos(nu + w) + e * np.cos(w)) + off
