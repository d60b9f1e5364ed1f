/** Unit checks of the trend-filtering kernels against dense or closed-form answers. */
import { Matrix, solve } from 'ml-matrix';
import { restrictedSplineFit } from '../../../src/engine/basis/restrictedSplineFit';
import { interpolateTrend } from '../../../src/engine/smoothers/trend/interpolateTrend';
import { dualFromResidual, dualFromResidualByLevel, residualDual } from '../../../src/engine/linalg/dualFromResidual';
import { regressionSplineRefit, evaluateRegressionSpline } from '../../../src/engine/smoothers/trend/regressionSplineRefit';
import { differenceTranspose } from '../../../src/engine/linalg/difference';
import { seededNormal } from './trendTestFunctions';
import * as restrictedSplineFitModule from '../../../src/engine/basis/restrictedSplineFit';
import { polishTrend, joiningAtMost, JOINING_AT_LEAST, gapAgainstDual } from '../../../src/engine/smoothers/trend/polishTrend';
import { activeSetNewton } from '../../../src/engine/smoothers/trend/activeSetNewton';
import { basisCache } from '../../../src/engine/basis/discreteBSplines';
import { trendLambdaMax } from '../../../src/engine/smoothers/trend/trendLambdaMax';
import { checkTrendKkt, denseDifference } from './trendKkt';
import { trendDualInteriorPoint, trendOperator, stepAndGram } from '../../../src/engine/smoothers/trend/trendDualInteriorPoint';
import { applyDifferenceGram } from '../../../src/engine/linalg/differenceGram';
import { differenceRows } from '../../../src/engine/linalg/differenceRows';

describe('restrictedSplineFit (order 1)', () => {
  test('matches the dense solve in the hinge basis 1, x, (x - knot)_+', () => {
    const n = 40;
    const rn = seededNormal(5);
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.4 * Math.sin(i));
    const y = Float64Array.from(x, (t) => Math.abs(t - 15) + rn());
    const w = Float64Array.from({ length: n }, (_, i) => 0.5 + (i % 3));
    const rows = [9, 20, 31];
    const signs = [1, -1, 1];
    const lam = 0.7;
    const b = restrictedSplineFit(x, y, w, 1, lam, rows, signs)!.b;
    // objective 1/2 sum w (y - H beta)^2 + lam sum s_j (slope change at knot j); the slope change is beta_j for hinge j
    const H = new Matrix(n, 2 + rows.length);
    for (let i = 0; i < n; i++) {
      H.set(i, 0, 1); H.set(i, 1, x[i]);
      rows.forEach((r, j) => H.set(i, 2 + j, Math.max(0, x[i] - x[r + 1])));
    }
    const W = Matrix.diag(Array.from(w));
    const lhs = H.transpose().mmul(W).mmul(H);
    const rhs = H.transpose().mmul(W).mmul(Matrix.columnVector(Array.from(y)));
    rows.forEach((_, j) => rhs.set(2 + j, 0, rhs.get(2 + j, 0) - lam * signs[j]));
    const want = H.mmul(solve(lhs, rhs)).to1DArray();
    for (let i = 0; i < n; i++) expect(b[i]).toBeCloseTo(want[i], 9);
  });
});

describe('gapAgainstDual', () => {
  // P(b) and G(v) formed directly with the dense divided-difference matrix: G(v) is the Lagrangian
  // 1/2 sum w (y - b)^2 + v.D b at its minimiser b_v = y - W^-1 D^T v (weak duality, common practice)
  function primalMinusDual(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, b: Float64Array, v: Float64Array): { gap: number; primal: number } {
    const D = denseDifference(x, k + 1);
    const n = x.length;
    const bv = Float64Array.from(y, (yi, i) => yi - D.reduce((s, row, r) => s + row[i] * v[r], 0) / w[i]);
    let primal = 0, dual = 0;
    for (let i = 0; i < n; i++) { primal += 0.5 * w[i] * (y[i] - b[i]) ** 2; dual += 0.5 * w[i] * (y[i] - bv[i]) ** 2; }
    D.forEach((row, r) => {
      const db = row.reduce((s, c, i) => s + c * b[i], 0), dbv = row.reduce((s, c, i) => s + c * bv[i], 0);
      primal += lambda * Math.abs(db);
      dual += v[r] * dbv;
    });
    return { gap: primal - dual, primal };
  }

  test.each([1, 2, 3])('order %i: equals (P(b) - G(v)) / P(b) formed directly, for a restricted fit and any dual point in the box; Infinity for one outside it', (k) => {
    // seeded uneven x near unit spacing, a kinked signal with noise, weights 0.5 to 2.5, three knots
    const n = 60;
    const rn = seededNormal(40 + k);
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.3 * Math.sin(1.7 * i));
    const y = Float64Array.from(x, (t) => Math.abs(t - 25) / 5 + Math.sin(t / 4) + 0.3 * rn());
    const w = Float64Array.from({ length: n }, (_, i) => 0.5 + (i % 3));
    const lambda = 2;
    const rows = [12, 30, 44], signs = [1, -1, 1];
    const sol = restrictedSplineFit(x, y, w, k, lambda, rows, signs)!;
    let rss = 0;
    for (let i = 0; i < n; i++) rss += 0.5 * w[i] * (y[i] - sol.b[i]) ** 2;
    const m = n - k - 1;
    const v = Float64Array.from({ length: m }, () => lambda * 0.95 * Math.tanh(rn()));
    const bv = Float64Array.from(y);
    const dtv = differenceTranspose(x, k + 1, v);
    for (let i = 0; i < n; i++) bv[i] -= dtv[i] / w[i];
    const got = gapAgainstDual(lambda, rss, sol.b, w, rows, sol.dA, v, bv);
    const want = primalMinusDual(x, y, w, k, lambda, sol.b, v);
    // v is far from the optimum's dual, so the gap is large against P; the direct difference P - G
    // cancels terms up to about 1e4 times P, so the two agree to about 1e-13 of the gap
    expect(got).toBeGreaterThan(0);
    expect(Math.abs(got - want.gap / want.primal)).toBeLessThan(1e-11 * got);
    const outside = Float64Array.from(v);
    outside[7] = 1.001 * lambda;
    expect(gapAgainstDual(lambda, rss, sol.b, w, rows, sol.dA, outside, bv)).toBe(Infinity);
  });
});

describe('interpolateTrend', () => {
  test('reproduces a polynomial of degree k exactly between and beyond the points', () => {
    const x = Float64Array.of(0, 0.7, 1.1, 2.5, 3, 4.2, 5);
    const f = (t: number) => 1 - 2 * t + 0.5 * t * t - 0.1 * t * t * t;
    const b = Float64Array.from(x, f);
    const at = Float64Array.of(-1, 0.3, 1.9, 4.9, 6);
    const e = interpolateTrend(x, b, 3, at);
    for (let i = 0; i < at.length; i++) expect(e.value[i]).toBeCloseTo(f(at[i]), 10);
    expect(Array.from(e.extrapolated)).toEqual([1, 0, 0, 0, 1]);
  });

  test('gives each point the value it gets alone, whether the points come sorted (one sweep), shuffled or with gaps', () => {
    // a point evaluated alone is found by bisection; sorted runs are found by the forward scan
    const rn = seededNormal(9);
    const n = 200;
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.3 * Math.sin(i));
    const b = Float64Array.from(x, () => rn());
    const sorted = Float64Array.from({ length: 500 }, (_, j) => -3 + (j * (n + 5)) / 500);
    const withData = Float64Array.of(...Array.from(x.subarray(0, 40)), x[41], x[41], x[199], 150.5, 2.2, 199.9, 7);
    const shuffled = Float64Array.from(sorted).reverse();
    for (const k of [0, 1, 2, 3]) {
      for (const t of [sorted, withData, shuffled]) {
        const all = interpolateTrend(x, b, k, t);
        for (let j = 0; j < t.length; j++) {
          const one = interpolateTrend(x, b, k, [t[j]]);
          expect(all.value[j]).toBe(one.value[0]);
          expect(all.extrapolated[j]).toBe(one.extrapolated[0]);
        }
      }
    }
  });
});

describe('dualFromResidual', () => {
  test('inverts the transpose of the difference operator on its range', () => {
    const x = Float64Array.from({ length: 30 }, (_, i) => i * 1.3 + Math.cos(i));
    for (const q of [1, 2, 3, 4]) {
      const u = Float64Array.from({ length: 30 - q }, (_, i) => Math.sin(0.7 * i) * 10);
      const g = differenceTranspose(x, q, u);
      const r = dualFromResidual(x, q, g);
      for (let i = 0; i < u.length; i++) expect(r.u[i]).toBeCloseTo(u[i], 8);
      expect(r.inconsistency).toBeLessThan(1e-12);
    }
  });

  test.each([2, 3, 4])('q = %i: the one-pass kernel gives bit for bit the level-by-level result, u and inconsistency, on 2,000 uneven points', (q) => {
    // uneven x on [0, 1] (as the refinement uses it) and a residual off the range of D^T (noise), so
    // that every level's unmatched equation is non-zero
    const n = 2000;
    const rn = seededNormal(40 + q);
    const x = new Float64Array(n);
    for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.5 + Math.abs(rn());
    for (let i = 0; i < n; i++) x[i] /= x[n - 1];
    const g = Float64Array.from({ length: n }, () => rn());
    const one = dualFromResidual(x, q, g);
    const ref = dualFromResidualByLevel(x, q, g);
    expect(one.u.length).toBe(n - q);
    expect(Array.from(one.u)).toEqual(Array.from(ref.u));
    expect(one.inconsistency).toBe(ref.inconsistency);
    expect(one.inconsistency).toBeGreaterThan(0);
  });

  test.each([2, 3, 4])('q = %i: the one pass split after its first 64 points gives bit for bit the level-by-level result on lengths around that split (6 to 70 points) and with an output array passed in', (q) => {
    const rn = seededNormal(70 + q);
    for (const n of [q + 2, q + 3, 40, 63, 64, 65, 66, 67, 68, 70]) {
      const x = new Float64Array(n);
      for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.5 + Math.abs(rn());
      const g = Float64Array.from({ length: n }, () => rn());
      const out = new Float64Array(n - q).fill(NaN);
      const one = dualFromResidual(x, q, g, undefined, out);
      const ref = dualFromResidualByLevel(x, q, g);
      expect(one.u).toBe(out);
      expect(Array.from(one.u)).toEqual(Array.from(ref.u));
      expect(one.inconsistency).toBe(ref.inconsistency);
    }
  });
});

describe('residualDual', () => {
  test.each([1, 2, 3, 4])('q = %i: gives bit for bit the dual of W (y - b) formed first and its sums 1/2 sum w (y - b)^2 and y.W (y - b) added in point order, on lengths around the first call\'s split (6 to 70 points) and 2,000 uneven points', (q) => {
    const rn = seededNormal(90 + q);
    for (const n of [q + 1, q + 2, q + 3, 40, 63, 64, 65, 66, 70, 2000]) {
      const x = new Float64Array(n);
      for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.5 + Math.abs(rn());
      const y = Float64Array.from({ length: n }, () => rn());
      const b = Float64Array.from({ length: n }, () => 0.5 * rn());
      const w = Float64Array.from({ length: n }, () => 0.5 + Math.abs(rn()));
      const g = new Float64Array(n);
      let rss = 0, yg = 0;
      for (let i = 0; i < n; i++) { const ri = y[i] - b[i]; g[i] = w[i] * ri; rss += 0.5 * w[i] * ri * ri; yg += y[i] * g[i]; }
      const ref = dualFromResidualByLevel(x, q, g);
      const out = new Float64Array(n - q).fill(NaN);
      const got = residualDual(x, q, y, w, b, out);
      expect(got.u).toBe(out);
      expect(Array.from(got.u)).toEqual(Array.from(ref.u));
      expect(got.rss).toBe(rss);
      expect(got.yg).toBe(yg);
    }
  });
});

describe('regressionSplineRefit', () => {
  test('a cubic spline refit reproduces data lying on a cubic spline with those knots', () => {
    const x = Float64Array.from({ length: 50 }, (_, i) => i / 7);
    const f = (t: number) => 0.2 * t * t * t - t + Math.max(0, t - 3) ** 3 - 2 * Math.max(0, t - 5) ** 3;
    const y = Float64Array.from(x, f);
    const r = regressionSplineRefit(x, y, new Float64Array(50).fill(1), 3, [3, 5]);
    for (let i = 0; i < 50; i++) expect(r.fitted[i]).toBeCloseTo(y[i], 8);
    expect(evaluateRegressionSpline(r.spline, Float64Array.of(4.05))[0]).toBeCloseTo(f(4.05), 8);
  });
});

/**
 * An invented refinement problem: 150 uneven points on [0, 1] (as the refinement works), a wave and a
 * kink with noise, alternating weights, lambda 1e-3 of lambda_max, and a start with far too many knots
 * of alternating signs (every seventh row), so that most rounds drop a knot.
 */
function refinementProblem(k: number, seed: number) {
  const n = 150;
  const rn = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = (i + 0.4 * Math.sin(i)) / (n - 1 + 0.4 * Math.sin(n - 1));
    y[i] = Math.sin(6 * x[i]) + (x[i] > 0.5 ? 1.5 * (x[i] - 0.5) : 0) + 0.1 * rn();
    w[i] = 1 + (i % 2);
  }
  const lambda = 1e-3 * trendLambdaMax(x, y, w, k);
  const m = n - k - 1;
  const u0 = new Float64Array(m);
  const initial: number[] = [];
  for (let r = 3, s = 1; r < m - 3; r += 7, s = -s) { initial.push(r); u0[r] = s * lambda; }
  return { n, x, y, w, lambda, u0, initial };
}

describe('polishTrend', () => {
  test.each([2, 3])('order %i: rounds that only drop knots are solved from the kept normal equations (fewer solves from the data than rounds) and the answer meets the KKT conditions', (k) => {
    const { x, y, w, lambda, u0, initial } = refinementProblem(k, 90 + k);
    const spy = jest.spyOn(restrictedSplineFitModule, 'restrictedSplineStart');
    try {
      const pol = polishTrend(x, y, w, k, lambda, u0, 400, initial);
      expect(pol.ok).toBe(true);
      expect(pol.achieved).toBeLessThanOrEqual(1e-10);
      expect(spy.mock.calls.length).toBeGreaterThan(0);
      expect(spy.mock.calls.length).toBeLessThan(pol.rounds);
      const kkt = checkTrendKkt(x, y, w, pol.b, k, lambda);
      expect(kkt.boxExcess).toBeLessThan(1e-6);
      expect(kkt.signError).toBeLessThan(1e-6);
    } finally {
      spy.mockRestore();
    }
  });

  test.each([2, 3])('order %i: a solve from the data whose step stops at a sign change is not finished (no refinement steps, no fitted values), and the answer is that of finishing every solve', (k) => {
    const { x, y, w, lambda, u0, initial } = refinementProblem(k, 290 + k);
    const finished: number[] = [];
    const real = restrictedSplineFitModule.restrictedSplineStart;
    const spy = jest.spyOn(restrictedSplineFitModule, 'restrictedSplineStart').mockImplementation((...a) => {
      const st = real(...a);
      if (!st) return st;
      const call = finished.length;
      finished.push(0);
      return { dA: st.dA, finish: (out?: Float64Array) => { finished[call]++; return st.finish(out); } };
    });
    let pol: ReturnType<typeof polishTrend>;
    try {
      pol = polishTrend(x, y, w, k, lambda, u0, 400, initial);
    } finally {
      spy.mockRestore();
    }
    expect(pol.ok).toBe(true);
    // some solves only decided a drop; none was finished twice
    expect(finished.filter((f) => f === 0).length).toBeGreaterThan(0);
    expect(Math.max(...finished)).toBe(1);
    // every solve finished at once (the refined (D b)_A deciding each step) reaches the same answer here
    const eager = jest.spyOn(restrictedSplineFitModule, 'restrictedSplineStart').mockImplementation((...a) => {
      const st = real(...a);
      if (!st) return st;
      const done = st.finish();
      return { dA: done.dA, finish: () => done };
    });
    try {
      const ref = polishTrend(x, y, w, k, lambda, u0, 400, initial);
      expect(ref.knots).toEqual(pol.knots);
      expect(Math.abs(ref.achieved - pol.achieved)).toBeLessThanOrEqual(1e-12);
      for (let i = 0; i < x.length; i++) expect(Math.abs(ref.b[i] - pol.b[i])).toBeLessThanOrEqual(1e-10 * (1 + Math.abs(ref.b[i])));
    } finally {
      eager.mockRestore();
    }
  });

  test('order 3: at most max(4, a quarter of the knots) violations join in one round, the largest, and the answer meets the KKT conditions; order 2 lets every run\'s worst row join', () => {
    const joined = (k: number, seed: number) => {
      const { x, y, w } = refinementProblem(k, seed);
      // a small penalty and a start far from the optimum (no knots): many violations at once
      const lambda = 1e-5 * trendLambdaMax(x, y, w, k);
      const sets: number[][] = [];
      const real = restrictedSplineFitModule.restrictedSplineStart;
      const spy = jest.spyOn(restrictedSplineFitModule, 'restrictedSplineStart').mockImplementation((...a) => { sets.push(Array.from(a[5])); return real(...a); });
      let pol: ReturnType<typeof polishTrend>;
      try {
        pol = polishTrend(x, y, w, k, lambda, new Float64Array(x.length - k - 1), 400, []);
      } finally {
        spy.mockRestore();
      }
      // rows joining between consecutive solves from the data, against the limit for the set before
      const joins = sets.slice(1).map((now, i) => ({ count: now.filter((r) => !sets[i].includes(r)).length, limit: joiningAtMost(k, sets[i].length) }));
      return { pol, joins, x, y, w, lambda };
    };
    const three = joined(3, 391);
    expect(three.pol.ok).toBe(true);
    for (const j of three.joins) expect(j.count).toBeLessThanOrEqual(j.limit);
    // the limit binds in some round (more violations than it lets in)
    expect(three.joins.some((j) => j.count === j.limit)).toBe(true);
    const kkt = checkTrendKkt(three.x, three.y, three.w, three.pol.b, 3, three.lambda);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
    // order 2: no limit, and more than 4 rows join in some round
    expect(joiningAtMost(2, 100)).toBe(Infinity);
    expect(Math.max(...joined(2, 392).joins.map((j) => j.count))).toBeGreaterThan(JOINING_AT_LEAST);
  });

  test.each([1, 3])('order %i: refinements sharing a basis cache (and its two pairs of work arrays) give bit for bit the answers of fresh caches, and a later one leaves an earlier answer alone', (k) => {
    const { n, x, y, w, u0, initial } = refinementProblem(k, 490 + k);
    const lmax = trendLambdaMax(x, y, w, k);
    const shared = basisCache();
    const a = polishTrend(x, y, w, k, 1e-2 * lmax, u0, 400, initial, shared);
    const aCopy = { b: Array.from(a.b), u: Array.from(a.u) };
    const b = polishTrend(x, y, w, k, 1e-3 * lmax, u0, 400, initial, shared);
    const bFresh = polishTrend(x, y, w, k, 1e-3 * lmax, u0, 400, initial, basisCache());
    expect(a.ok && b.ok && bFresh.ok).toBe(true);
    expect(shared.refinement).toBeDefined();
    expect(Array.from(b.b)).toEqual(Array.from(bFresh.b));
    expect(Array.from(b.u)).toEqual(Array.from(bFresh.u));
    expect(b.knots).toEqual(bFresh.knots);
    expect(b.rounds).toBe(bFresh.rounds);
    expect(Array.from(a.b)).toEqual(aCopy.b);
    expect(Array.from(a.u)).toEqual(aCopy.u);
    for (const v of [...shared.refinement!.b, ...shared.refinement!.u]) { expect(a.b).not.toBe(v); expect(a.u).not.toBe(v); expect(b.b).not.toBe(v); }
    expect(a.b.length).toBe(n);
  });

  test.each([1, 2, 3])('order %i: with a loose target (1e-3, as cross-validation folds) the solves skip the refinement steps, and the gap recomputed densely from the fit is within the target', (k) => {
    const { n, x, y, w, lambda, u0, initial } = refinementProblem(k, 190 + k);
    const spy = jest.spyOn(restrictedSplineFitModule, 'restrictedSplineStart');
    try {
      const pol = polishTrend(x, y, w, k, lambda, u0, 400, initial, undefined, 1e-3);
      expect(pol.ok).toBe(true);
      expect(pol.achieved).toBeLessThanOrEqual(1e-3);
      expect(spy.mock.calls.length).toBeGreaterThan(0);
      for (const call of spy.mock.calls) expect(call[call.length - 1]).toBe(0);
      // the duality gap from the fit alone, with dense algebra (ml-matrix): g = W (y - b); u the least-squares
      // solution of D^T u = g, scaled into the box |u| <= lambda; P(b) - G(u), relative to P(b)
      const D = new Matrix(denseDifference(x, k + 1));
      const g = Float64Array.from(y, (v, i) => w[i] * (v - pol.b[i]));
      const u = solve(D.mmul(D.transpose()), D.mmul(Matrix.columnVector(Array.from(g)))).to1DArray();
      const f = Math.max(1, ...u.map((v) => Math.abs(v) / lambda));
      const db = D.mmul(Matrix.columnVector(Array.from(pol.b))).to1DArray();
      let rss = 0, yg = 0, gg = 0, l1 = 0;
      for (let i = 0; i < n; i++) { rss += 0.5 * w[i] * (y[i] - pol.b[i]) ** 2; yg += y[i] * g[i]; gg += (g[i] * g[i]) / w[i]; }
      for (const v of db) l1 += Math.abs(v);
      const P = rss + lambda * l1;
      const G = yg / f - (0.5 * gg) / (f * f);
      expect((P - G) / P).toBeLessThanOrEqual(1e-3);
    } finally {
      spy.mockRestore();
    }
  });
});

describe('trendDualInteriorPoint', () => {
  test.each([1, 2, 3])('order %i: a solve on an operator whose work space an earlier solve used gives bit for bit the answer of a fresh operator', (k) => {
    const n = 400;
    const rn = seededNormal(500 + k);
    const x = Float64Array.from({ length: n }, (_, i) => i + 1 + 0.3 * Math.sin(i));
    const y = Float64Array.from(x, (t) => Math.sin(t / 40) + (t > 200 ? 0.01 * (t - 200) : 0) + 0.2 * rn());
    const w = Float64Array.from({ length: n }, (_, i) => 1 + (i % 2));
    const used = trendOperator(x, w, k);
    // an earlier solve at another penalty, with a warm start, leaves its iterates in the work space
    const first = trendDualInteriorPoint(used, y, 50, 1e-6, 100, Float64Array.from({ length: n - k - 1 }, (_, i) => Math.cos(i)));
    const again = trendDualInteriorPoint(used, y, 5, 1e-6, 100);
    const fresh = trendDualInteriorPoint(trendOperator(x, w, k), y, 5, 1e-6, 100);
    expect(Array.from(again.b)).toEqual(Array.from(fresh.b));
    expect(Array.from(again.u)).toEqual(Array.from(fresh.u));
    expect(again.status).toEqual(fresh.status);
    // the earlier answer is not overwritten by the later solve
    expect(first.u).not.toBe(again.u);
    expect(first.b).not.toBe(again.b);
    expect(Array.from(first.u).some((v, i) => v !== again.u[i])).toBe(true);
  });

  test('order 1 near lambda_max on 10,000 points, where the gap stalls after its 17th iteration and then rises: the solve stops 3 iterations after its best gap (not at a breakdown 2 iterations later, nor after 8 without halving) and returns the best iterate', () => {
    const n = 10000;
    const rn = seededNormal(11);
    const x = Float64Array.from({ length: n }, (_, i) => i + 1);
    const y = Float64Array.from(x, (t) => Math.sin(t / (n / 20)) + (t > n / 2 ? (3 * (t - n / 2)) / n : 0) + 0.2 * rn());
    const op = trendOperator(x, new Float64Array(n).fill(1), 1);
    const lambda = 1e4;
    const full = trendDualInteriorPoint(op, y, lambda, 1e-8, 100);
    expect(full.status.converged).toBe(false);
    const stop = full.status.iterations;
    // the best gap after j iterations (the solve capped at j), j = 0 .. stop
    const best = Array.from({ length: stop + 1 }, (_, j) => trendDualInteriorPoint(op, y, lambda, 1e-8, j).status.achieved);
    let lastHalving = 0;
    for (let j = 1; j <= stop; j++) if (best[j] < 0.5 * best[j - 1]) lastHalving = j;
    // without the rule the same solve ran 22 iterations (to a breakdown of the step)
    expect(stop - lastHalving).toBe(3);
    // the last three iterations brought no better iterate, and the best one is returned
    expect(best[stop - 3]).toBe(best[stop]);
    expect(full.status.achieved).toBe(best[stop]);
    expect(full.status.achieved).toBeLessThan(1e-6);
  });

  test.each([1, 2, 3, 4])('q = %i: the step fused with Q u = D W^-1 D^T u gives bit for bit the step followed by applyDifferenceGram (Q u and its three sums), split after the first 64 rows and finished over the last q entries as the solver calls it, on 1 to 70 rows and 2,000 uneven points', (q) => {
    for (const m of [1, 2, q, q + 1, 6, 63, 64, 65, 70, 2000]) {
      const n = m + q;
      const rn = seededNormal(900 + 10 * q + m);
      const x = Float64Array.from({ length: n }, (_, i) => i + 0.45 * Math.sin(3 * i));
      const rows = differenceRows(x, q);
      const winv = Float64Array.from({ length: n }, () => 0.5 + Math.abs(rn()));
      const vec = () => Float64Array.from({ length: m }, () => rn());
      const u = vec(), mu1 = vec(), mu2 = vec(), du = vec(), dmu1 = vec(), dmu2 = vec(), p = vec();
      const step = 0.37;
      // the reference: the step, then the Gram product with its sums
      const u2 = Float64Array.from(u, (v, i) => v + step * du[i]);
      const want = new Float64Array(m), wantSums = new Float64Array(3);
      applyDifferenceGram(rows, winv, q, u2, want, new Float64Array(n), p, wantSums);
      // the fused kernel, called as the solver calls it
      const uf = u.slice(), m1 = mu1.slice(), m2 = mu2.slice();
      const tmp = new Float64Array(n), qu = new Float64Array(m), sums = new Float64Array(3);
      const head = Math.min(m, 64);
      stepAndGram(step, du, dmu1, dmu2, uf, m1, m2, rows, winv, q, tmp, qu, p, sums, 0, head, m);
      stepAndGram(step, du, dmu1, dmu2, uf, m1, m2, rows, winv, q, tmp, qu, p, sums, head, m, m);
      stepAndGram(step, du, dmu1, dmu2, uf, m1, m2, rows, winv, q, tmp, qu, p, sums, m, m + q, m);
      expect(Array.from(uf)).toEqual(Array.from(u2));
      expect(Array.from(m1)).toEqual(Array.from(mu1, (v, i) => v + step * dmu1[i]));
      expect(Array.from(m2)).toEqual(Array.from(mu2, (v, i) => v + step * dmu2[i]));
      expect(Array.from(qu)).toEqual(Array.from(want));
      expect(Array.from(sums)).toEqual(Array.from(wantSums));
    }
  });
});

describe('activeSetNewton', () => {
  test.each([1, 3])('order %i: calls sharing a basis cache (and its round work space) give bit for bit the answers of fresh caches, and a later call leaves an earlier answer alone', (k) => {
    const n = 300;
    const rn = seededNormal(600 + k);
    const x = Float64Array.from({ length: n }, (_, i) => (i + 0.3 * Math.sin(i)) / (n - 1 + 0.3 * Math.sin(n - 1)));
    const y = Float64Array.from(x, (t) => Math.sin(7 * t) + (t > 0.5 ? 2 * (t - 0.5) : 0) + 0.1 * rn());
    const w = new Float64Array(n).fill(1);
    const lmax = trendLambdaMax(x, y, w, k);
    const run = (lambda: number, cache: ReturnType<typeof basisCache>) => {
      // from the exact fit's knots (the refinement from no knots) the rounds settle with a certified fit
      const pol = polishTrend(x, y, w, k, lambda, new Float64Array(n - k - 1), 400, []);
      const rows = pol.knots;
      const signs = pol.knots.map((r) => (pol.u[r] >= 0 ? 1 : -1));
      return activeSetNewton(x, y, w, k, lambda, rows, signs, 60, cache, 0, true, Infinity, true);
    };
    const shared = basisCache();
    const a = run(1e-2 * lmax, shared);
    const aCopy = a.fit ? { b: Array.from(a.fit.b), u: Array.from(a.fit.u) } : undefined;
    const b = run(1e-3 * lmax, shared);
    const bFresh = run(1e-3 * lmax, basisCache());
    expect(a.fit && b.fit && bFresh.fit).toBeTruthy();
    expect(Array.from(b.fit!.b)).toEqual(Array.from(bFresh.fit!.b));
    expect(Array.from(b.fit!.u)).toEqual(Array.from(bFresh.fit!.u));
    expect(b.rows).toEqual(bFresh.rows);
    expect(Array.from(a.fit!.b)).toEqual(aCopy!.b);
    expect(Array.from(a.fit!.u)).toEqual(aCopy!.u);
    expect(a.fit!.b).not.toBe(shared.rounds!.b);
    expect(a.fit!.u).not.toBe(shared.rounds!.u);
  });
});
