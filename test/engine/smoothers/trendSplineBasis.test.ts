/**
 * Checks of the discrete B-spline basis and the banded restricted solve of trend
 * filtering (orders 2 and 3) against dense solves in the truncated falling factorial
 * basis and against the defining property of the space (D b = 0 off the knots).
 */
import { Matrix, solve, QrDecomposition } from 'ml-matrix';
import { discreteBSplines, basisCache } from '../../../src/engine/basis/discreteBSplines';
import { restrictedSplineFit, restrictedSplineFitGeneral } from '../../../src/engine/basis/restrictedSplineFit';
import { differenceOperator } from '../../../src/engine/linalg/difference';
import { seededNormal } from './trendTestFunctions';

const factorial = (k: number) => (k === 3 ? 6 : k === 2 ? 2 : 1);

/** Dense columns 1, x, .., x^k and g_r(x_i) = prod_{l=1..k} (x_i - x_{r+l}) 1{i > r}. */
function denseBasis(x: Float64Array, k: number, rows: number[]): Matrix {
  const n = x.length;
  const H = new Matrix(n, k + 1 + rows.length);
  for (let i = 0; i < n; i++) {
    for (let d = 0; d <= k; d++) H.set(i, d, Math.pow(x[i] - x[0], d));
    rows.forEach((r, j) => {
      let v = i > r ? 1 : 0;
      for (let l = 1; l <= k; l++) v *= x[i] - x[r + l];
      H.set(i, k + 1 + j, v);
    });
  }
  return H;
}

/**
 * Every basis function lies in the space: D B_e is zero off the knots and matches the stored penalty on
 * them, to `tol` of its own largest value; and B_e is scaled to max |B_e| = 1, positive there.
 */
function expectInSpace(x: Float64Array, k: number, rows: number[], B: NonNullable<ReturnType<typeof discreteBSplines>>, tol: number): void {
  const n = x.length;
  for (let e = 0; e < B.p; e++) {
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) { const j = e - B.first[i]; if (j >= 0 && j <= k) v[i] = B.values[i * (k + 1) + j]; }
    let top = 0;
    for (let i = 0; i < n; i++) if (Math.abs(v[i]) > Math.abs(top)) top = v[i];
    expect(top).toBeCloseTo(1, 12);
    const d = differenceOperator(x, k + 1, v);
    let scale = 0;
    for (let r = 0; r < d.length; r++) scale = Math.max(scale, Math.abs(d[r]));
    expect(scale).toBeGreaterThan(0);
    for (let r = 0; r < d.length; r++) {
      const j = rows.indexOf(r);
      const l = j < 0 ? -1 : j + k + 1 - e;
      const want = l >= 0 && l <= k + 1 ? B.penalty[e * (k + 2) + l] : 0;
      expect(Math.abs(d[r] - want)).toBeLessThan(tol * scale);
    }
  }
}

describe('discreteBSplines', () => {
  test.each([1, 2, 3])('order %i: a build that reuses the windows of an earlier one (basis cache) equals a fresh build exactly', (k) => {
    const n = 60;
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.4 * Math.sin(1.3 * i));
    const cache = basisCache();
    // an active-set method changes a few knots per round: one added, one removed, one moved
    const sets = [[3, 9, 10, 20, 31, 44], [3, 9, 10, 15, 20, 31, 44], [3, 10, 15, 20, 31, 44], [3, 10, 15, 20, 33, 44, n - k - 2]];
    for (const rows of sets) {
      const cached = discreteBSplines(x, k, rows, cache)!;
      const fresh = discreteBSplines(x, k, rows)!;
      expect(Array.from(cached.first)).toEqual(Array.from(fresh.first));
      expect(Array.from(cached.values)).toEqual(Array.from(fresh.values));
      expect(Array.from(cached.penalty)).toEqual(Array.from(fresh.penalty));
    }
    // the cache is really used: with its stored values spoilt, a build of the same knots copies
    // them (reused windows are not evaluated again), while a build of new knots is evaluated
    cache.values!.fill(NaN);
    const spoilt = discreteBSplines(x, k, sets[3], cache)!;
    expect(Array.from(spoilt.values).some(Number.isNaN)).toBe(true);
    // every window holds a real knot (k + 1 phantoms each side): moving every knot changes them all
    const moved = sets[3].map((r) => r - 1);
    cache.values!.fill(NaN);
    expect(Array.from(discreteBSplines(x, k, moved, cache)!.values)).toEqual(Array.from(discreteBSplines(x, k, moved)!.values));
    // a cache built on other design points is not used
    const x2 = Float64Array.from(x, (v) => v * 1.5);
    expect(Array.from(discreteBSplines(x2, k, sets[0], cache)!.values)).toEqual(Array.from(discreteBSplines(x2, k, sets[0])!.values));
  });

  test.each([1, 2, 3])('order %i: every basis function lies in the space (D B_e = 0 off the knots, D B_e matches the stored penalty on them)', (k) => {
    const n = 30;
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.3 * Math.sin(1.7 * i));
    const rows = [0, 4, 5, 6, 13, 21, n - k - 2];
    const B = discreteBSplines(x, k, rows)!;
    expect(B.p).toBe(k + 1 + rows.length);
    expectInSpace(x, k, rows, B, 1e-10);
  });

  test.each([2, 3])('order %i: on very unequal pieces (adjacent knots beside a 600-point stretch, spacing growing 1.02-fold per point) every basis function still lies in the space', (k) => {
    // the local systems are solved inside their band with row pivoting, falling back to complete
    // pivoting on a small pivot; these windows mix pieces of 1 to 600 points, the case the local
    // coordinates are there for
    const n = 900;
    const x = new Float64Array(n);
    for (let i = 1; i < n; i++) x[i] = x[i - 1] + Math.pow(1.02, i / 10) * (i % 7 === 0 ? 1e-3 : 1);
    const rows = [1, 2, 3, 4, 10, 11, 12, 612, 613, 615, 640, 641, 642, 643, 890 - k];
    const B = discreteBSplines(x, k, rows)!;
    expect(B).not.toBeNull();
    // 1e-8: on this design the worst window reaches 4e-9 of its scale, as complete pivoting over the
    // whole local system did (3.8e-9; measured on both): pieces 1 to 600 points long, spacings 1e-3 to 2
    expectInSpace(x, k, rows, B, 1e-8);
  });

  test.each([2, 3])('order %i: on long pieces (20,000 uneven points, 4 knots) the scale found from the pieces\' ends and turning points is the largest |B_e| over every point, reached at +1', (k) => {
    // every basis function's maximum lies inside a piece of thousands of points, at a turning point of its polynomial
    const n = 20000;
    const rn = seededNormal(300 + k);
    const x = new Float64Array(n);
    for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.5 + Math.abs(rn());
    const rows = [2500, 7000, 7001, 15000];
    const B = discreteBSplines(x, k, rows)!;
    for (let e = 0; e < B.p; e++) {
      let top = 0, big = 0;
      for (let i = 0; i < n; i++) {
        const j = e - B.first[i];
        if (j < 0 || j > k) continue;
        const v = B.values[i * (k + 1) + j];
        if (Math.abs(v) > big) { big = Math.abs(v); top = v; }
      }
      // 1 / scale times the scale: within two units in the last place of 1
      expect(Math.abs(top - 1)).toBeLessThanOrEqual(4.5e-16);
    }
  });

  test('order 1 gives the hat functions on the kinks', () => {
    const x = Float64Array.of(0, 1, 2, 3, 4);
    const B = discreteBSplines(x, 1, [1])!;
    // kink at x_2: hats peaking at x_0, x_2 and x_4
    const hat = (e: number) => Array.from({ length: 5 }, (_, i) => { const j = e - B.first[i]; return j >= 0 && j <= 1 ? B.values[i * 2 + j] : 0; });
    const want = [[1, 0.5, 0, 0, 0], [0, 0.5, 1, 0.5, 0], [0, 0, 0, 0.5, 1]];
    want.forEach((row, e) => hat(e).forEach((v, i) => expect(Math.abs(v)).toBeCloseTo(row[i], 14)));
  });
});

describe('restrictedSplineFit', () => {
  // order 1 goes through the piecewise-linear kernel (restrictedLinearFit), orders 2 and 3 through the discrete B-splines
  test.each([1, 2, 3])('order %i: meets the optimality conditions in the truncated falling factorial basis and agrees with a dense QR solve', (k) => {
    const n = 60;
    const rn = seededNormal(11 + k);
    const x = Float64Array.from({ length: n }, (_, i) => (i + 0.4 * Math.sin(i)) / n);
    const y = Float64Array.from(x, (t) => Math.sin(6 * t) + 0.1 * rn());
    const w = Float64Array.from({ length: n }, (_, i) => 0.5 + (i % 3));
    const rows = [3, 17, 18, 30, 44];
    const signs = [1, -1, 1, 1, -1];
    const lam = 0.01;
    const r = restrictedSplineFit(x, y, w, k, lam, rows, signs)!;
    // dense reference: minimise 1/2 ||sqrt(W) (y - H beta)||^2 + lam c.beta with c = k! s on the g columns
    // ((D g_r)_r = k!), by QR of sqrt(W) H: R beta = Q^T sqrt(W) y - lam R^-T c. The normal
    // equations of these columns are too ill-conditioned (about 1e12 here) to serve as a reference.
    const H = denseBasis(x, k, rows);
    const sw = Array.from(w, Math.sqrt);
    const A = H.clone();
    for (let i = 0; i < n; i++) for (let j = 0; j < A.columns; j++) A.set(i, j, A.get(i, j) * sw[i]);
    const qr = new QrDecomposition(A);
    const Q = qr.orthogonalMatrix.subMatrix(0, n - 1, 0, A.columns - 1);
    const R = qr.upperTriangularMatrix.subMatrix(0, A.columns - 1, 0, A.columns - 1);
    const cvec = Matrix.zeros(A.columns, 1);
    rows.forEach((_, j) => cvec.set(k + 1 + j, 0, factorial(k) * signs[j]));
    const z = solve(R.transpose(), cvec);
    const qy = Q.transpose().mmul(Matrix.columnVector(Array.from(y, (v, i) => v * sw[i])));
    const beta = solve(R, qy.sub(z.mul(lam)));
    const bd = H.mmul(beta).to1DArray();
    // stationarity H^T W (y - b) = lam c, each equation relative to the size of its terms
    const stat = (b: ArrayLike<number>) => {
      const g = Matrix.columnVector(Array.from(y, (v, i) => w[i] * (v - b[i])));
      const res = H.transpose().mmul(g).sub(cvec.clone().mul(lam)).to1DArray();
      return res.map((v, j) => v / H.getColumn(j).reduce((a, h, i) => a + Math.abs(h * w[i] * y[i]), 0));
    };
    // the banded solve meets the optimality conditions in the dense basis to 1e-12 of the size of
    // their terms; the dense QR itself only to about 2e-10 at k = 3 (its columns are that ill-conditioned),
    // which bounds the agreement between the two
    for (const v of stat(r.b)) expect(Math.abs(v)).toBeLessThan(1e-12);
    for (let i = 0; i < n; i++) expect(Math.abs(r.b[i] - bd[i])).toBeLessThan(1e-8);
    rows.forEach((_, j) => expect(Math.abs(r.dA[j] - factorial(k) * beta.get(k + 1 + j, 0))).toBeLessThan(1e-7 * Math.abs(r.dA[j])));
  });

  test('order 3 on 100000 points with clustered knots: b is one cubic between knots and the restricted optimality conditions hold', () => {
    const n = 100000, k = 3;
    const rn = seededNormal(99);
    const x = Float64Array.from({ length: n }, (_, i) => (i + 0.3 * Math.sin(i)) / n);
    const y = Float64Array.from(x, (t) => Math.sin(8 * t) + (t > 0.5 ? t - 0.5 : 0) + 0.2 * rn());
    const w = new Float64Array(n).fill(1);
    // a cluster of adjacent knots beside long knot-free stretches
    const rows = [40000, 40001, 40002, 70000, 70002, 99990];
    const signs = [1, -1, 1, -1, 1, 1];
    // the penalty term of a knot is lam k! / (normalised size of its truncated cubic), up to
    // 1e13 for the knot beside the end: lam = 1e-12 keeps the fit of the data's size
    const lam = 1e-12;
    const r = restrictedSplineFit(x, y, w, k, lam, rows, signs)!;
    // feasibility: the values between consecutive knot rows follow one cubic (checked by a
    // least-squares cubic in local coordinates, a computation independent of the basis)
    const pieces: [number, number][] = [];
    let start = 0;
    for (const row of rows) { pieces.push([start, row + k]); start = row + 1; }
    pieces.push([start, n - 1]);
    for (const [i0, i1] of pieces) {
      if (i1 - i0 < k + 2) continue;
      const c = 0.5 * (x[i0] + x[i1]), s = 0.5 * (x[i1] - x[i0]);
      const A = new Matrix(i1 - i0 + 1, k + 1);
      for (let i = i0; i <= i1; i++) for (let d = 0; d <= k; d++) A.set(i - i0, d, Math.pow((x[i] - c) / s, d));
      const bv = Matrix.columnVector(Array.from(r.b.subarray(i0, i1 + 1)));
      const coef = solve(A.transpose().mmul(A), A.transpose().mmul(bv));
      const fit = A.mmul(coef).to1DArray();
      let worst = 0, size = 0;
      for (let i = i0; i <= i1; i++) { worst = Math.max(worst, Math.abs(fit[i - i0] - r.b[i])); size = Math.max(size, Math.abs(r.b[i])); }
      expect(size).toBeLessThan(20);
      expect(worst).toBeLessThan(1e-10 * size);
    }
    // stationarity: the residual g = y - b is orthogonal to the polynomials and
    // sum_i g_i g_r(x_i) = lam k! s_r for every knot (local coordinates keep the sums moderate)
    const g = Float64Array.from(y, (v, i) => v - r.b[i]);
    for (let d = 0; d <= k; d++) {
      let s = 0, mag = 0;
      for (let i = 0; i < n; i++) { const t = Math.pow(2 * x[i] - 1, d); s += g[i] * t; mag += Math.abs(g[i] * t); }
      expect(Math.abs(s)).toBeLessThan(1e-10 * mag);
    }
    rows.forEach((row, j) => {
      let s = 0, mag = 0;
      for (let i = row + 1; i < n; i++) {
        let v = 1;
        for (let l = 1; l <= k; l++) v *= x[i] - x[row + l];
        s += g[i] * v; mag += Math.abs(g[i] * v);
      }
      expect(Math.abs(s - lam * factorial(k) * signs[j])).toBeLessThan(1e-9 * mag + 1e-9 * lam);
    });
  });

  test('order 1: the piecewise-linear kernel gives the discrete B-spline solve\'s fit and knot differences on uneven x with adjacent knots, weights and a knot beside each end', () => {
    const rn = seededNormal(5);
    for (const n of [3, 4, 50, 2000]) {
      // spacing from 0.01 to 10 (long gaps beside dense stretches), mapped to [0, 1]
      const raw = new Float64Array(n);
      for (let i = 1; i < n; i++) raw[i] = raw[i - 1] + (i % 17 === 0 ? 10 : 0.01 + Math.abs(rn()));
      const x = Float64Array.from(raw, (v) => v / raw[n - 1]);
      const y = Float64Array.from(x, (t) => Math.sin(7 * t) + 0.3 * rn());
      const w = Float64Array.from(x, (_, i) => 0.2 + (i % 5));
      const m = n - 2;
      const rows = n <= 4 ? [0] : [0, 1, 2, Math.floor(m / 3), Math.floor(m / 3) + 1, Math.floor(m / 2), m - 2, m - 1];
      const signs = rows.map((_, j) => (j % 3 === 1 ? -1 : 1));
      const lam = 1e-3;
      const fast = restrictedSplineFit(x, y, w, 1, lam, rows, signs)!;
      const general = restrictedSplineFitGeneral(x, y, w, 1, lam, rows, signs)!;
      const ymax = Math.max(...Array.from(y, Math.abs));
      // both solve the same well-conditioned tridiagonal system to rounding: agreement at 1e-12 of |y|
      for (let i = 0; i < n; i++) expect(Math.abs(fast.b[i] - general.b[i])).toBeLessThan(1e-12 * ymax);
      const dmax = Math.max(...Array.from(general.dA, Math.abs));
      for (let j = 0; j < rows.length; j++) expect(Math.abs(fast.dA[j] - general.dA[j])).toBeLessThan(1e-11 * dmax);
      // feasibility, checked on b itself: second divided differences vanish off the knot rows
      const db = differenceOperator(x, 2, fast.b);
      const bscale = Math.max(...Array.from(db, Math.abs));
      for (let r = 0; r < m; r++) if (!rows.includes(r)) expect(Math.abs(db[r])).toBeLessThan(1e-9 * bscale);
    }
  });
});
