import { fitSpline, evaluateSpline } from '../../../src/engine/smoothers/spline';
import { prepareSeries, seriesFromArrays } from '../../../src/engine/series';
import { reinschSystem, reinschSolve } from '../../../src/engine/smoothers/spline/reinsch';
import { loadFixture, maxAbsDiff, range } from '../../helpers/fixtures';
import { mulberry32 as seeded } from '../../helpers/random';

function noisySine(n: number, seed = 7) {
  const r = seeded(seed);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = i + 0.5 * r();
  for (let i = 0; i < n; i++) y[i] = Math.sin(x[i] / 10) + 0.3 * (r() - 0.5);
  return { x, y };
}

describe('fitSpline against SciPy make_smoothing_spline (Debian python3-scipy)', () => {
  const fx = loadFixture('spline_scipy');
  for (const c of fx.cases) {
    // close-x is checked against the exact solve below: SciPy itself is inaccurate there.
    if (c.name === 'close-x') continue;
    test(`${c.name}: fitted values at fixed lambda agree to 1e-7 of range(y)`, () => {
      const s = prepareSeries(c.y, c.x, c.w);
      for (const f of c.fits) {
        const r = fitSpline(s, { penalty: f.lam });
        // Both solve the same criterion exactly; the difference is rounding in two
        // different banded formulations (B-spline normal equations vs Reinsch).
        expect(maxAbsDiff(r.fitted, f.fitted) / range(c.y)).toBeLessThan(1e-7);
      }
    });
    if (c.gcv) {
      test(`${c.name}: the GCV choice matches SciPy's`, () => {
        const s = prepareSeries(c.y, c.x, c.w);
        const r = fitSpline(s, { select: 'gcv' });
        // SciPy stops its bounded Brent search at xatol 1e-5 in lambda itself; ours stops
        // at 1e-3 in log10(lambda). The GCV curve is flat at its minimum, so lambdas agree to
        // about 1%, and our GCV score may not be worse than SciPy's.
        expect(Math.abs(Math.log(r.penalty / c.gcv.lam))).toBeLessThan(0.02);
        const atScipy = fitSpline(s, { penalty: c.gcv.lam, select: undefined });
        const n = s.n;
        const gcvOf = (fit: typeof r) => {
          let rss = 0;
          for (let i = 0; i < n; i++) rss += (s.y[i] - fit.fitted[i]) ** 2;
          return (n * rss) / (n - fit.df) ** 2;
        };
        expect(gcvOf(r)).toBeLessThanOrEqual(gcvOf(atScipy) * (1 + 1e-9));
        expect(r.criterion.value).toBeCloseTo(gcvOf(r), 10);
        expect(maxAbsDiff(atScipy.fitted, c.gcv.fitted) / range(c.y)).toBeLessThan(1e-7);
      });
    }
  }
});

describe('fitSpline against R smooth.spline(all.knots = TRUE) at matched df (Debian r-base-core)', () => {
  const fx = loadFixture('spline_r');
  for (const c of fx.cases) {
    test(`${c.name}: agreement near 1e-3 of range(y)`, () => {
      const s = prepareSeries(c.y, c.x);
      for (const f of c.fits) {
        expect(Array.from(s.x)).toEqual(f.unique_x);
        const r = fitSpline(s, { df: f.df });
        expect(r.df).toBeCloseTo(f.df, 6);
        // R's penalty routine uses 0.3330 for 1/3, so R minimises a slightly different
        // criterion; at matched df the fits differ by about 1e-3 of the range of y.
        expect(maxAbsDiff(r.fitted, f.fitted) / range(c.y)).toBeLessThan(3e-3);
      }
    });
  }
});

describe('fitSpline against a 50-digit decimal solve of the same system', () => {
  const fx = loadFixture('spline_exact');
  test('fitted values agree to 1e-10 of range(y) at every lambda', () => {
    const s = prepareSeries(fx.y, fx.x, fx.w);
    for (const f of fx.fits) {
      const r = fitSpline(s, { penalty: f.lam });
      expect(maxAbsDiff(r.fitted, f.fitted) / range(fx.y)).toBeLessThan(1e-10);
    }
  });
});

describe('fitSpline on x values 1e-6 apart (seeded synthetic close-x case)', () => {
  const fx = loadFixture('spline_exact').close_x;
  test('agrees with the 50-digit solve to 1e-10, where SciPy is off by up to 6% of range(y)', () => {
    const s = prepareSeries(fx.y, fx.x);
    for (const f of fx.fits) {
      const r = fitSpline(s, { penalty: f.lam });
      expect(maxAbsDiff(r.fitted, f.fitted) / range(fx.y)).toBeLessThan(1e-10);
      // SciPy 1.10 solves the B-spline normal equations, whose conditioning collapses
      // when knots are 1e-6 apart: its error here is its own, recorded in the fixture.
      expect(maxAbsDiff(f.scipy_fitted, f.fitted) / range(fx.y)).toBeGreaterThan(1e-6);
    }
  });
});

describe('fitSpline optimality and exact properties', () => {
  test('the solution satisfies the normal equations W(y - g) = lambda Q gamma and Q\'g = R gamma', () => {
    const { x, y } = noisySine(300);
    const w = Float64Array.from(x, (_, i) => 0.5 + (i % 3));
    const lambda = 20;
    const r = fitSpline(seriesFromArrays(x, y, w), { penalty: lambda });
    const gamma = (r.model as { gamma: Float64Array }).gamma;
    const n = x.length;
    const h = (i: number) => x[i + 1] - x[i];
    let worstA = 0, worstB = 0, scaleA = 0;
    for (let i = 0; i < n; i++) {
      // (Q gamma)_i over interior columns j = 1..n-2
      let qg = 0;
      if (i >= 1 && i <= n - 2) qg += (-1 / h(i - 1) - 1 / h(i)) * gamma[i];
      if (i + 1 <= n - 2) qg += gamma[i + 1] / h(i);
      if (i - 1 >= 1) qg += gamma[i - 1] / h(i - 1);
      const lhs = w[i] * (y[i] - r.fitted[i]);
      worstA = Math.max(worstA, Math.abs(lhs - lambda * qg));
      scaleA = Math.max(scaleA, Math.abs(lhs));
    }
    for (let j = 1; j <= n - 2; j++) {
      const qtg = (r.fitted[j - 1] - r.fitted[j]) / h(j - 1) + (r.fitted[j + 1] - r.fitted[j]) / h(j);
      const rg = (h(j - 1) * gamma[j - 1]) / 6 + ((h(j - 1) + h(j)) * gamma[j]) / 3 + (h(j) * gamma[j + 1]) / 6;
      worstB = Math.max(worstB, Math.abs(qtg - rg));
    }
    expect(worstA / scaleA).toBeLessThan(1e-9);
    expect(worstB).toBeLessThan(1e-9);
  });

  test('data on a straight line come back unchanged for every lambda', () => {
    const { x } = noisySine(100);
    const y = Float64Array.from(x, (v) => 3 - 0.25 * v);
    for (const lambda of [0, 1e-3, 1, 1e3, 1e9]) {
      const r = fitSpline(seriesFromArrays(x, y), { penalty: lambda });
      expect(maxAbsDiff(r.fitted, y) / range(y)).toBeLessThan(1e-10);
    }
  });

  test('lambda 0 is the interpolating spline, the limit of the general solve as lambda -> 0', () => {
    // lambda = 0 takes its own tridiagonal path; compare its curve between the knots
    // (which depends on its second derivatives) with the general solver at a tiny lambda.
    const { x, y } = noisySine(80);
    const s = seriesFromArrays(x, y);
    const exact = fitSpline(s, { penalty: 0 });
    const near = fitSpline(s, { penalty: 1e-9 });
    expect(maxAbsDiff(near.fitted, y) / range(y)).toBeLessThan(1e-6);
    expect(near.df).toBeGreaterThan(79.9);
    const mid = Float64Array.from({ length: 79 }, (_, i) => (x[i] + x[i + 1]) / 2);
    expect(maxAbsDiff(evaluateSpline(exact, mid).value, evaluateSpline(near, mid).value) / range(y)).toBeLessThan(1e-6);
  });

  test('a huge lambda gives the weighted least-squares line', () => {
    const { x, y } = noisySine(120);
    const w = Float64Array.from(x, (_, i) => 1 + (i % 4));
    const r = fitSpline(seriesFromArrays(x, y, w), { penalty: 1e16 });
    let sw = 0, sx = 0, sy = 0;
    for (let i = 0; i < x.length; i++) { sw += w[i]; sx += w[i] * x[i]; sy += w[i] * y[i]; }
    const mx = sx / sw, my = sy / sw;
    let sxx = 0, sxy = 0;
    for (let i = 0; i < x.length; i++) { sxx += w[i] * (x[i] - mx) ** 2; sxy += w[i] * (x[i] - mx) * (y[i] - my); }
    const line = Float64Array.from(x, (v) => my + (sxy / sxx) * (v - mx));
    expect(maxAbsDiff(r.fitted, line) / range(y)).toBeLessThan(1e-6);
    expect(r.df).toBeCloseTo(2, 5);
  });

  test('df falls monotonically as lambda grows', () => {
    const { x, y } = noisySine(200);
    const s = seriesFromArrays(x, y);
    let prev = Infinity;
    for (let e = -6; e <= 8; e += 0.5) {
      const r = fitSpline(s, { penalty: Math.pow(10, e) });
      expect(r.df).toBeLessThan(prev);
      prev = r.df;
    }
  });

  test('merging ties gives the same fit as the weighted unique points', () => {
    const xs = [1, 2, 2, 3, 4, 4, 4, 5, 6, 7];
    const ys = [1, 2, 4, 3, 5, 6, 4, 7, 6, 8];
    const merged = prepareSeries(ys, xs);
    const unique = seriesFromArrays([1, 2, 3, 4, 5, 6, 7], [1, 3, 3, 5, 7, 6, 8], [1, 2, 1, 3, 1, 1, 1]);
    const a = fitSpline(merged, { penalty: 0.7 });
    const b = fitSpline(unique, { penalty: 0.7 });
    expect(maxAbsDiff(a.fitted, b.fitted)).toBeLessThan(1e-12);
  });

  test('each hat-matrix diagonal entry equals the smoother applied to that unit vector', () => {
    const { x, y } = noisySine(40);
    const w = Float64Array.from(x, (_, i) => 1 + (i % 2));
    const sys = reinschSystem(x, y, w);
    const lambda = 5;
    const lev = reinschSolve(sys, lambda, true).leverage!;
    for (let j = 0; j < 40; j += 7) {
      const e = new Float64Array(40); e[j] = 1;
      const col = reinschSolve(reinschSystem(x, e, w), lambda, false).g;
      expect(col[j]).toBeCloseTo(lev[j], 12);
    }
  });

  test('results do not depend on the units of x once lambda is converted (lambda * c^3)', () => {
    const { x, y } = noisySine(500);
    // scale only (x in [0, 5e-3]) and shift only (serial dates near 45,000): either change
    // of units is exact to rounding of x itself, so the fits agree to rounding.
    for (const [c, shift] of [[1e-5, 0], [1, 45000]]) {
      const x2 = Float64Array.from(x, (v) => shift + c * v);
      const a = fitSpline(seriesFromArrays(x, y), { penalty: 30 });
      const b = fitSpline(seriesFromArrays(x2, y), { penalty: 30 * c * c * c });
      expect(maxAbsDiff(a.fitted, b.fitted) / range(y)).toBeLessThan(1e-9);
      const g1 = fitSpline(seriesFromArrays(x, y), { select: 'gcv' });
      const g2 = fitSpline(seriesFromArrays(x2, y), { select: 'gcv' });
      expect(g2.df).toBeCloseTo(g1.df, 4);
    }
  });

  test('a df target is met and reported', () => {
    const { x, y } = noisySine(300);
    const r = fitSpline(seriesFromArrays(x, y), { df: 7.5 });
    expect(r.df).toBeCloseTo(7.5, 6);
    expect(r.criterion.name).toBe('df');
  });

  test('a df target out of reach is clamped with a warning', () => {
    const { x, y } = noisySine(30);
    const r = fitSpline(seriesFromArrays(x, y), { df: 100 });
    expect(r.warnings.map((w) => w.code)).toContain('target-clamped');
    expect(r.df).toBeLessThanOrEqual(30);
  });

  test('k-fold CV picks a penalty inside the range and reports fold standard errors', () => {
    const { x, y } = noisySine(400);
    const r = fitSpline(seriesFromArrays(x, y), { select: 'cv', folds: 5 });
    expect(r.criterion.name).toBe('cv');
    expect(r.criterion.atEdge).toBe(false);
    const g = fitSpline(seriesFromArrays(x, y), { select: 'gcv' });
    // CV and GCV estimate the same prediction error; their choices are close (common practice).
    expect(r.df / g.df).toBeGreaterThan(0.6);
    expect(r.df / g.df).toBeLessThan(1.6);
    expect(r.criterion.curve!.every((p) => p.se !== undefined && p.se >= 0)).toBe(true);
    const one = fitSpline(seriesFromArrays(x, y), { select: 'cv', folds: 5, oneSE: true });
    expect(one.penalty).toBeGreaterThanOrEqual(r.penalty);
  });

  test('evaluation interpolates the fit at its knots and extends linearly with a flag beyond the data', () => {
    const { x, y } = noisySine(60);
    const r = fitSpline(seriesFromArrays(x, y), { penalty: 10 });
    const ev = evaluateSpline(r, x);
    expect(maxAbsDiff(ev.value, r.fitted)).toBeLessThan(1e-10);
    const lo = x[0], hi = x[59];
    const out = evaluateSpline(r, Float64Array.of(lo - 2, lo - 1, hi + 1, hi + 2, (lo + hi) / 2));
    expect(Array.from(out.extrapolated)).toEqual([1, 1, 1, 1, 0]);
    // straight line beyond the ends: equal steps
    expect(out.value[1] - out.value[0]).toBeCloseTo(r.fitted[0] - out.value[1], 8);
  });

  test('rejects options that do not apply, naming them', () => {
    const { x, y } = noisySine(30);
    expect(() => fitSpline(seriesFromArrays(x, y), { order: 2 })).toThrow(/order does not apply to the spline/);
    expect(() => fitSpline(seriesFromArrays(x, y), { penalty: -1 })).toThrow(/penalty must be a finite number >= 0; got -1/);
    expect(() => fitSpline(seriesFromArrays(x, y), { select: 'bic' })).toThrow(/select \(for the spline\) must be one of "gcv", "cv"; got "bic"/);
    expect(() => fitSpline(seriesFromArrays(x, y), { select: 'cv', folds: 1 })).toThrow(/folds must be a whole number from 2/);
  });
});

describe('fitSpline at large n', () => {
  test('the normal equations hold at n = 200,000 with serial-date x and uneven spacing', () => {
    const n = 200000;
    const r = seeded(99);
    const x = new Float64Array(n), y = new Float64Array(n);
    let t = 45000;
    for (let i = 0; i < n; i++) { t += 1e-3 * (0.01 + r()); x[i] = t; y[i] = Math.sin((t - 45000) * 30) + 0.2 * (r() - 0.5); }
    const lambda = 1e-9;
    const fit = fitSpline(seriesFromArrays(x, y), { penalty: lambda });
    const gamma = (fit.model as { gamma: Float64Array }).gamma;
    const h = (i: number) => x[i + 1] - x[i];
    // W(y - g) = lambda Q gamma, relative to the size of either side
    let worst = 0, scale = 0;
    for (let i = 0; i < n; i++) {
      const right = i < n - 1 ? (gamma[i + 1] - gamma[i]) / h(i) : 0;
      const left = i > 0 ? (gamma[i] - gamma[i - 1]) / h(i - 1) : 0;
      const lhs = y[i] - fit.fitted[i];
      worst = Math.max(worst, Math.abs(lhs - lambda * (right - left)));
      scale = Math.max(scale, Math.abs(lhs));
    }
    // Both sides are computed from rounded x differences (about 1e-11 relative at 45,000
    // with spacings near 1e-3), which bounds how closely they can agree.
    // measured 6e-10 on this data; the bound leaves room for other platforms' rounding
    expect(worst / scale).toBeLessThan(1e-8);
    expect(fit.df).toBeGreaterThan(2);
    expect(fit.df).toBeLessThan(n);
    expect(fit.fitted.every(Number.isFinite)).toBe(true);
  });
});
