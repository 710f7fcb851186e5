"""Reference values for saddlekit's divergence checks, from Debian's scipy.

Input (JSON on stdin):
  {"gaussian": [{"name": str, "alpha": float?, "p": [mean, sd], "q": [mean, sd]}, ...],
   "gaussian2d": [{"name": str, "p": {"mean": [2], "cov": [[2x2]]}, "q": {...}}, ...],
   "discrete": [{"p": [...], "q": [...]}, ...],
   "frechet": [{"mean_a": [...], "cov_a": [[...]], "mean_b": [...], "cov_b": [[...]]}, ...],
   "entropy": [{"mean": [...], "cov": [[...]]}, ...]}
Output: {"gaussian": [value or null when the integral diverges, ...], "gaussian2d": [...], "discrete": [{"jsd": float, "kl": float}, ...],
         "frechet": [float, ...], "entropy": [float, ...]}

Each f-divergence is the defining integral of q f(p/q) written directly in densities
(not through saddlekit's log-ratio form), integrated with scipy.integrate.quad.
"""
import json
import sys

import numpy as np
from scipy import integrate, linalg, stats
from scipy.spatial.distance import jensenshannon


def integrand(name, alpha, lp, lq):
    p, q = np.exp(lp), np.exp(lq)
    if name == "kl":
        return p * (lp - lq)
    if name == "reverse-kl":
        return q * (lq - lp)
    la = np.logaddexp(lp, lq)
    if name == "jensen-shannon":
        lm = la - np.log(2)
        return 0.5 * (p * (lp - lm) + q * (lq - lm))
    if name == "gan":
        return p * (lp - la) + q * (lq - la)
    # (p - q)^2 / q and (p - q)^2 / p expanded so that underflowing tails give 0, not 0/0.
    if name == "pearson":
        return np.exp(2 * lp - lq) - 2 * p + q
    if name == "neyman":
        return np.exp(2 * lq - lp) - 2 * q + p
    if name == "squared-hellinger":
        return (np.sqrt(p) - np.sqrt(q)) ** 2
    if name == "total-variation":
        return 0.5 * abs(p - q)
    if name == "alpha":
        a = alpha
        return (np.exp(a * lp + (1 - a) * lq) - q - a * (p - q)) / (a * (a - 1))
    raise ValueError(name)


def gaussian_case(c):
    (mp, sp), (mq, sq) = c["p"], c["q"]
    name, alpha = c["name"], c.get("alpha")
    if diverges(name, alpha, sp * sp, sq * sq):
        return None

    def f(x):
        lp = stats.norm.logpdf(x, mp, sp)
        lq = stats.norm.logpdf(x, mq, sq)
        return float(integrand(name, alpha, lp, lq))

    lo = min(mp - 30 * sp, mq - 30 * sq)
    hi = max(mp + 30 * sp, mq + 30 * sq)
    pts = sorted({mp, mq, mp - 3 * sp, mp + 3 * sp, mq - 3 * sq, mq + 3 * sq})
    with np.errstate(over="ignore", invalid="ignore"):
        val, _ = integrate.quad(f, lo, hi, points=pts, limit=500, epsabs=1e-13, epsrel=1e-12)
    # A divergent integral (e.g. Neyman chi^2 with p narrower than q) overflows: JSON null.
    return val if np.isfinite(val) else None


def diverges(name, alpha, cov_p, cov_q):
    """Whether the defining integral is infinite for Gaussians: the integrands of Pearson,
    Neyman and the alpha family (alpha > 1 or < 0) contain exp(-x'Ax/2) times a polynomial,
    finite iff A is positive definite (Gaussian integral): A = 2 P - Q for Pearson with
    P, Q the precisions, 2 Q - P for Neyman, alpha P + (1 - alpha) Q for alpha."""
    P, Q = np.linalg.inv(np.atleast_2d(cov_p)), np.linalg.inv(np.atleast_2d(cov_q))
    if name == "pearson":
        a = 2 * P - Q
    elif name == "neyman":
        a = 2 * Q - P
    elif name == "alpha" and (alpha > 1 or alpha < 0):
        a = alpha * P + (1 - alpha) * Q
    else:
        return False
    return bool(np.min(np.linalg.eigvalsh(a)) <= 0)


def gaussian2d_case(c):
    """The same defining integrals for 2-D Gaussians, by scipy.integrate.dblquad."""
    name, alpha = c["name"], c.get("alpha")
    if diverges(name, alpha, c["p"]["cov"], c["q"]["cov"]):
        return None
    params = []
    for g in (c["p"], c["q"]):
        mean, cov = np.array(g["mean"], float), np.array(g["cov"], float)
        inv = np.linalg.inv(cov)
        params.append((mean, inv, -np.log(2 * np.pi) - 0.5 * np.log(np.linalg.det(cov))))

    def logpdf(k, x, y):
        mean, inv, const = params[k]
        dx, dy = x - mean[0], y - mean[1]
        return const - 0.5 * (inv[0, 0] * dx * dx + 2 * inv[0, 1] * dx * dy + inv[1, 1] * dy * dy)

    def f(y, x):
        return float(integrand(name, alpha, logpdf(0, x, y), logpdf(1, x, y)))

    sds = [np.sqrt(np.diag(np.array(g["cov"], float))) for g in (c["p"], c["q"])]
    means = [np.array(g["mean"], float) for g in (c["p"], c["q"])]
    lo = [min(means[k][j] - 12 * sds[k][j] for k in range(2)) for j in range(2)]
    hi = [max(means[k][j] + 12 * sds[k][j] for k in range(2)) for j in range(2)]
    with np.errstate(over="ignore", invalid="ignore"):
        val, _ = integrate.dblquad(f, lo[0], hi[0], lo[1], hi[1], epsabs=1e-11, epsrel=1e-10)
    return val if np.isfinite(val) else None


def main():
    inp = json.load(sys.stdin)
    out = {}
    out["gaussian"] = [gaussian_case(c) for c in inp.get("gaussian", [])]
    out["gaussian2d"] = [gaussian2d_case(c) for c in inp.get("gaussian2d", [])]
    out["discrete"] = [
        {
            "jsd": float(jensenshannon(c["p"], c["q"]) ** 2),
            "kl": float(stats.entropy(c["p"], c["q"])),
        }
        for c in inp.get("discrete", [])
    ]
    fr = []
    for c in inp.get("frechet", []):
        ma, mb = np.array(c["mean_a"]), np.array(c["mean_b"])
        ca, cb = np.array(c["cov_a"]), np.array(c["cov_b"])
        root = linalg.sqrtm(ca @ cb).real
        fr.append(float(np.sum((ma - mb) ** 2) + np.trace(ca + cb - 2 * root)))
    out["frechet"] = fr
    out["entropy"] = [
        float(stats.multivariate_normal(c["mean"], c["cov"]).entropy())
        for c in inp.get("entropy", [])
    ]
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
