"""Timing of scipy.stats.gaussian_kde.evaluate (Debian python3-scipy), the fastest scipy
call, with the tail-accurate logpdf of the same KDE as the accuracy reference.

stdin: {"data": [...n*d row-major], "d": d, "queries": [...m*d]}
stdout: {"seconds": t (evaluate only), "log_evaluate": [...m] (log of evaluate, -inf where
         it underflowed to 0), "logpdf": [...m] (logsumexp, finite in the tails)}
"""
import json
import sys
import time

import numpy as np
from scipy.stats import gaussian_kde


def main():
    req = json.load(sys.stdin)
    d = int(req["d"])
    data = np.asarray(req["data"], dtype=float).reshape(-1, d).T
    q = np.asarray(req["queries"], dtype=float).reshape(-1, d).T
    kde = gaussian_kde(data)
    t0 = time.perf_counter()
    dens = kde.evaluate(q)
    t = time.perf_counter() - t0
    with np.errstate(divide="ignore"):
        log_eval = np.log(dens)
    lp = kde.logpdf(q)
    # JSON has no -inf: underflowed entries are sent as null.
    json.dump({
        "seconds": t,
        "log_evaluate": [None if not np.isfinite(v) else float(v) for v in log_eval],
        "logpdf": lp.tolist(),
    }, sys.stdout)


main()
