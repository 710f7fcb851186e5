"""Mixture log-densities by direct summation in 50-digit decimal arithmetic (Python's
standard decimal module, so CI needs nothing beyond python3), the high-precision
reference for saddlekit's log-sum-exp evaluation. Components are 1-D or 2-D (explicit
2 x 2 inverse and determinant).

stdin: {"weights": [...k], "means": [[...d], ...], "covariances": [[...d*d], ...],
        "queries": [[...d], ...]}
stdout: {"logpdf": [...]}
"""
import json
import sys
from decimal import Decimal as D, getcontext

getcontext().prec = 50
PI = D("3.14159265358979323846264338327950288419716939937510")


def main():
    req = json.load(sys.stdin)
    w = [D(repr(v)) for v in req["weights"]]
    tw = sum(w)
    w = [v / tw for v in w]
    out = []
    for q in req["queries"]:
        total = D(0)
        for wj, m, c in zip(w, req["means"], req["covariances"]):
            d = len(m)
            x = [D(repr(q[i])) - D(repr(m[i])) for i in range(d)]
            if d == 1:
                var = D(repr(c[0]))
                quad, det = x[0] * x[0] / var, var
            else:
                a, b, cc = D(repr(c[0])), D(repr(c[1])), D(repr(c[3]))
                det = a * cc - b * b
                quad = (cc * x[0] * x[0] - 2 * b * x[0] * x[1] + a * x[1] * x[1]) / det
            total += wj * (-quad / 2).exp() / ((2 * PI) ** d * det).sqrt()
        out.append(float(total.ln()))
    json.dump({"logpdf": out}, sys.stdout)


main()
