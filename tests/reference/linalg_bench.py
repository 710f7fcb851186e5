"""Timings of numpy's dense kernels for `deno task bench:compare` (Debian numpy, OpenBLAS).

stdin: {"op": "syrk" | "eigh" | "cholesky", "input": path of raw float64 (row-major),
        "n": rows, "d": columns, "output": path for the result (raw float64), "repeats": r}
stdout: {"seconds": best wall time of the operation alone over `repeats` runs}
syrk: X.T @ X of the n x d input; eigh: numpy.linalg.eigh (values + vectors) of the d x d
input, the output is the eigenvalues; cholesky: numpy.linalg.cholesky of the d x d input.
"""
import json
import sys
import time

import numpy as np


def main():
    req = json.load(sys.stdin)
    n, d = int(req["n"]), int(req["d"])
    x = np.fromfile(req["input"], dtype=np.float64).reshape(n, d)
    ops = {
        "syrk": lambda: x.T @ x,
        "eigh": lambda: np.linalg.eigh(x)[0],
        "cholesky": lambda: np.linalg.cholesky(x),
    }
    f = ops[req["op"]]
    best = float("inf")
    for _ in range(int(req.get("repeats", 1))):
        t0 = time.perf_counter()
        out = f()
        best = min(best, time.perf_counter() - t0)
    np.ascontiguousarray(out, dtype=np.float64).tofile(req["output"])
    json.dump({"seconds": best}, sys.stdout)


main()
