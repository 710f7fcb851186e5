"""Reference values for the feature-space metrics from Debian's numpy / scipy.

stdin: {"task": ..., ...}; tasks:
  "ckdtree":   {"ref": [...], "query": [...], "d", "k"} -> {"dist", "idx"} (cKDTree.query)
  "w1_energy": {"a": [...], "b": [...]} -> {"w1", "energy"} (scipy.stats)
  "frechet":   {"a": [...], "b": [...], "d"} or {"a_path", "b_path", "d"} (.npy files)
               -> {"fd", "mean_a", "cov_a"}
               (numpy cov + scipy.linalg.sqrtm)
  "mmd":       {"a", "b", "d", "sigma"} -> {"unbiased", "biased", "cubic"} (numpy double sums)
"""
import json
import sys

import numpy as np


def main():
    req = json.load(sys.stdin)
    task = req["task"]
    if task == "ckdtree":
        from scipy.spatial import cKDTree
        d = int(req["d"])
        ref = np.asarray(req["ref"], dtype=float).reshape(-1, d)
        q = np.asarray(req["query"], dtype=float).reshape(-1, d)
        dist, idx = cKDTree(ref).query(q, k=int(req["k"]))
        out = {"dist": np.ravel(dist).tolist(), "idx": np.ravel(idx).tolist()}
    elif task == "w1_energy":
        from scipy.stats import energy_distance, wasserstein_distance
        a, b = np.asarray(req["a"], dtype=float), np.asarray(req["b"], dtype=float)
        out = {"w1": float(wasserstein_distance(a, b)), "energy": float(energy_distance(a, b))}
    elif task == "frechet":
        from scipy.linalg import sqrtm
        d = int(req["d"])
        if "a_path" in req:
            a, b = np.load(req["a_path"]), np.load(req["b_path"])
        else:
            a = np.asarray(req["a"], dtype=float).reshape(-1, d)
            b = np.asarray(req["b"], dtype=float).reshape(-1, d)
        ma, mb = a.mean(axis=0), b.mean(axis=0)
        ca, cb = np.cov(a, rowvar=False), np.cov(b, rowvar=False)
        s = sqrtm(ca @ cb)
        fd = float(np.sum((ma - mb) ** 2) + np.trace(ca) + np.trace(cb) - 2 * np.trace(np.real(s)))
        out = {"fd": fd}
        if d <= 256:
            out.update({"mean_a": ma.tolist(), "cov_a": ca.ravel().tolist()})
    elif task == "mmd":
        d = int(req["d"])
        a = np.asarray(req["a"], dtype=float).reshape(-1, d)
        b = np.asarray(req["b"], dtype=float).reshape(-1, d)
        g = 1.0 / (2.0 * float(req["sigma"]) ** 2)

        def sq(x, y):
            return ((x[:, None, :] - y[None, :, :]) ** 2).sum(axis=2)

        kxx, kyy, kxy = np.exp(-g * sq(a, a)), np.exp(-g * sq(b, b)), np.exp(-g * sq(a, b))
        n, m = len(a), len(b)

        def unbiased(kxx, kyy, kxy):
            return float((kxx.sum() - np.trace(kxx)) / (n * (n - 1))
                         + (kyy.sum() - np.trace(kyy)) / (m * (m - 1)) - 2 * kxy.mean())

        cxx, cyy, cxy = (a @ a.T / d + 1) ** 3, (b @ b.T / d + 1) ** 3, (a @ b.T / d + 1) ** 3
        out = {
            "unbiased": unbiased(kxx, kyy, kxy),
            "biased": float(kxx.mean() + kyy.mean() - 2 * kxy.mean()),
            "cubic": unbiased(cxx, cyy, cxy),
        }
    else:
        raise SystemExit(f"unknown task {task}")
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
