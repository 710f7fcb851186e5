"""Reference values from scipy.stats.gaussian_kde (Debian python3-scipy).

stdin: {"data": [...n*d row-major], "d": d, "queries": [...m*d], "weights": [...] | null,
        "bw_method": "scott" | "silverman" | number}
stdout: {"logpdf": [...m], "factor": f, "scott_factor": ..., "silverman_factor": ...,
         "covariance": [...d*d], "neff": ..., "silverman_rot": h (1-D only), "seconds": t}
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
    w = req.get("weights")
    kde = gaussian_kde(data, bw_method=req.get("bw_method", "scott"),
                       weights=None if w is None else np.asarray(w, dtype=float))
    t0 = time.perf_counter()
    lp = kde.logpdf(q)
    t = time.perf_counter() - t0
    out = {
        "logpdf": lp.tolist(),
        "factor": float(kde.factor),
        "scott_factor": float(kde.scotts_factor()),
        "silverman_factor": float(kde.silverman_factor()),
        "covariance": np.asarray(kde.covariance).ravel().tolist(),
        "neff": float(kde.neff),
        "seconds": t,
    }
    if d == 1:
        x = data[0]
        sd = np.std(x, ddof=1)
        iqr = np.subtract(*np.percentile(x, [75, 25]))
        # Silverman 1986 eq. 3.31, with numpy's default (linear) percentiles.
        out["silverman_rot"] = float(0.9 * min(sd, iqr / 1.34) * len(x) ** (-0.2))
    json.dump(out, sys.stdout)


main()
