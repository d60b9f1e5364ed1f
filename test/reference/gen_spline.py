"""Reference fixtures for the natural cubic smoothing spline.

Writes, under fixtures/:
  spline_scipy.json  SciPy make_smoothing_spline (Debian python3-scipy) fits at
                     fixed lambda and its GCV choice, same criterion and same
                     lambda units as Knotwise.
  spline_r.json      R smooth.spline(all.knots = TRUE) fits at a given df
                     (Debian r-base-core); R rounds 1/3 to 0.3330 in its penalty,
                     so agreement is expected near 1e-3 of the range of y only.
  spline_exact.json  the same banded Reinsch system solved in 50-digit decimal
                     arithmetic (Python's decimal module), for a 1e-10 check.

Data: R's datasets::cars and MASS::mcycle (both with tied x), exported by
Rscript at generation time; and seeded synthetic series (numpy default_rng)
described beside each case. Run with /usr/bin/python3 (see generate.sh).
"""
import io
import json
import subprocess
from decimal import Decimal, getcontext

import numpy as np
import scipy
from scipy.interpolate import make_smoothing_spline

HERE = __file__.rsplit('/', 1)[0] if '/' in __file__ else '.'


def r_version():
    out = subprocess.run(['Rscript', '-e', 'cat(R.version.string)'], capture_output=True, text=True, check=True)
    return out.stdout.strip()


def r_csv(expr):
    """Runs R code that prints a data frame as CSV; returns a dict of columns."""
    out = subprocess.run(['Rscript', '--vanilla', '-e', f'write.csv({expr}, stdout(), row.names = FALSE)'],
                         capture_output=True, text=True, check=True)
    data = np.genfromtxt(io.StringIO(out.stdout), delimiter=',', names=True)
    return {k: data[k].astype(float) for k in data.dtype.names}


def merge_ties(x, y, w):
    """Rows with equal x become one point: weights add, y is the weighted mean."""
    order = np.argsort(x, kind='stable')
    x, y, w = x[order], y[order], w[order]
    ux, inv = np.unique(x, return_inverse=True)
    sw = np.bincount(inv, weights=w)
    sy = np.bincount(inv, weights=w * y)
    return ux, sy / sw, sw


def lst(a):
    return [float(v) for v in np.asarray(a)]


def scipy_case(name, source, x, y, w, lams, gcv):
    ux, uy, uw = merge_ties(x, y, w)
    fits = []
    for lam in lams:
        spl = make_smoothing_spline(ux, uy, w=uw, lam=lam)
        fits.append({'lam': float(lam), 'fitted': lst(spl(ux))})
    case = {'name': name, 'source': source, 'x': lst(x), 'y': lst(y), 'w': lst(w),
            'unique_x': lst(ux), 'fits': fits}
    if gcv:
        # SciPy's GCV uses unweighted residuals, so it is compared on unit weights only.
        assert np.all(uw == 1.0)
        spl = make_smoothing_spline(ux, uy)
        # scipy 1.10 does not return the lambda it chose, so gcv_lambda reruns its search
        case['gcv'] = {'fitted': lst(spl(ux)), 'note': 'scipy minimises GCV over lam in (0, n) with bounded Brent (xatol 1e-5)'}
        case['gcv']['lam'] = float(gcv_lambda(ux, uy))
    return case


def gcv_lambda(x, y):
    """SciPy 1.10's own GCV lambda, by repeating the steps of make_smoothing_spline."""
    from scipy.interpolate import _bsplines as B
    n = x.shape[0]
    w = np.ones(n)
    t = np.r_[[x[0]] * 3, x, [x[-1]] * 3]
    X_bspl = B.BSpline.design_matrix(x, t, 3)
    X = np.zeros((5, n))
    for i in range(1, 4):
        X[i, 2: -2] = X_bspl[i: i - 4, 3: -3][np.diag_indices(n - 4)]
    X[1, 1] = X_bspl[0, 0]
    X[2, :2] = ((x[2] + x[1] - 2 * x[0]) * X_bspl[0, 0], X_bspl[1, 1] + X_bspl[1, 2])
    X[3, :2] = ((x[2] - x[0]) * X_bspl[1, 1], X_bspl[2, 2])
    X[1, -2:] = (X_bspl[-3, -3], (x[-1] - x[-3]) * X_bspl[-2, -2])
    X[2, -2:] = (X_bspl[-2, -3] + X_bspl[-2, -2], (2 * x[-1] - x[-2] - x[-3]) * X_bspl[-1, -1])
    X[3, -2] = X_bspl[-1, -1]
    wE = np.zeros((5, n))
    wE[2:, 0] = B._coeff_of_divided_diff(x[:3]) / w[:3]
    wE[1:, 1] = B._coeff_of_divided_diff(x[:4]) / w[:4]
    for j in range(2, n - 2):
        wE[:, j] = (x[j + 2] - x[j - 2]) * B._coeff_of_divided_diff(x[j - 2:j + 3]) / w[j - 2: j + 3]
    wE[:-1, -2] = -B._coeff_of_divided_diff(x[-4:]) / w[-4:]
    wE[:-2, -1] = B._coeff_of_divided_diff(x[-3:]) / w[-3:]
    wE *= 6
    return B._compute_optimal_gcv_parameter(X, wE, y, w)


def exact_reinsch(x, y, w, lam, prec=50):
    """Solves (R + lam Q'W^-1 Q) gamma = Q'y, g = y - lam W^-1 Q gamma in decimal arithmetic."""
    getcontext().prec = prec
    X = [Decimal(repr(float(v))) for v in x]
    Y = [Decimal(repr(float(v))) for v in y]
    W = [Decimal(repr(float(v))) for v in w]
    L = Decimal(repr(float(lam)))
    n = len(X)
    m = n - 2
    h = [X[i + 1] - X[i] for i in range(n - 1)]
    qa = [1 / h[c] for c in range(m)]
    qc = [1 / h[c + 1] for c in range(m)]
    qb = [-qa[c] - qc[c] for c in range(m)]
    # dense-free pentadiagonal A stored by bands
    a0 = [(h[c] + h[c + 1]) / 3 + L * (qa[c] ** 2 / W[c] + qb[c] ** 2 / W[c + 1] + qc[c] ** 2 / W[c + 2]) for c in range(m)]
    a1 = [Decimal(0)] + [h[c] / 6 + L * (qb[c - 1] * qa[c] / W[c] + qc[c - 1] * qb[c] / W[c + 1]) for c in range(1, m)]
    a2 = [Decimal(0), Decimal(0)] + [L * qc[c - 2] * qa[c] / W[c] for c in range(2, m)]
    rhs = [qa[c] * Y[c] + qb[c] * Y[c + 1] + qc[c] * Y[c + 2] for c in range(m)]
    d = [Decimal(0)] * m
    l1 = [Decimal(0)] * m
    l2 = [Decimal(0)] * m
    for i in range(m):
        if i >= 2:
            l2[i] = a2[i] / d[i - 2]
        if i >= 1:
            l1[i] = (a1[i] - (l2[i] * l1[i - 1] * d[i - 2] if i >= 2 else 0)) / d[i - 1]
        d[i] = a0[i] - (l1[i] ** 2 * d[i - 1] if i >= 1 else 0) - (l2[i] ** 2 * d[i - 2] if i >= 2 else 0)
    z = [Decimal(0)] * m
    for i in range(m):
        z[i] = rhs[i] - (l1[i] * z[i - 1] if i >= 1 else 0) - (l2[i] * z[i - 2] if i >= 2 else 0)
    z = [z[i] / d[i] for i in range(m)]
    for i in range(m - 1, -1, -1):
        z[i] = z[i] - (l1[i + 1] * z[i + 1] if i + 1 < m else 0) - (l2[i + 2] * z[i + 2] if i + 2 < m else 0)
    g = []
    for i in range(n):
        qg = Decimal(0)
        if i < m:
            qg += qa[i] * z[i]
        if 0 <= i - 1 < m:
            qg += qb[i - 1] * z[i - 1]
        if 0 <= i - 2 < m:
            qg += qc[i - 2] * z[i - 2]
        g.append(Y[i] - L * qg / W[i])
    return [float(v) for v in g]


def r_smooth_spline(name, expr_x, expr_y, dfs, setup=''):
    code = f"""{setup}
x <- {expr_x}; y <- {expr_y}
for (d in c({','.join(repr(v) for v in dfs)})) {{
  f <- smooth.spline(x, y, df = d, all.knots = TRUE, control.spar = list(tol = 1e-12, eps = 1e-15, maxit = 2000))
  cat(sprintf('%.17g', d), sprintf('%.17g', f$df), sprintf('%.17g', f$lambda), paste(sprintf('%.17g', f$x), collapse=' '), paste(sprintf('%.17g', f$y), collapse=' '), sep='|')
  cat('\\n')
}}"""
    out = subprocess.run(['Rscript', '--vanilla', '-e', code], capture_output=True, text=True, check=True)
    fits = []
    for line in out.stdout.strip().splitlines():
        d, df, lam, xs, ys = line.split('|')
        fits.append({'df_requested': float(d), 'df': float(df), 'lambda_r': float(lam),
                     'unique_x': [float(v) for v in xs.split()], 'fitted': [float(v) for v in ys.split()]})
    return fits


def main():
    rv = r_version()
    rng = np.random.default_rng(20261201)
    cars = r_csv('datasets::cars')
    mcycle = r_csv('MASS::mcycle')
    cases = []
    ones = lambda a: np.ones(len(a))  # noqa: E731

    x, y = cars['speed'], cars['dist']
    rng3 = (x.max() - x.min()) ** 3
    cases.append(scipy_case('cars', f'R datasets::cars ({rv}): speed (x, tied) vs dist', x, y, ones(x),
                            [rng3 * v for v in (1e-5, 1e-3, 1e-1)], False))
    x, y = mcycle['times'], mcycle['accel']
    rng3 = (x.max() - x.min()) ** 3
    cases.append(scipy_case('mcycle', f'R MASS::mcycle ({rv}): times (x, tied) vs accel', x, y, ones(x),
                            [rng3 * v for v in (1e-7, 1e-5, 1e-3)], False))

    # Seeded synthetic: 200 points uniform on [0, 1] plus clusters 1e-6 apart, sine plus noise.
    base = np.sort(rng.uniform(0, 1, 200))
    close = np.concatenate([c + 1e-6 * np.arange(4) for c in (0.25, 0.5, 0.75)])
    x = np.sort(np.concatenate([base, close]))
    y = np.sin(2 * np.pi * x) + 0.2 * rng.standard_normal(len(x))
    # SciPy's own GCV search fails here ("ill-posed": its B-spline normal equations lose
    # positive definiteness at 1e-6 spacing), so this case checks fixed lambda only.
    cases.append(scipy_case('close-x', 'seeded synthetic (numpy default_rng 20261201): 212 points, clusters spaced 1e-6', x, y, ones(x),
                            [1e-6, 1e-4, 1e-2], False))
    x = np.sort(rng.uniform(0, 1, 120))
    y = np.sin(2 * np.pi * x) + 0.2 * rng.standard_normal(len(x))
    cases.append(scipy_case('uniform-gcv', 'seeded synthetic: 120 points uniform on [0, 1], sine plus N(0, 0.2^2) noise', x, y, ones(x),
                            [1e-4], True))

    # Weekly dates as worksheet serial numbers around 45,000, with weights.
    x = 45000 + 7.0 * np.arange(260)
    y = 100 + 10 * np.sin(x / 200) + rng.standard_normal(len(x)) * 3
    w = rng.uniform(0.5, 2.0, len(x))
    cases.append(scipy_case('dates-weighted', 'seeded synthetic: 260 weekly serial dates from 45000, uniform(0.5, 2) weights', x, y, w,
                            [1e3, 1e6, 1e9], False))
    # SciPy searches its GCV lambda on (0, n) in linear steps, so its GCV is compared only
    # where the optimum lies well inside that interval (x on [0, 1]).
    x = np.sort(rng.uniform(0, 1, 300))
    y = np.where(x < 0.5, 4 * x, 2.0) + 0.3 * rng.standard_normal(len(x))
    cases.append(scipy_case('ramp-gcv', 'seeded synthetic: 300 points uniform on [0, 1], ramp to a plateau plus N(0, 0.3^2) noise', x, y, ones(x),
                            [1e-3], True))

    # Tiny x range.
    x = np.sort(rng.uniform(0, 1e-3, 150))
    y = np.cos(4000 * x) + 0.1 * rng.standard_normal(len(x))
    cases.append(scipy_case('tiny-x', 'seeded synthetic: 150 points uniform on [0, 1e-3]', x, y, ones(x), [1e-12, 1e-10, 1e-8], False))

    meta = {'generator': 'test/reference/gen_spline.py', 'scipy': scipy.__version__, 'numpy': np.__version__,
            'function': 'scipy.interpolate.make_smoothing_spline(x, y, w, lam)',
            'criterion': 'sum w_i (y_i - f(x_i))^2 + lam * integral f\'\'^2, lam in x units'}
    with open(f'{HERE}/fixtures/spline_scipy.json', 'w') as f:
        json.dump({**meta, 'cases': cases}, f)

    rcases = [
        {'name': 'cars', 'source': f'R datasets::cars ({rv})', 'x': lst(cars['speed']), 'y': lst(cars['dist']),
         'fits': r_smooth_spline('cars', 'cars$speed', 'cars$dist', [3, 5, 8])},
        {'name': 'mcycle', 'source': f'R MASS::mcycle ({rv})', 'x': lst(mcycle['times']), 'y': lst(mcycle['accel']),
         'fits': r_smooth_spline('mcycle', 'mcycle$times', 'mcycle$accel', [6, 12, 20], setup='library(MASS)')},
    ]
    with open(f'{HERE}/fixtures/spline_r.json', 'w') as f:
        json.dump({'generator': 'test/reference/gen_spline.py', 'R': rv,
                   'function': 'smooth.spline(x, y, df = d, all.knots = TRUE, control.spar = list(tol = 1e-12, eps = 1e-15, maxit = 2000))',
                   'note': 'R uses 0.3330 for 1/3 in its penalty and lambda for x scaled to [0, 1]: compare at matched df, near 1e-3 of range(y)',
                   'cases': rcases}, f)

    # Exact: 300 points, unequal spacing, random weights, solved at 50 digits.
    x = np.sort(rng.uniform(0, 10, 300))
    y = np.exp(-x / 3) * np.sin(3 * x) + 0.05 * rng.standard_normal(300)
    w = rng.uniform(0.2, 5, 300)
    ex = []
    for lam in (1e-4, 1e-2, 1.0):
        ex.append({'lam': lam, 'fitted': exact_reinsch(x, y, w, lam)})
    # The close-x case above, solved exactly too: it tells whether a disagreement with
    # SciPy there is SciPy's rounding or ours.
    cx = next(c for c in cases if c['name'] == 'close-x')
    cxx, cxy = np.array(cx['unique_x']), np.array(cx['y'])
    close = [{'lam': f['lam'], 'fitted': exact_reinsch(cxx, cxy, np.ones(len(cxx)), f['lam']),
              'scipy_fitted': f['fitted']} for f in cx['fits']]
    with open(f'{HERE}/fixtures/spline_exact.json', 'w') as f:
        json.dump({'generator': 'test/reference/gen_spline.py', 'source': 'seeded synthetic (numpy default_rng 20261201), 300 points on [0, 10], uniform(0.2, 5) weights',
                   'method': 'Reinsch banded system solved with Python decimal at 50 significant digits', 'python_decimal_prec': 50,
                   'x': lst(x), 'y': lst(y), 'w': lst(w), 'fits': ex,
                   'close_x': {'source': cx['source'], 'x': lst(cxx), 'y': lst(cxy), 'fits': close}}, f)


if __name__ == '__main__':
    main()
