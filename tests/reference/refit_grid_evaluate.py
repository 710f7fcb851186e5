"""Reference timing for the refit decomposition bench: scipy.stats.gaussian_kde (Scott's
rule) fitted to both sample sets and `evaluate`d once on a regular grid (Debian
python3-scipy), and the JSD of the two KDEs by the self-normalised midpoint rule on that
grid.

stdin: {"real": [...n*2], "fake": [...m*2], "lower": [x0, y0], "upper": [x1, y1], "size": g}
stdout: {"jsd": value, "seconds": t (fit + evaluate of both KDEs)}
"""
import json
import sys
import time

import numpy as np
from scipy.stats import gaussian_kde


def main():
    req = json.load(sys.stdin)
    real = np.asarray(req["real"], dtype=float).reshape(-1, 2).T
    fake = np.asarray(req["fake"], dtype=float).reshape(-1, 2).T
    g = int(req["size"])
    lo, hi = req["lower"], req["upper"]
    xs = lo[0] + (np.arange(g) + 0.5) * (hi[0] - lo[0]) / g
    ys = lo[1] + (np.arange(g) + 0.5) * (hi[1] - lo[1]) / g
    X, Y = np.meshgrid(xs, ys, indexing="ij")
    nodes = np.vstack([X.ravel(), Y.ravel()])
    t0 = time.perf_counter()
    p = gaussian_kde(real).evaluate(nodes)
    q = gaussian_kde(fake).evaluate(nodes)
    t = time.perf_counter() - t0
    # ln(p / m) = ln 2 + ln p - ln(p + q), safe where p + q underflows to a denormal.
    with np.errstate(divide="ignore", invalid="ignore"):
        lpq = np.log(p + q)
        kp = np.where(p > 0, p * (np.log(2) + np.log(p) - lpq), 0.0)
        kq = np.where(q > 0, q * (np.log(2) + np.log(q) - lpq), 0.0)
    jsd = 0.5 * (kp.sum() / p.sum() + kq.sum() / q.sum())
    json.dump({"jsd": float(jsd), "seconds": t}, sys.stdout)


main()
