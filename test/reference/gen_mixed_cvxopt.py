"""Reference optima of the mixed-smoothness trend from Debian's python3-cvxopt (a general
QP solver, cvxopt.solvers.qp), at small n:

  minimise 1/2 sum w_i (y_i - a_i - c_i)^2 + lam1 ||D(x, 2) a||_1 + lam3 ||D(x, 4) c||_1
  subject to sum w_i c_i = 0 and sum w_i x_i c_i = 0 (straight lines belong to a),

written as a QP in (a, c, s, t) with -s <= D(x, 2) a <= s, -t <= D(x, 4) c <= t. D(x, q) is the
divided-difference operator of trend filtering on unequal x: D(x, 1) first differences,
D(x, j+1) = D1 diag(j / (x_{i+j} - x_i)) D(x, j). The series are invented and seeded
(numpy RandomState): straight pieces with kinks, then smooth humps, uneven x.
Solved with kktsolver='ldl' (the quadratic term is singular) at the tightest tolerance
(1e-12 down to 1e-8) at which cvxopt reports 'optimal'.
Writes fixtures/mixed_cvxopt.json.
"""
import json
import os

import numpy as np
import cvxopt
from cvxopt import matrix, solvers


def diff_op(x, q):
    n = len(x)
    D = np.eye(n)
    for s in range(1, q + 1):
        length = D.shape[0]
        if s >= 2:
            j = s - 1
            scale = np.array([j / (x[i + j] - x[i]) for i in range(length)])
            D = scale[:, None] * D
        D = D[1:] - D[:-1]
    return D


def solve(x, y, w, lam1, lam3):
    n = len(x)
    D2, D4 = diff_op(x, 2), diff_op(x, 4)
    m2, m4 = D2.shape[0], D4.shape[0]
    N = 2 * n + m2 + m4
    W = np.diag(w)
    M = np.hstack([np.eye(n), np.eye(n)])
    P = np.zeros((N, N))
    P[: 2 * n, : 2 * n] = M.T @ W @ M
    c = np.zeros(N)
    c[: 2 * n] = -M.T @ W @ y
    c[2 * n: 2 * n + m2] = lam1
    c[2 * n + m2:] = lam3
    G = np.zeros((2 * m2 + 2 * m4, N))
    G[:m2, :n] = D2
    G[:m2, 2 * n: 2 * n + m2] = -np.eye(m2)
    G[m2: 2 * m2, :n] = -D2
    G[m2: 2 * m2, 2 * n: 2 * n + m2] = -np.eye(m2)
    G[2 * m2: 2 * m2 + m4, n: 2 * n] = D4
    G[2 * m2: 2 * m2 + m4, 2 * n + m2:] = -np.eye(m4)
    G[2 * m2 + m4:, n: 2 * n] = -D4
    G[2 * m2 + m4:, 2 * n + m2:] = -np.eye(m4)
    h = np.zeros(2 * m2 + 2 * m4)
    A = np.zeros((2, N))
    A[0, n: 2 * n] = w
    A[1, n: 2 * n] = w * x
    for tol in (1e-12, 1e-11, 1e-10, 1e-9, 1e-8):
        solvers.options.update({"show_progress": False, "abstol": tol, "reltol": tol, "feastol": tol, "maxiters": 300})
        sol = solvers.qp(matrix(P), matrix(c), matrix(G), matrix(h), matrix(A), matrix(np.zeros(2)), kktsolver="ldl")
        if sol["status"] == "optimal":
            break
    z = np.array(sol["x"]).ravel()
    a, cc = z[:n], z[n: 2 * n]
    r = y - a - cc
    obj = 0.5 * np.sum(w * r ** 2) + lam1 * np.sum(np.abs(D2 @ a)) + lam3 * np.sum(np.abs(D4 @ cc))
    return {"status": sol["status"], "tolerance": tol, "gap": sol["gap"], "relative_gap": sol["relative gap"], "objective": obj,
            "kinks": a.tolist(), "bends": cc.tolist(), "fitted": (a + cc).tolist()}


def case(name, seed, n, lam1, lam3, weighted, sigma=0.15):
    rs = np.random.RandomState(seed)
    x = np.cumsum(rs.uniform(0.5, 1.5, n))
    t = (x - x[0]) / (x[-1] - x[0])
    relu = lambda v: np.maximum(v, 0)
    line = 4 * t - 10 * relu(t - 0.12) + 12 * relu(t - 0.25) - 8 * relu(t - 0.38)
    hump = np.where(t > 0.5, 0.8 * (1 - np.cos(2 * np.pi * (t - 0.5) / 0.25)), 0)
    y = line + hump + rs.normal(0, sigma, n)
    w = rs.uniform(0.5, 2.0, n) if weighted else np.ones(n)
    out = solve(x, y, w, lam1, lam3)
    return {"name": name, "x": x.tolist(), "y": y.tolist(), "w": w.tolist(), "weighted": weighted,
            "penalty": lam1, "bendPenalty": lam3, **out}


cases = [
    case("n60-balanced", 21, 60, 0.25, 0.6, False),
    case("n80-weighted", 22, 80, 0.15, 0.4, True),
    case("n50-kinks-cheap", 23, 50, 0.05, 200.0, False),
    case("n70-bends-cheap", 24, 70, 2.0, 2.0, True),
]
out = {"source": "cvxopt.solvers.qp (Debian python3-cvxopt)", "version": cvxopt.__version__, "numpy": np.__version__,
       "note": __doc__.strip(), "cases": cases}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures", "mixed_cvxopt.json"), "w") as f:
    json.dump(out, f)
for c in cases:
    print(c["name"], c["status"], c["tolerance"], c["relative_gap"], c["objective"])
