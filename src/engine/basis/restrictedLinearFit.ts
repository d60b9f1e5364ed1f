import { bandedCholesky, bandedCholeskySolve } from '../linalg/bandedCholesky';

/** Steps of iterative refinement in {@link restrictedLinearFit} (each one pass over the points). */
export const LINEAR_REFINEMENT_STEPS = 1;

/**
 * The restricted trend-filtering problem of order 1 in O(n), written out for piecewise-linear
 * fits (the case k = 1 of {@link restrictedSplineFit}, which it serves):
 *
 *   minimise 1/2 sum w (y - b)^2 + lambda sum_{r in A} s_r (D b)_r  subject to (D b)_j = 0, j not in A,
 *
 * with D = D(x, 2), (D b)_r = (b_{r+2} - b_{r+1}) / (x_{r+2} - x_{r+1}) - (b_{r+1} - b_r) / (x_{r+1} - x_r),
 * the change of slope at point r + 1. The feasible b are the continuous piecewise-linear
 * functions with kinks at the points N_j = A_j + 1; with the ends N_0 = 0 and N_{K+1} = n - 1
 * they are b = sum_e c_e H_e, H_e the hat function of node N_e (1 there, 0 at the other
 * nodes, linear in between): the discrete B-splines of order 1, scaled to maximum 1, so c is b
 * at the nodes. The normal equations
 *   (H^T W H) c = H^T W y - lambda (D_A H)^T s,   (D_A H) c at knot j = (c_{j+2} - c_{j+1}) / h_{j+1} - (c_{j+1} - c_j) / h_j,
 * h_e = x(N_{e+1}) - x(N_e), are tridiagonal: banded Cholesky, then
 * {@link LINEAR_REFINEMENT_STEPS} step of iterative refinement with the residual formed from the
 * data (as in {@link restrictedSplineFit}). (D b)_A comes from c, not from differencing b.
 *
 * Compared with building the general discrete B-spline basis, this needs no local systems and
 * no basis storage: three passes over the points (assemble, refine, evaluate).
 *
 * @param x - strictly increasing design points (n >= 3)
 * @param rowsA - knot rows, strictly increasing, in 0 .. n - 3
 * @param sA - their signs
 * @param out - optional array of length n that receives the fitted values (then returned as `b`)
 * @param steps - steps of iterative refinement (default {@link LINEAR_REFINEMENT_STEPS})
 * @returns fitted values and (D b) on the rows of A, or null when the system is singular
 * @example
 * ```ts
 * // a kink at point 2 (row 1) of five points
 * restrictedLinearFit(Float64Array.of(0, 1, 2, 3, 4), Float64Array.of(0, 1, 2, 1, 0), new Float64Array(5).fill(1), 0.1, [1], [-1]);
 * ```
 * Unchecked.
 */
export function restrictedLinearFit(x: Float64Array, y: Float64Array, w: Float64Array, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>, out?: Float64Array, steps = LINEAR_REFINEMENT_STEPS): { b: Float64Array; dA: Float64Array } | null {
  const n = x.length;
  const K = rowsA.length;
  const p = K + 2;
  // nodes and their positions; inverse piece lengths
  const node = new Int32Array(p);
  node[0] = 0;
  for (let j = 0; j < K; j++) node[j + 1] = rowsA[j] + 1;
  node[p - 1] = n - 1;
  const ih = new Float64Array(p - 1);
  for (let e = 0; e < p - 1; e++) {
    const h = x[node[e + 1]] - x[node[e]];
    if (!(h > 0)) return null;
    ih[e] = 1 / h;
  }
  // tridiagonal Gram in lower-band layout: band[2e] = G(e, e), band[2e + 1] = G(e, e - 1)
  const band = new Float64Array(2 * p);
  const rhs = new Float64Array(p);
  hatNormalEquations(x, y, w, node, ih, p, band, rhs);
  band[2 * (p - 1)] += w[n - 1];
  rhs[p - 1] += w[n - 1] * y[n - 1];
  // the penalty's side: - lambda (D_A H)^T s, knot j (node j + 1) touching c_j, c_{j+1}, c_{j+2}
  subtractHatPenalty(rhs, ih, lambda, sA, K);
  if (bandedCholesky(band, p, 1) >= 0) return null;
  const c = Float64Array.from(rhs);
  bandedCholeskySolve(band, p, 1, c);
  const res = new Float64Array(p);
  for (let step = 0; step < steps; step++) {
    res.fill(0);
    hatResidualEquations(x, y, w, node, ih, c, p, res);
    res[p - 1] += w[n - 1] * (y[n - 1] - c[p - 1]);
    subtractHatPenalty(res, ih, lambda, sA, K);
    bandedCholeskySolve(band, p, 1, res);
    for (let e = 0; e < p; e++) c[e] += res[e];
  }
  const b = out && out.length === n ? out : new Float64Array(n);
  hatCombination(x, node, ih, c, p, b);
  b[n - 1] = c[p - 1];
  const dA = new Float64Array(K);
  for (let j = 0; j < K; j++) dA[j] = (c[j + 2] - c[j + 1]) * ih[j + 1] - (c[j + 1] - c[j]) * ih[j];
  return { b, dA };
}

// The passes over the points, each its own function: the first call's compiler then works on small
// bodies instead of compiling the whole solve once per loop while it runs. Unchecked.

/** Adds the hat functions' tridiagonal Gram (lower-band layout) to `band` and H^T W y to `rhs`, piece by piece (the last point is the caller's). Unchecked. */
function hatNormalEquations(x: Float64Array, y: Float64Array, w: Float64Array, node: Int32Array, ih: Float64Array, p: number, band: Float64Array, rhs: Float64Array): void {
  for (let e = 0; e < p - 1; e++) {
    const i0 = node[e], i1 = node[e + 1], xl = x[i0], xr = x[i1], q = ih[e];
    let dl = 0, dr = 0, off = 0, rl = 0, rr = 0;
    for (let i = i0; i < i1; i++) {
      const wi = w[i], xi = x[i];
      const a = (xr - xi) * q, t = (xi - xl) * q;
      const wa = wi * a, wt = wi * t, wy = wi * y[i];
      dl += wa * a; dr += wt * t; off += wa * t; rl += wy * a; rr += wy * t;
    }
    band[2 * e] += dl;
    band[2 * (e + 1)] += dr;
    band[2 * (e + 1) + 1] += off;
    rhs[e] += rl;
    rhs[e + 1] += rr;
  }
}

/** The penalty's side: v -= lambda (D_A H)^T s, knot j (node j + 1) touching c_j, c_{j+1}, c_{j+2}. Unchecked. */
function subtractHatPenalty(v: Float64Array, ih: Float64Array, lambda: number, sA: ArrayLike<number>, K: number): void {
  for (let j = 0; j < K; j++) {
    const ls = lambda * sA[j], a = ih[j], b = ih[j + 1];
    v[j] -= ls * a;
    v[j + 1] += ls * (a + b);
    v[j + 2] -= ls * b;
  }
}

/** res += H^T W (y - H c), piece by piece (the last point is the caller's). Unchecked. */
function hatResidualEquations(x: Float64Array, y: Float64Array, w: Float64Array, node: Int32Array, ih: Float64Array, c: Float64Array, p: number, res: Float64Array): void {
  for (let e = 0; e < p - 1; e++) {
    const i0 = node[e], i1 = node[e + 1], xl = x[i0], xr = x[i1], q = ih[e], cl = c[e], cr = c[e + 1];
    let sl = 0, sr = 0;
    for (let i = i0; i < i1; i++) {
      const xi = x[i];
      const a = (xr - xi) * q, t = (xi - xl) * q;
      const gi = w[i] * (y[i] - (a * cl + t * cr));
      sl += a * gi; sr += t * gi;
    }
    res[e] += sl;
    res[e + 1] += sr;
  }
}

/** b = H c on every point but the last. Unchecked. */
function hatCombination(x: Float64Array, node: Int32Array, ih: Float64Array, c: Float64Array, p: number, b: Float64Array): void {
  for (let e = 0; e < p - 1; e++) {
    const i0 = node[e], i1 = node[e + 1], xl = x[i0], xr = x[i1], q = ih[e], cl = c[e], cr = c[e + 1];
    for (let i = i0; i < i1; i++) b[i] = (xr - x[i]) * q * cl + (x[i] - xl) * q * cr;
  }
}
