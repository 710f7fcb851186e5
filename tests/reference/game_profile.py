"""Reference for saddlekit's optimal-discriminator profile of the 1-D location game.

Input: {"mean": float, "sd": float, "thetas": [...]}
Output: {"profile": [...]} — -ln 4 + 2 JSD(N(mean, sd^2) || N(theta, sd^2)) at each theta,
the JSD integrated with scipy.integrate.quad from the two normal densities directly.
"""
import json
import sys

import numpy as np
from scipy import integrate, stats


def main():
    inp = json.load(sys.stdin)
    mu, sd = inp["mean"], inp["sd"]
    out = []
    for t in inp["thetas"]:
        p = stats.norm(mu, sd)
        q = stats.norm(t, sd)

        def f(x):
            lp, lq = p.logpdf(x), q.logpdf(x)
            lm = np.logaddexp(lp, lq) - np.log(2)
            return 0.5 * (np.exp(lp) * (lp - lm) + np.exp(lq) * (lq - lm))

        lo, hi = min(mu, t) - 12 * sd, max(mu, t) + 12 * sd
        jsd, _ = integrate.quad(f, lo, hi, epsabs=1e-13, epsrel=1e-12, limit=400, points=[mu, t])
        out.append(-np.log(4) + 2 * jsd)
    json.dump({"profile": out}, sys.stdout)


if __name__ == "__main__":
    main()
