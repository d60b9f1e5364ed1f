"""Reference solutions of weighted trend filtering on unequally spaced x.

Solves the dual of
    minimise 1/2 sum_i w_i (y_i - b_i)^2 + lam * ||D(x, k+1) b||_1
    (R. J. Tibshirani, Ann. Statist. 42 (2014), section 6; S.-J. Kim et al., SIAM Review 51 (2009)),
namely the box-constrained least-squares problem
    minimise 1/2 || W^{-1/2} D^T u - W^{1/2} y ||^2  subject to  -lam <= u <= lam,
with scipy.optimize.lsq_linear (method 'bvls', an exact active-set method), and
recovers b = y - W^{-1} D^T u. D is built here independently of the engine,
from the divided-difference formula
    (D(x, k+1) b)_r = k! (x_{r+k+1} - x_r) [x_r, ..., x_{r+k+1}] b,
    [z_0..z_q] f = sum_j f(z_j) / prod_{l != j} (z_j - z_l).
Knots: rows with |u_r| = lam (to 1e-9 relative) and |(D b)_r| > 1e-7 max |D b|.
Run with Debian's /usr/bin/python3 (SciPy 1.10). Writes fixtures/trend_dual_scipy.json.
"""
import json
import math
import numpy as np
import scipy
from scipy.optimize import lsq_linear


def difference_matrix(x, q):
    n = len(x)
    k = q - 1
    D = np.zeros((n - q, n))
    for r in range(n - q):
        z = x[r:r + q + 1]
        for j in range(q + 1):
            den = 1.0
            for l in range(q + 1):
                if l != j:
                    den *= z[j] - z[l]
            D[r, r + j] = math.factorial(k) * (z[-1] - z[0]) / den
    return D


def solve(x, y, w, k, lam):
    D = difference_matrix(x, k + 1)
    A = (D / np.sqrt(w)[None, :]).T  # W^{-1/2} D^T, n x m
    rhs = np.sqrt(w) * y
    res = lsq_linear(A, rhs, bounds=(-lam, lam), method='bvls', tol=1e-15, max_iter=100000)
    u = res.x
    b = y - (D.T @ u) / w
    db = D @ b
    dmax = np.max(np.abs(db)) if len(db) else 0.0
    knots = [int(r) for r in range(len(u)) if abs(abs(u[r]) - lam) <= 1e-9 * lam and abs(db[r]) > 1e-7 * dmax]
    obj = 0.5 * np.sum(w * (y - b) ** 2) + lam * np.sum(np.abs(db))
    dual = float(y @ (D.T @ u) - 0.5 * np.sum((D.T @ u) ** 2 / w))
    return b, u, knots, float(obj), float(obj - dual), res.status


def lambda_max(x, y, w, k):
    D = difference_matrix(x, k + 1)
    Q = D @ np.diag(1.0 / w) @ D.T
    u = np.linalg.solve(Q, D @ y)
    return float(np.max(np.abs(u)))


def signal(t, kind):
    if kind == 'steps':
        return np.where(t < 0.3, 0.0, np.where(t < 0.7, 2.0, 0.5))
    if kind == 'kinks':
        return np.where(t < 0.4, 2 * t, np.where(t < 0.75, 0.8 - 1.5 * (t - 0.4), 0.275 + 3 * (t - 0.75)))
    return np.sin(6 * t) + 0.5 * t * t


rng = np.random.default_rng(20261201)
cases = []
specs = [
    (30, 0, 'steps', False, [0.05, 0.3]),
    (60, 0, 'steps', True, [0.02, 0.2]),
    (40, 1, 'kinks', False, [0.01, 0.1]),
    (80, 1, 'kinks', True, [0.003, 0.05]),
    (50, 2, 'smooth', False, [0.001, 0.05]),
    (70, 2, 'smooth', True, [0.0005, 0.02]),
    (40, 3, 'smooth', True, [0.001, 0.05]),
]
for n, k, kind, weighted, fracs in specs:
    gaps = rng.uniform(0.3, 1.7, n)
    x = np.cumsum(gaps)
    x = 10.0 + 3.0 * x  # x in its own units, not starting at 0
    t = (x - x[0]) / (x[-1] - x[0])
    w = rng.uniform(0.5, 2.0, n) if weighted else np.ones(n)
    y = 100.0 + 20.0 * signal(t, kind) + rng.normal(0.0, 2.0, n) / np.sqrt(w)
    lmax = lambda_max(x, y, w, k)
    for f in fracs:
        lam = f * lmax
        b, u, knots, obj, gap, status = solve(x, y, w, k, lam)
        cases.append({
            'n': n, 'order': k, 'signal': kind, 'weighted': weighted, 'lambdaFraction': f,
            'lambda': lam, 'lambdaMax': lmax,
            'x': x.tolist(), 'y': y.tolist(), 'w': w.tolist(),
            'fitted': b.tolist(), 'dual': u.tolist(), 'knotRows': knots,
            'objective': obj, 'dualityGap': gap, 'lsqStatus': int(status),
        })

out = {
    'source': 'scipy.optimize.lsq_linear (bvls) on the trend-filtering dual; D from the divided-difference formula',
    'generator': 'test/reference/gen_trend.py',
    'scipy': scipy.__version__,
    'numpy': np.__version__,
    'seed': 20261201,
    'parameters': 'x = 10 + 3 * cumsum(U(0.3, 1.7)); y = 100 + 20 * signal + N(0, 2) / sqrt(w); lambda = fraction * lambda_max',
    'cases': cases,
}
with open('fixtures/trend_dual_scipy.json', 'w') as fh:
    json.dump(out, fh, indent=1)
print('wrote', len(cases), 'cases; max gap', max(c['dualityGap'] for c in cases), 'knots', [len(c['knotRows']) for c in cases])
