"""Reference optima of the adaptive decomposition from Debian's python3-cvxopt (a general
QP solver, cvxopt.solvers.qp), at small n:

  minimise 1/2 sum w_i (y_i - t_i - s_i - o_i)^2 + lam ||D(x, k+1) t||_1 + rho ||o||_1
  s = A theta: per-phase effects (phase = grid step mod period) summing to zero over the period,
  or, for a period that is not a whole number, Fourier terms cos/sin(2 pi j g / period), j = 1..K,
  K = min(10, floor((period - 1) / 2)), g the grid step of x;

written as a QP in (t, theta, o, a, b) with -a <= D t <= a, -b <= o <= b. D(x, q) is the
divided-difference operator of trend filtering on unequal x: D(x, 1) first differences,
D(x, j+1) = D1 diag(j / (x_{i+j} - x_i)) D(x, j). The series are invented and seeded
(numpy RandomState); x have gaps (dropped grid steps), so phases come from x.
Solved with kktsolver='ldl' (the default Cholesky-based one fails on the singular quadratic term)
at the tightest tolerance (1e-12 down to 1e-8) at which cvxopt reports 'optimal'.
Writes fixtures/decompose_cvxopt.json.
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


def season_matrix(g, period):
    n = len(g)
    if float(period).is_integer():
        P = int(period)
        A = np.zeros((n, P))
        A[np.arange(n), g % P] = 1.0
        return A, np.ones((1, P))
    K = min(10, int(np.floor((period - 1) / 2)))
    cols = []
    for j in range(1, K + 1):
        cols.append(np.cos(2 * np.pi * j * g / period))
        cols.append(np.sin(2 * np.pi * j * g / period))
    return np.column_stack(cols), None


def solve(x, y, w, k, lam, rho, period, step):
    n = len(x)
    g = np.round((x - x[0]) / step).astype(int)
    A, C = season_matrix(g, period)
    q = A.shape[1]
    D = diff_op(x, k + 1)
    m = D.shape[0]
    N = n + q + n + m + n
    M = np.hstack([np.eye(n), A, np.eye(n)])
    W = np.diag(w)
    P = np.zeros((N, N))
    P[: 2 * n + q, : 2 * n + q] = M.T @ W @ M
    c = np.zeros(N)
    c[: 2 * n + q] = -M.T @ W @ y
    c[2 * n + q: 2 * n + q + m] = lam
    c[2 * n + q + m:] = rho
    G = np.zeros((2 * m + 2 * n, N))
    it, ia = 0, 2 * n + q
    G[:m, :n] = D
    G[:m, ia:ia + m] = -np.eye(m)
    G[m:2 * m, :n] = -D
    G[m:2 * m, ia:ia + m] = -np.eye(m)
    io, ib = n + q, 2 * n + q + m
    G[2 * m:2 * m + n, io:io + n] = np.eye(n)
    G[2 * m:2 * m + n, ib:ib + n] = -np.eye(n)
    G[2 * m + n:, io:io + n] = -np.eye(n)
    G[2 * m + n:, ib:ib + n] = -np.eye(n)
    h = np.zeros(2 * m + 2 * n)
    kw = {}
    if C is not None:
        Aeq = np.zeros((1, N))
        Aeq[0, n:n + q] = C
        kw = {"A": matrix(Aeq), "b": matrix(np.zeros(1))}
    # the tightest tolerances at which cvxopt reports 'optimal' (it stalls below its attainable accuracy)
    for tol in (1e-12, 1e-11, 1e-10, 1e-9, 1e-8):
        solvers.options.update({"show_progress": False, "abstol": tol, "reltol": tol, "feastol": tol, "maxiters": 300})
        sol = solvers.qp(matrix(P), matrix(c), matrix(G), matrix(h), kktsolver="ldl", **kw)
        if sol["status"] == "optimal":
            break
    z = np.array(sol["x"]).ravel()
    t, theta, o = z[:n], z[n:n + q], z[n + q:2 * n + q]
    s = A @ theta
    r = y - t - s - o
    obj = 0.5 * np.sum(w * r ** 2) + lam * np.sum(np.abs(D @ t)) + rho * np.sum(np.abs(o))
    return {"status": sol["status"], "tolerance": tol, "gap": sol["gap"], "relative_gap": sol["relative gap"], "objective": obj,
            "trend": t.tolist(), "season": s.tolist(), "spikes": o.tolist()}


def case(name, seed, n_grid, drop, period, k, lam, rho, weighted, step=1.0, x0=1.0):
    rs = np.random.RandomState(seed)
    g_all = np.arange(n_grid)
    keep = np.ones(n_grid, bool)
    keep[rs.choice(np.arange(2, n_grid - 2), drop, replace=False)] = False
    g = g_all[keep]
    x = x0 + step * g
    n = len(x)
    tt = g / n_grid
    trend = 10 + 4 * tt + 6 * np.maximum(tt - 0.55, 0) + (2.5 if k == 1 else 0) * (tt > 0.3)
    if float(period).is_integer():
        pattern = rs.normal(0, 1.5, int(period))
        pattern -= pattern.mean()
        season = pattern[g % int(period)]
    else:
        season = 1.8 * np.sin(2 * np.pi * g / period) + 0.7 * np.cos(4 * np.pi * g / period)
    y = trend + season + rs.normal(0, 0.4, n)
    spike_at = rs.choice(np.arange(3, n - 3), 2, replace=False)
    y[spike_at] += np.array([5.0, -4.0])
    w = rs.uniform(0.5, 2.0, n) if weighted else np.ones(n)
    out = solve(x, y, w, k, lam, rho, period, step)
    return {"name": name, "x": x.tolist(), "y": y.tolist(), "w": w.tolist(), "weighted": weighted, "order": k, "penalty": lam,
            "spikePenalty": rho, "period": period, **out}


cases = [
    case("period-4-order-1-gaps", 11, 64, 4, 4, 1, 2.0, 1.2, False),
    case("period-7-order-2-weighted-spacing-0.5", 12, 70, 5, 7, 2, 0.5, 1.0, True, step=0.5, x0=3.0),
    case("period-12.5-fourier-order-1", 13, 76, 3, 12.5, 1, 1.5, 1.5, False),
    case("period-6-order-0-weighted", 14, 60, 4, 6, 0, 1.0, 1.2, True),
]
out = {"source": "cvxopt.solvers.qp (Debian python3-cvxopt)", "version": cvxopt.__version__, "numpy": np.__version__,
       "note": __doc__.strip(), "cases": cases}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures", "decompose_cvxopt.json"), "w") as f:
    json.dump(out, f)
for c in cases:
    print(c["name"], c["status"], c["tolerance"], c["relative_gap"], c["objective"])
