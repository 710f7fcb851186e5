"""Linear-algebra reference values from numpy / scipy.linalg (Debian).

stdin: {"a": [...d*d SPD], "d": d, "b": [...d], "data": [...n*d], "n": n, "weights": [...n]}
stdout: {"cholesky", "logdet", "solve", "inverse", "eigenvalues", "sqrtm", "cov", "cov_w",
         "mean"} (matrices row-major)

With {"kernels": true, "x": [...n*d], "n": n, "d": d, "a": [...d*d symmetric],
"b": [...d*d PSD], "c": [...d*d PSD]} instead: {"syrk" (X^T X), "gram" (X X^T),
"gemm" (A B), "gemm_tn" (X^T X via matmul of the transpose), "eigenvalues", "vectors"
(numpy.linalg.eigh), "trace_sqrt" (tr sqrtm(sqrtm(B) C sqrtm(B)), scipy), "cholesky" (of B),
"syrk_acc" (2 X^T X + 0.5 C)}; with "tri": [...d*d lower triangular] also the four
scipy.linalg.solve_triangular solves "trsm_right_t" (Y T^T = X), "trsm_right" (Y T = X),
"trsm_left" (T Y = X^T), "trsm_left_t" (T^T Y = X^T), all row-major.
"""
import json
import sys

import numpy as np
from scipy.linalg import solve_triangular, sqrtm


def kernels(req):
    n, d = int(req["n"]), int(req["d"])
    X = np.asarray(req["x"], dtype=float).reshape(n, d)
    A = np.asarray(req["a"], dtype=float).reshape(d, d)
    B = np.asarray(req["b"], dtype=float).reshape(d, d)
    C = np.asarray(req["c"], dtype=float).reshape(d, d)
    w, V = np.linalg.eigh(A)
    rb = np.real(sqrtm(B))
    out = {
        "syrk": (X.T @ X).ravel().tolist(),
        "gram": (X @ X.T).ravel().tolist(),
        "gemm": (A @ B).ravel().tolist(),
        "eigenvalues": w.tolist(),
        "vectors": V.ravel().tolist(),
        "trace_sqrt": float(np.trace(np.real(sqrtm(rb @ C @ rb)))),
        "syrk_acc": (2 * (X.T @ X) + 0.5 * C).ravel().tolist(),
    }
    if "tri" in req:
        T = np.tril(np.asarray(req["tri"], dtype=float).reshape(d, d))
        out["trsm_right_t"] = solve_triangular(T, X.T, lower=True).T.ravel().tolist()
        out["trsm_right"] = solve_triangular(T, X.T, lower=True, trans="T").T.ravel().tolist()
        out["trsm_left"] = solve_triangular(T, X.T, lower=True).ravel().tolist()
        out["trsm_left_t"] = solve_triangular(T, X.T, lower=True, trans="T").ravel().tolist()
    try:
        out["cholesky"] = np.linalg.cholesky(B).ravel().tolist()
    except np.linalg.LinAlgError:
        out["cholesky"] = None
    json.dump(out, sys.stdout)


def main():
    req = json.load(sys.stdin)
    if req.get("kernels"):
        kernels(req)
        return
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
