"""Histogram counts from numpy.histogram / numpy.histogram2d (Debian python3-numpy).

stdin: {"data": [...n*d], "d": 1|2, "bins": [...d], "lower": [...d], "upper": [...d]}
stdout: {"counts": [...] (row-major, last axis fastest)}
"""
import json
import sys

import numpy as np


def main():
    req = json.load(sys.stdin)
    d = int(req["d"])
    X = np.asarray(req["data"], dtype=float).reshape(-1, d)
    rng = [(lo, hi) for lo, hi in zip(req["lower"], req["upper"])]
    if d == 1:
        counts, _ = np.histogram(X[:, 0], bins=req["bins"][0], range=rng[0])
    else:
        counts, _, _ = np.histogram2d(X[:, 0], X[:, 1], bins=req["bins"], range=rng)
    json.dump({"counts": np.asarray(counts, dtype=float).ravel().tolist()}, sys.stdout)


main()
