"""Freedman–Diaconis bin counts from numpy.histogram_bin_edges(x, bins="fd") (Debian numpy).

stdin: {"cases": [[...values], ...]}
stdout: {"bins": [int, ...]} (number of equal-width bins numpy chooses for each case)
"""
import json
import sys

import numpy as np


def main():
    req = json.load(sys.stdin)
    out = [len(np.histogram_bin_edges(np.asarray(x, dtype=float), bins="fd")) - 1 for x in req["cases"]]
    json.dump({"bins": out}, sys.stdout)


main()
