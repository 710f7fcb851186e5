"""Linear-algebra reference values from numpy / scipy.linalg (Debian).

stdin: {"a": [...d*d SPD], "d": d, "b": [...d], "data": [...n*d], "n": n, "weights": [...n]}
stdout: {"cholesky", "logdet", "solve", "inverse", "eigenvalues", "sqrtm", "cov", "cov_w",
         "mean"} (matrices row-major)
"""
import json
import sys

import numpy as np
from scipy.linalg import sqrtm


def main():
    req = json.load(sys.stdin)
    d = int(req["d"])
    A = np.asarray(req["a"], dtype=float).reshape(d, d)
    b = np.asarray(req["b"], dtype=float)
    X = np.asarray(req["data"], dtype=float).reshape(-1, d)
    w = np.asarray(req["weights"], dtype=float)
    json.dump({
        "cholesky": np.linalg.cholesky(A).ravel().tolist(),
        "logdet": float(np.linalg.slogdet(A)[1]),
        "solve": np.linalg.solve(A, b).tolist(),
        "inverse": np.linalg.inv(A).ravel().tolist(),
        "eigenvalues": np.linalg.eigvalsh(A).tolist(),
        "sqrtm": np.real(sqrtm(A)).ravel().tolist(),
        "cov": np.cov(X.T, ddof=1).ravel().tolist(),
        "cov_w": np.cov(X.T, aweights=w, ddof=1).ravel().tolist(),
        "mean": np.average(X, axis=0, weights=w).tolist(),
    }, sys.stdout)


main()
