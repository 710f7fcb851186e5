"""Diffusion bandwidth of Botev, Grotowski & Kroese 2010 (Ann. Stat. 38(5)), written from
the paper's Algorithm 1 with numpy/scipy (scipy.fft.dct, scipy.optimize.brentq), as an
independent check of the saddlekit implementation. Grid: 2^14 points over the data range
widened by a tenth on each side (as in the authors' published code, from memory).

stdin: {"x": [...]}   stdout: {"bandwidth": h, "t_star": t}
"""
import json
import math
import sys

import numpy as np
from scipy.fft import dct
from scipy.optimize import brentq


def fixed_point(t, N, I, a2):
    l = 7
    f = 2 * math.pi ** (2 * l) * np.sum(I ** l * a2 * np.exp(-I * math.pi ** 2 * t))
    for s in range(l - 1, 1, -1):
        K0 = np.prod(np.arange(1, 2 * s, 2)) / math.sqrt(2 * math.pi)
        const = (1 + 0.5 ** (s + 0.5)) / 3
        time = (2 * const * K0 / N / f) ** (2 / (3 + 2 * s))
        f = 2 * math.pi ** (2 * s) * np.sum(I ** s * a2 * np.exp(-I * math.pi ** 2 * time))
    return t - (2 * N * math.sqrt(math.pi) * f) ** (-0.4)


def main():
    x = np.asarray(json.load(sys.stdin)["x"], dtype=float)
    n = 2 ** 14
    lo, hi = x.min(), x.max()
    r = hi - lo
    MIN, MAX = lo - r / 10, hi + r / 10
    R = MAX - MIN
    dx = R / (n - 1)
    k = np.minimum(n - 1, np.floor((x - MIN) / dx).astype(int))
    hist = np.bincount(k, minlength=n).astype(float)
    hist /= hist.sum()
    # DCT-II: a_k = 2 Σ h_j cos(π k (2j+1) / 2n); the paper's a2 uses (a_k / 2)^2.
    a = dct(hist, type=2)
    I = np.arange(1, n, dtype=float) ** 2
    a2 = (a[1:] / 2) ** 2
    # N counts the distinct values, as the authors' published code does (from memory:
    # N = length(unique(data))); equal to len(x) for continuous data.
    N = len(np.unique(x))
    t = brentq(lambda t: fixed_point(t, N, I, a2), 1e-12, 0.1, xtol=1e-16, rtol=1e-14)
    json.dump({"bandwidth": math.sqrt(t) * R, "t_star": t}, sys.stdout)


main()
