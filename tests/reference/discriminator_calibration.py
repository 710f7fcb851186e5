"""Reliability-diagram bins from sklearn.calibration.calibration_curve (Debian python3-sklearn).

stdin: {"y": [0/1, ...], "p": [probability, ...], "bins": int}
stdout: {"prob_true": [...], "prob_pred": [...]} for the non-empty bins, in bin order
(strategy "uniform": equal-width bins on [0, 1], right-closed as in Guo et al. 2017).
"""
import json
import sys

import numpy as np
from sklearn.calibration import calibration_curve


def main():
    req = json.load(sys.stdin)
    y = np.asarray(req["y"], dtype=int)
    p = np.asarray(req["p"], dtype=float)
    prob_true, prob_pred = calibration_curve(y, p, n_bins=int(req["bins"]), strategy="uniform")
    json.dump({"prob_true": prob_true.tolist(), "prob_pred": prob_pred.tolist()}, sys.stdout)


main()
