"""Reference for saddlekit's classifier estimate of D*: weighted L2 logistic regression.

Input: {"real": [[...]], "fake": [[...]], "l2": float, "query": [[...]]}
Output: {"logit": [...]} — scikit-learn's decision function at the query points for the
model saddlekit fits: features standardised on the pooled points (ddof = 1), each side
weighted N / (2 n_side), objective mean weighted log-loss + (l2 / 2) |coef|^2 with the
intercept unpenalised, i.e. LogisticRegression(C = 1 / (l2 N)).
"""
import json
import sys
import warnings

import numpy as np
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import LogisticRegression


def main():
    inp = json.load(sys.stdin)
    real, fake = np.array(inp["real"], float), np.array(inp["fake"], float)
    x = np.vstack([real, fake])
    n = len(x)
    y = np.r_[np.ones(len(real)), np.zeros(len(fake))]
    w = np.r_[np.full(len(real), n / (2 * len(real))), np.full(len(fake), n / (2 * len(fake)))]
    mu, sd = x.mean(axis=0), x.std(axis=0, ddof=1)
    z = (x - mu) / sd
    # newton-cg: lbfgs stops early on its relative gradient test (5 iterations here).
    model = LogisticRegression(C=1.0 / (inp["l2"] * n), solver="newton-cg", tol=1e-10, max_iter=1000)
    # newton-cg reports non-convergence once its line search stalls at machine precision;
    # the solution is converged by then (it matches an exact Newton solve to 1e-12).
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ConvergenceWarning)
        model.fit(z, y, sample_weight=w)
    q = (np.array(inp["query"], float) - mu) / sd
    json.dump({"logit": model.decision_function(q).tolist()}, sys.stdout)


if __name__ == "__main__":
    main()
