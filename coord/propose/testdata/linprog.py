"""Solve the multiplier programme of a tripgrade proposal with scipy.

Reads JSON on stdin: {"lo": [...], "hi": [...], "edges": [[u, d, k, b], ...]}
meaning x_u >= k*x_d + b for every edge and lo <= x <= hi, and writes the
minimiser of sum(x) (scipy.optimize.linprog, HiGHS) as JSON on stdout:
{"status": int, "x": [...]}. Written from the programme's statement alone,
independently of tripgrade's solvers.
"""
import json
import sys

import numpy as np
from scipy.optimize import linprog
from scipy.sparse import coo_matrix


def main():
    p = json.load(sys.stdin)
    lo, hi = np.array(p["lo"], float), np.array(p["hi"], float)
    n = len(lo)
    rows, cols, vals, rhs = [], [], [], []
    for r, (u, d, k, b) in enumerate(p["edges"]):
        # x_u - k x_d >= b  <=>  -x_u + k x_d <= -b
        rows += [r, r]
        cols += [int(u), int(d)]
        vals += [-1.0, float(k)]
        rhs.append(-float(b))
    a = None
    if rhs:
        a = coo_matrix((vals, (rows, cols)), shape=(len(rhs), n)).tocsr()
    res = linprog(np.ones(n), A_ub=a, b_ub=np.array(rhs) if rhs else None,
                  bounds=list(zip(lo, hi)), method="highs",
                  options={"primal_feasibility_tolerance": 1e-10, "dual_feasibility_tolerance": 1e-10})
    out = {"status": int(res.status), "x": [] if res.x is None else [float(v) for v in res.x]}
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
