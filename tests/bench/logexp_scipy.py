#!/usr/bin/env python3
"""The log-exponent extraction of Marginalia's log-exponent check, written the way one would
check it by hand with SciPy: solve_ivp on the infrared flow in s = ln(1 + l), the effective
exponent from the rates at every decade of RG time, a least-squares fit of p + b/l + a ln(l)/l,
and the same variations (start, tolerance, window) for the uncertainty.

Usage: logexp_scipy.py [repeats] [observable:n ...]  (observable chi or heat; default: chi and
heat for n = 0..4) -- prints one JSON line per case with p, its uncertainty and the median wall
time of one extraction in milliseconds (imports and start-up excluded).
"""
import json
import math
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

DECADES = 17
WINDOW = 9


def on_model(n):
    """Two-loop O(n) functions at d = 4 (Kleinert and Schulte-Frohlinde 2001, from memory)."""
    b, b2 = (n + 8) / 3, (3 * n + 14) / 3
    beta = lambda g: -b * g * g + b2 * g ** 3          # dg/dl
    a_t = lambda g: -(n + 2) / 3 * g + 5 * (n + 2) / 18 * g * g   # rate_t - 2
    a_chi = lambda g: -(n + 2) / 18 * g * g            # rate_chi - 2
    return beta, a_t, a_chi


def effective_exponents(n, observable, g0, rtol):
    beta, a_t, a_chi = on_model(n)
    y_t, x = 2.0, (1.0 if observable == 'chi' else 0.0)

    def rhs(s, y):
        big = math.exp(s)                 # 1 + l
        g = y[0] / big                    # y[0] = (1 + l) g tends to a constant
        d_obs = a_chi(g) - x * a_t(g) if observable == 'chi' else 1 - y[2] * (1 + big * 2 * a_t(g))
        return [y[0] + big * big * beta(g), big * a_t(g), big * d_obs if observable == 'chi' else d_obs]

    s_out = [math.log1p(10.0 ** k) for k in range(1, DECADES + 1)]
    sol = solve_ivp(rhs, (0.0, s_out[-1]), [g0, 0.0, 0.0], method='DOP853', t_eval=s_out, rtol=rtol, atol=rtol * 1e-3)
    ls, p_eff = [], []
    for s, (G, i_t, w) in zip(sol.t, sol.y.T):
        l, big = math.expm1(s), math.exp(s)
        g = G / big
        ln_t0 = y_t * l + i_t
        rate_t = y_t + a_t(g)
        if observable == 'chi':
            p_eff.append((a_chi(g) - x * a_t(g)) * ln_t0 / rate_t)
        else:
            p_eff.append(ln_t0 / (big * w * rate_t))
        ls.append(l)
    kappa = big * ((a_chi(g) - x * a_t(g)) if observable == 'chi' else 2 * a_t(g))
    return np.array(ls), np.array(p_eff), kappa


def fit(ls, p_eff, lo, hi):
    keep = (ls >= lo) & (ls <= hi)
    l = ls[keep]
    basis = np.stack([np.ones_like(l), 1 / l, np.log(l) / l], axis=1)
    scale = np.abs(basis).max(axis=0)
    coef, *_ = np.linalg.lstsq(basis / scale, p_eff[keep], rcond=None)
    return coef[0] / scale[0]


def extract(n, observable, g0=0.3, rtol=1e-10, scale=1.5):
    def estimate(start, tol, lo, hi):
        ls, p_eff, kappa = effective_exponents(n, observable, start, tol)
        if observable == 'chi':
            return fit(ls, p_eff, lo, hi), kappa
        return max(0.0, 1 + kappa), kappa       # integral observable: the asymptotic form

    last = 10.0 ** DECADES
    central = (last / 10 ** (WINDOW - 1) / 1.01, last)
    p, kappa = estimate(g0, rtol, *central)
    others = [
        estimate(g0, rtol, last / 10 ** (WINDOW + 1) / 1.01, last / 100 * 1.01)[0],
        estimate(g0, rtol, last / 10 ** (WINDOW - 4) / 1.01, last)[0],
        estimate(g0 / scale, rtol, *central)[0],
        estimate(g0 * scale, rtol, *central)[0],
        estimate(g0, rtol * 100, *central)[0],
    ]
    uncertainty = max(abs(q - p) for q in others) + abs(kappa - p if observable == 'chi' else 0)
    return p, uncertainty


def main():
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    cases = [(c.split(':')[0], int(c.split(':')[1])) for c in sys.argv[2:]]
    if not cases:
        cases = [('chi', n) for n in range(5)] + [('heat', n) for n in range(5)]
    for observable, n in cases:
        times = []
        for _ in range(repeats):
            start = time.perf_counter()
            p, u = extract(n, observable)
            times.append((time.perf_counter() - start) * 1000)
        exact = (n + 2) / (n + 8) if observable == 'chi' else (4 - n) / (n + 8)
        print(json.dumps({'observable': observable, 'n': n, 'p': p, 'uncertainty': u, 'exact': exact,
                          'ms': float(np.median(times))}))
        sys.stdout.flush()


if __name__ == '__main__':
    main()
