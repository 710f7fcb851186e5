"""Reference EM fits from sklearn.mixture.GaussianMixture (Debian python3-sklearn).

stdin: {"data": [...n*d], "d": d, "k": k, "covariance_type": "full"|"diag"|"spherical",
        "weights_init": [...k], "means_init": [...k*d], "covariances_init": [...k*d*d],
        "max_iter": m, "tol": t, "reg_covar": r}
stdout: {"score": mean log-likelihood per sample, "weights": [...], "means": [...],
         "n_iter": i, "converged": b, "seconds": fit time, "n_parameters": p,
         "bic": ..., "aic": ...}
"""
import json
import sys
import time
import warnings

import numpy as np
from sklearn.mixture import GaussianMixture


def main():
    req = json.load(sys.stdin)
    d, k = int(req["d"]), int(req["k"])
    X = np.asarray(req["data"], dtype=float).reshape(-1, d)
    ctype = req.get("covariance_type", "full")
    covs = np.asarray(req["covariances_init"], dtype=float).reshape(k, d, d)
    if ctype == "full":
        prec = np.linalg.inv(covs)
    elif ctype == "diag":
        prec = 1.0 / np.array([np.diag(c) for c in covs])
    else:
        prec = 1.0 / np.array([np.mean(np.diag(c)) for c in covs])
    gm = GaussianMixture(
        n_components=k,
        covariance_type=ctype,
        weights_init=np.asarray(req["weights_init"], dtype=float),
        means_init=np.asarray(req["means_init"], dtype=float).reshape(k, d),
        precisions_init=prec,
        max_iter=int(req.get("max_iter", 100)),
        tol=float(req.get("tol", 1e-3)),
        reg_covar=float(req.get("reg_covar", 1e-6)),
        n_init=1,
        init_params="random",
        random_state=0,
    )
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        t0 = time.perf_counter()
        gm.fit(X)
        t = time.perf_counter() - t0
    json.dump({
        "score": float(gm.score(X)),
        "weights": gm.weights_.tolist(),
        "means": gm.means_.ravel().tolist(),
        "n_iter": int(gm.n_iter_),
        "converged": bool(gm.converged_),
        "seconds": t,
        "n_parameters": int(gm._n_parameters()),
        "bic": float(gm.bic(X)),
        "aic": float(gm.aic(X)),
    }, sys.stdout)


main()
