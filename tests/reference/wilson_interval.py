"""Wilson score intervals from scipy.stats.binomtest(...).proportion_ci(method="wilson").

Input:  {"cases": [{"k": int, "n": int, "level": float}, ...]}
Output: {"intervals": [[lo, hi], ...]}
"""
import json
import sys

from scipy.stats import binomtest


def main():
    req = json.load(sys.stdin)
    out = []
    for c in req["cases"]:
        ci = binomtest(c["k"], c["n"]).proportion_ci(confidence_level=c["level"], method="wilson")
        out.append([float(ci.low), float(ci.high)])
    json.dump({"intervals": out}, sys.stdout)


if __name__ == "__main__":
    main()
