"""Reference for saddlekit's mode-coverage chi-square test: scipy.stats.chisquare.

Input: {"observed": [...], "expected": [...]}
Output: {"statistic": float, "pvalue": float}
"""
import json
import sys

from scipy import stats


def main():
    inp = json.load(sys.stdin)
    r = stats.chisquare(inp["observed"], inp["expected"])
    json.dump({"statistic": float(r.statistic), "pvalue": float(r.pvalue)}, sys.stdout)


if __name__ == "__main__":
    main()
