"""Timed reference side of the feature-space bench cases (bench/_cases_feature_space.ts).

stdin: {"task": ..., paths of .npy files written by the bench}; stdout: the reference's
numbers, "seconds" (its own computation only, loading excluded unless the task is the
loading) and "peak_rss_mb" (this process's peak resident memory).
  "knn":     {"ref", "query" (or null: self-query), "k"} -> {"dist"} (cKDTree build + query)
  "frechet": {"a", "b"} -> {"fd"} (numpy cov + scipy.linalg.sqrtm)
  "mmd":     {"a", "b", "sigma"} -> {"mmd2"} (unbiased Gaussian MMD², vectorised numpy)
  "stream":  {"path"} -> {"trace", "sum_mean"} (np.load + np.cov, loading timed)
"""
import json
import resource
import sys
import time

import numpy as np


def main():
    req = json.load(sys.stdin)
    task = req["task"]
    if task == "knn":
        from scipy.spatial import cKDTree
        ref = np.load(req["ref"])
        query = np.load(req["query"]) if req["query"] else None
        k = int(req["k"])
        t = time.perf_counter()
        tree = cKDTree(ref)
        if query is None:
            dist, _ = tree.query(ref, k=k + 1)
            dist = dist[:, 1:]
        else:
            dist, _ = tree.query(query, k=k)
        out = {"seconds": time.perf_counter() - t, "dist": np.ravel(dist).tolist()}
    elif task == "frechet":
        from scipy.linalg import sqrtm
        a, b = np.load(req["a"]), np.load(req["b"])
        t = time.perf_counter()
        ma, mb = a.mean(axis=0), b.mean(axis=0)
        ca, cb = np.cov(a, rowvar=False), np.cov(b, rowvar=False)
        s = np.real(sqrtm(ca @ cb))
        fd = float(np.sum((ma - mb) ** 2) + np.trace(ca) + np.trace(cb) - 2 * np.trace(s))
        out = {"seconds": time.perf_counter() - t, "fd": fd}
    elif task == "mmd":
        a, b = np.load(req["a"]), np.load(req["b"])
        g = 1.0 / (2.0 * float(req["sigma"]) ** 2)
        t = time.perf_counter()

        def ksum(x, y, same):
            sq = (x * x).sum(1)[:, None] + (y * y).sum(1)[None, :] - 2.0 * x @ y.T
            k = np.exp(-g * np.maximum(sq, 0.0))
            return k.sum() - (np.trace(k) if same else 0.0)

        n, m = len(a), len(b)
        mmd2 = (ksum(a, a, True) / (n * (n - 1)) + ksum(b, b, True) / (m * (m - 1))
                - 2.0 * ksum(a, b, False) / (n * m))
        out = {"seconds": time.perf_counter() - t, "mmd2": float(mmd2)}
    elif task == "stream":
        t = time.perf_counter()
        x = np.load(req["path"])
        mean = x.mean(axis=0, dtype=np.float64)
        cov = np.cov(x, rowvar=False)
        out = {"seconds": time.perf_counter() - t, "trace": float(np.trace(cov)),
               "sum_mean": float(mean.sum())}
    else:
        raise SystemExit(f"unknown task {task}")
    out["peak_rss_mb"] = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
