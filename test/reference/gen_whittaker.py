"""Reference fixtures for Whittaker-Henderson graduation / the Hodrick-Prescott filter.

Writes fixtures/whittaker_hp.json:
  hp      statsmodels.tsa.filters.hp_filter.hpfilter (Debian python3-statsmodels)
          on statsmodels' bundled macrodata (statsmodels.datasets.macrodata:
          quarterly US series 1959Q1-2009Q3, columns realgdp and unemp), at the
          three preset lambdas 6.25, 1600 and 129600. hpfilter solves
          (I + lambda K'K) trend = y with K the second-difference matrix, the same
          system as order-2 graduation on x = 1..n with unit weights.
          Beside each, the same banded system solved in 60-digit arithmetic
          (mpmath, Debian python3-mpmath) by banded Gaussian elimination.
  uneven  seeded unequally spaced, weighted series (numpy default_rng(2024)),
          orders 2 and 3: the divided-difference system (W + lambda D'D) z = W y
          built and solved in 60-digit arithmetic from the exact binary values
          of x, y, w (D(x, d) by the recursion of Tibshirani 2014, section 6), and
          the exact trace of the hat matrix from a 60-digit dense inverse.
Run with /usr/bin/python3 (see generate.sh).
"""
import json

import mpmath
import numpy as np
import statsmodels
import statsmodels.api as sm
from statsmodels.tsa.filters.hp_filter import hpfilter

HERE = __file__.rsplit('/', 1)[0] if '/' in __file__ else '.'
mpmath.mp.dps = 60


def diff_rows(x, d):
    """Rows of D(x, d) (each d + 1 entries, columns r..r+d) in mpmath, by the
    recursion D(j+1) = D(1) diag(j / (x_{i+j} - x_i)) D(j)."""
    n = len(x)
    cur = [[mpmath.mpf(-1), mpmath.mpf(1)] for _ in range(n - 1)]
    for j in range(1, d):
        nxt = []
        for r in range(n - j - 1):
            s0 = mpmath.mpf(j) / (x[r + j] - x[r])
            s1 = mpmath.mpf(j) / (x[r + 1 + j] - x[r + 1])
            row = [mpmath.mpf(0)] * (j + 2)
            for c in range(j + 1):
                row[c] -= s0 * cur[r][c]
                row[c + 1] += s1 * cur[r + 1][c]
            nxt.append(row)
        cur = nxt
    return cur


def system(x, y, w, lam, d):
    n = len(x)
    A = {}
    for i in range(n):
        A[(i, i)] = w[i]
    rows = diff_rows(x, d)
    for r, row in enumerate(rows):
        for a in range(d + 1):
            for b in range(d + 1):
                A[(r + a, r + b)] = A.get((r + a, r + b), mpmath.mpf(0)) + lam * row[a] * row[b]
    rhs = [w[i] * y[i] for i in range(n)]
    return A, rhs


def band_solve(A, rhs, n, p):
    """Gaussian elimination without pivoting on an SPD band matrix (exact arithmetic
    up to 60 digits); O(n p^2)."""
    M = {k: v for k, v in A.items()}
    b = list(rhs)
    for k in range(n):
        piv = M[(k, k)]
        for i in range(k + 1, min(n, k + p + 1)):
            f = M.get((i, k), 0) / piv
            if f == 0:
                continue
            for j in range(k, min(n, k + p + 1)):
                M[(i, j)] = M.get((i, j), 0) - f * M.get((k, j), 0)
            b[i] -= f * b[k]
    z = [mpmath.mpf(0)] * n
    for i in range(n - 1, -1, -1):
        s = b[i]
        for j in range(i + 1, min(n, i + p + 1)):
            s -= M.get((i, j), 0) * z[j]
        z[i] = s / M[(i, i)]
    return z


def exact_fit(x, y, w, lam, d):
    xm = [mpmath.mpf(float(v)) for v in x]
    ym = [mpmath.mpf(float(v)) for v in y]
    wm = [mpmath.mpf(float(v)) for v in w]
    A, rhs = system(xm, ym, wm, mpmath.mpf(float(lam)), d)
    return A, band_solve(A, rhs, len(x), d)


def main():
    data = sm.datasets.macrodata.load_pandas().data
    hp = []
    for col in ['realgdp', 'unemp']:
        y = data[col].to_numpy(dtype=float)
        n = len(y)
        x = np.arange(1, n + 1, dtype=float)
        for lam in [6.25, 1600.0, 129600.0]:
            cycle, trend = hpfilter(y, lamb=lam)
            _, z = exact_fit(x, y, np.ones(n), lam, 2)
            hp.append({
                'series': col, 'lambda': lam, 'y': y.tolist(),
                'trend_statsmodels': np.asarray(trend, dtype=float).tolist(),
                'trend_exact': [float(v) for v in z],
            })
    rng = np.random.default_rng(2024)
    uneven = []
    for d, lam, n in [(2, 40.0, 120), (3, 200.0, 80)]:
        x = np.cumsum(0.2 + 2.0 * rng.random(n))
        y = np.sin(x / 6.0) + 0.05 * x + 0.3 * rng.standard_normal(n)
        w = 0.5 + rng.random(n)
        A, z = exact_fit(x, y, w, lam, d)
        # exact trace of the hat matrix: sum_i w_i (A^{-1})_ii from a dense 60-digit inverse
        Ad = mpmath.matrix(n, n)
        for (i, j), v in A.items():
            Ad[i, j] = v
        inv = Ad ** -1
        df = sum(mpmath.mpf(float(w[i])) * inv[i, i] for i in range(n))
        uneven.append({'order': d, 'lambda': lam, 'x': x.tolist(), 'y': y.tolist(), 'w': w.tolist(),
                       'fitted_exact': [float(v) for v in z], 'df_exact': float(df)})
    out = {
        'source': 'statsmodels hpfilter on statsmodels.datasets.macrodata; 60-digit mpmath solves of the same banded systems',
        'versions': {'statsmodels': statsmodels.__version__, 'numpy': np.__version__, 'mpmath': mpmath.__version__},
        'parameters': {'hp_lambdas': [6.25, 1600.0, 129600.0], 'hp_columns': ['realgdp', 'unemp'], 'mp_dps': 60,
                       'uneven_seed': 2024},
        'hp': hp,
        'uneven': uneven,
    }
    with open(f'{HERE}/fixtures/whittaker_hp.json', 'w') as f:
        json.dump(out, f)


if __name__ == '__main__':
    main()
