import { bandedCholesky, bandedCholeskySolve } from '../linalg/bandedCholesky';
import { discreteBSplines, BasisCache } from './discreteBSplines';
import { restrictedLinearFit } from './restrictedLinearFit';
import { RestrictedSystem, subtractPenalty, knotDifferences } from './restrictedSystem';

/** Steps of iterative refinement in {@link restrictedSplineFit} (each one pass over the points). */
export const REFINEMENT_STEPS = 2;

/**
 * Rounds that only need a certificate at a relative duality gap of at least this (cross-validation
 * folds) are solved without the steps of iterative refinement. The steps make the recovered dual
 * precise enough to certify a gap of 1e-8 (see {@link restrictedSplineFitGeneral}; without them the
 * full-data path of order 3 at 1e4 took 8,856 restricted solves instead of 2,882); a fold's target is
 * far looser, and the certificate is computed from the round's own b and u, so it stays valid.
 * Measured on the `trend-cv` series at 1e4 (5 x 30): the folds made as many restricted solves as
 * with the steps within one (order 3: 3,558 against 3,559; orders 1 and 2: 1,246 and 1,237, the
 * same), and on 9 seeded series (orders 1 to 3, 500 to 1e4 points) the scores moved by at most 4e-15
 * relative.
 */
export const UNREFINED_GAP = 1e-5;

/** The refinement steps of a round whose certificate is wanted at relative gap `stopGap` (0: exact): none from {@link UNREFINED_GAP} on, else undefined (the solve's default). */
export function refinementStepsFor(stopGap: number): number | undefined {
  return stopGap >= UNREFINED_GAP ? 0 : undefined;
}

/**
 * The restricted trend-filtering problem of order k (1..3) in O(n k^2):
 *
 *   minimise 1/2 sum w (y - b)^2 + lambda sum_{r in A} s_r (D b)_r  subject to (D b)_j = 0, j not in A,
 *
 * with D = D(x, k+1). The feasible b are the discrete splines with knots A; in the
 * discrete B-spline basis b = B c ({@link discreteBSplines}) the normal equations
 *   (B^T W B) c = B^T W y - lambda (D_A B)^T s
 * are banded with half-bandwidth k and well conditioned, solved by banded Cholesky and
 * {@link REFINEMENT_STEPS} steps of iterative refinement whose residual is formed from
 * the data. (D b)_A = (D_A B) c is formed from the
 * coefficients, not by differencing b: on long series differencing b in floating
 * point loses about (n^(k+1) eps) of its scale, this does not.
 *
 * @param rowsA - knot rows, strictly increasing, in 0 .. n - k - 2
 * @param sA - their signs
 * @param cache - optional basis cache shared by solves on the same x and k ({@link BasisCache})
 * @param out - optional array of length n that receives the fitted values (then returned as `b`)
 * @param keep - optional: for k = 2 and 3, receives the normal equations as a {@link RestrictedSystem}
 *   (copies), from which the same problem with knots removed is solved without the data
 * @param steps - steps of iterative refinement (default {@link REFINEMENT_STEPS}, for k = 1 that of
 *   {@link restrictedLinearFit}; see {@link refinementStepsFor})
 * @returns fitted values and (D b) on the rows of A, or null when the system is singular
 * Unchecked.
 */
export function restrictedSplineFit(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>, cache?: BasisCache, out?: Float64Array, keep?: { system?: RestrictedSystem }, steps?: number): { b: Float64Array; dA: Float64Array } | null {
  // order 1: hat functions on the kinks, written out ({@link restrictedLinearFit})
  if (k === 1) return restrictedLinearFit(x, y, w, lambda, rowsA, sA, out, steps);
  return restrictedSplineFitGeneral(x, y, w, k, lambda, rowsA, sA, cache, out, keep, steps);
}

/** {@link restrictedSplineFit} through the discrete B-spline basis, for any order 1..3 (the reference for the order-1 kernel). Unchecked. */
export function restrictedSplineFitGeneral(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>, cache?: BasisCache, out?: Float64Array, keep?: { system?: RestrictedSystem }, steps = REFINEMENT_STEPS): { b: Float64Array; dA: Float64Array } | null {
  const start = restrictedSplineStartGeneral(x, y, w, k, lambda, rowsA, sA, cache, keep, steps);
  return start ? start.finish(out) : null;
}

/**
 * A restricted solve ({@link restrictedSplineFit}) factored and solved once, before its steps of
 * iterative refinement and its fitted values ({@link restrictedSplineStart}).
 */
export interface RestrictedSplineStart {
  /**
   * (D b)_A from the coefficients of the first solve of the normal equations, before refinement: their
   * signs decide a round of {@link polishTrend} that will drop a knot, which needs nothing else.
   */
  dA: Float64Array;
  /**
   * The refinement steps from the data, then the fitted values and the refined (D b)_A: the result of
   * {@link restrictedSplineFit}, bit for bit. Valid only before the next build on the same basis cache,
   * and only once.
   */
  finish(out?: Float64Array): { b: Float64Array; dA: Float64Array };
}

/**
 * The first part of {@link restrictedSplineFit} (the basis, one pass for the normal equations, their
 * banded Cholesky factor and one solve), with the rest left to `finish`. A round of the refinement
 * whose step stops at a sign change uses only (D b)_A: for k = 2 and 3 it then costs one pass over the
 * points instead of the four of a finished solve (two refinement steps and the fitted values). For
 * k = 1 the solve is written out ({@link restrictedLinearFit}) and done at once. Arguments as for
 * {@link restrictedSplineFit}; null when the system is singular. Unchecked.
 */
export function restrictedSplineStart(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>, cache?: BasisCache, keep?: { system?: RestrictedSystem }, steps?: number): RestrictedSplineStart | null {
  if (k !== 1) return restrictedSplineStartGeneral(x, y, w, k, lambda, rowsA, sA, cache, keep, steps);
  const sol = restrictedLinearFit(x, y, w, lambda, rowsA, sA, undefined, steps);
  return sol ? { dA: sol.dA, finish: () => sol } : null;
}

/** {@link restrictedSplineStart} through the discrete B-spline basis, for any order 1..3. Unchecked. */
function restrictedSplineStartGeneral(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>, cache?: BasisCache, keep?: { system?: RestrictedSystem }, steps = REFINEMENT_STEPS): RestrictedSplineStart | null {
  const n = x.length;
  const B = discreteBSplines(x, k, rowsA, cache);
  if (!B) return null;
  const { p, first, values, penalty } = B;
  const wd = k + 1;
  // k padding entries past p: basis functions first[i] + a >= p have value 0 at point i, so the
  // loops below need no bound test (they add zeros there)
  const band = new Float64Array((p + k) * wd);
  const rhs = new Float64Array(p + k);
  normalEquations(first, values, w, y, k, n, band, rhs);
  const K = rowsA.length;
  if (keep) keep.system = { k, K, p, gram: Float64Array.from(band), rhs: Float64Array.from(rhs), penalty: Float64Array.from(penalty) };
  // penalty term: lambda sum_{r in A} s_r (D B_e)_r
  subtractPenalty(rhs, penalty, k, p, lambda, sA);
  if (bandedCholesky(band, p, k) >= 0) return null;
  const c = Float64Array.from(rhs);
  for (let e = p; e < p + k; e++) c[e] = 0;
  bandedCholeskySolve(band, p, k, c);
  const finish = (out?: Float64Array): { b: Float64Array; dA: Float64Array } => {
    // iterative refinement with the residual of the normal equations formed from the data,
    // B^T W (y - B c) - lambda (D_A B)^T s, not from the assembled Gram matrix: the rounding of the
    // assembled sums limits a refinement on the Gram matrix, and through the dual recovered from
    // W (y - b) it limited the certified gap of order 3 at small penalties (measured at n = 1e4:
    // u on the knots off lambda by up to 1e-5 relative after a Gram-based step, 1e-7 after two of these)
    const res = new Float64Array(p + k);
    for (let step = 0; step < steps; step++) {
      res.fill(0);
      residualNormalEquations(first, values, w, y, c, k, n, res);
      subtractPenalty(res, penalty, k, p, lambda, sA);
      bandedCholeskySolve(band, p, k, res);
      for (let e = 0; e < p; e++) c[e] += res[e];
    }
    for (let e = p; e < p + k; e++) c[e] = 0;
    const b = out && out.length === n ? out : new Float64Array(n);
    basisCombination(first, values, c, k, n, b);
    return { b, dA: knotDifferences(penalty, c, k, p, K) };
  };
  return { dA: knotDifferences(penalty, c, k, p, K), finish };
}

// The passes over the points, each its own function: the first call's compiler then works on small
// bodies instead of compiling the whole solve once per loop while it runs. Unchecked.

/**
 * Adds B^T W B (lower band, width k + 1 per row) to `band` and B^T W y to `rhs`. For k = 3 and 2 the
 * points are taken by stretches with the same first basis function (between knots, most of them):
 * the stretch's band and right-hand entries are carried in locals, read before the stretch and written
 * after it, so each entry receives the same additions in the same order as point by point (identical
 * sums) without a load and store per point. Unchecked.
 */
function normalEquations(first: Int32Array, values: Float64Array, w: Float64Array, y: Float64Array, k: number, n: number, band: Float64Array, rhs: Float64Array): void {
  const wd = k + 1;
  if (k === 3) {
    for (let i = 0; i < n; ) {
      const e0 = first[i], b0 = 4 * e0;
      let r0 = rhs[e0], r1 = rhs[e0 + 1], r2 = rhs[e0 + 2], r3 = rhs[e0 + 3];
      let a0 = band[b0], a4 = band[b0 + 4], a5 = band[b0 + 5], a8 = band[b0 + 8], a9 = band[b0 + 9], a10 = band[b0 + 10];
      let a12 = band[b0 + 12], a13 = band[b0 + 13], a14 = band[b0 + 14], a15 = band[b0 + 15];
      for (; i < n && first[i] === e0; i++) {
        const o = 4 * i, wi = w[i], wyi = wi * y[i];
        const v0 = values[o], v1 = values[o + 1], v2 = values[o + 2], v3 = values[o + 3];
        const w0 = wi * v0, w1 = wi * v1, w2 = wi * v2, w3 = wi * v3;
        r0 += wyi * v0; r1 += wyi * v1; r2 += wyi * v2; r3 += wyi * v3;
        a0 += w0 * v0;
        a4 += w1 * v1; a5 += w1 * v0;
        a8 += w2 * v2; a9 += w2 * v1; a10 += w2 * v0;
        a12 += w3 * v3; a13 += w3 * v2; a14 += w3 * v1; a15 += w3 * v0;
      }
      rhs[e0] = r0; rhs[e0 + 1] = r1; rhs[e0 + 2] = r2; rhs[e0 + 3] = r3;
      band[b0] = a0; band[b0 + 4] = a4; band[b0 + 5] = a5; band[b0 + 8] = a8; band[b0 + 9] = a9; band[b0 + 10] = a10;
      band[b0 + 12] = a12; band[b0 + 13] = a13; band[b0 + 14] = a14; band[b0 + 15] = a15;
    }
  } else if (k === 2) {
    for (let i = 0; i < n; ) {
      const e0 = first[i], b0 = 3 * e0;
      let r0 = rhs[e0], r1 = rhs[e0 + 1], r2 = rhs[e0 + 2];
      let a0 = band[b0], a3 = band[b0 + 3], a4 = band[b0 + 4], a6 = band[b0 + 6], a7 = band[b0 + 7], a8 = band[b0 + 8];
      for (; i < n && first[i] === e0; i++) {
        const o = 3 * i, wi = w[i], wyi = wi * y[i];
        const v0 = values[o], v1 = values[o + 1], v2 = values[o + 2];
        const w0 = wi * v0, w1 = wi * v1, w2 = wi * v2;
        r0 += wyi * v0; r1 += wyi * v1; r2 += wyi * v2;
        a0 += w0 * v0;
        a3 += w1 * v1; a4 += w1 * v0;
        a6 += w2 * v2; a7 += w2 * v1; a8 += w2 * v0;
      }
      rhs[e0] = r0; rhs[e0 + 1] = r1; rhs[e0 + 2] = r2;
      band[b0] = a0; band[b0 + 3] = a3; band[b0 + 4] = a4; band[b0 + 6] = a6; band[b0 + 7] = a7; band[b0 + 8] = a8;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const e0 = first[i], o = i * wd, wyi = w[i] * y[i], wi = w[i];
      for (let a = 0; a <= k; a++) {
        const va = values[o + a];
        rhs[e0 + a] += wyi * va;
        const wva = wi * va, ba = (e0 + a) * wd + a;
        for (let c = 0; c <= a; c++) band[ba - c] += wva * values[o + c];
      }
    }
  }
}

/** res += B^T W (y - B c) (res zeroed by the caller); by stretches of points with the same first basis function for k = 3 and 2, as in {@link normalEquations} (identical sums). Unchecked. */
function residualNormalEquations(first: Int32Array, values: Float64Array, w: Float64Array, y: Float64Array, c: Float64Array, k: number, n: number, res: Float64Array): void {
  const wd = k + 1;
  if (k === 3) {
    for (let i = 0; i < n; ) {
      const e0 = first[i];
      const c0 = c[e0], c1 = c[e0 + 1], c2 = c[e0 + 2], c3 = c[e0 + 3];
      let r0 = res[e0], r1 = res[e0 + 1], r2 = res[e0 + 2], r3 = res[e0 + 3];
      for (; i < n && first[i] === e0; i++) {
        const o = 4 * i;
        const v0 = values[o], v1 = values[o + 1], v2 = values[o + 2], v3 = values[o + 3];
        const gi = w[i] * (y[i] - (v0 * c0 + v1 * c1 + v2 * c2 + v3 * c3));
        r0 += v0 * gi; r1 += v1 * gi; r2 += v2 * gi; r3 += v3 * gi;
      }
      res[e0] = r0; res[e0 + 1] = r1; res[e0 + 2] = r2; res[e0 + 3] = r3;
    }
  } else if (k === 2) {
    for (let i = 0; i < n; ) {
      const e0 = first[i];
      const c0 = c[e0], c1 = c[e0 + 1], c2 = c[e0 + 2];
      let r0 = res[e0], r1 = res[e0 + 1], r2 = res[e0 + 2];
      for (; i < n && first[i] === e0; i++) {
        const o = 3 * i;
        const v0 = values[o], v1 = values[o + 1], v2 = values[o + 2];
        const gi = w[i] * (y[i] - (v0 * c0 + v1 * c1 + v2 * c2));
        r0 += v0 * gi; r1 += v1 * gi; r2 += v2 * gi;
      }
      res[e0] = r0; res[e0 + 1] = r1; res[e0 + 2] = r2;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const e0 = first[i], o = i * wd;
      let s = 0;
      for (let a = 0; a <= k; a++) s += values[o + a] * c[e0 + a];
      const gi = w[i] * (y[i] - s);
      for (let a = 0; a <= k; a++) res[e0 + a] += values[o + a] * gi;
    }
  }
}

/** b = B c (by stretches of points with the same first basis function for k = 3: its coefficients read once). Unchecked. */
function basisCombination(first: Int32Array, values: Float64Array, c: Float64Array, k: number, n: number, b: Float64Array): void {
  const wd = k + 1;
  if (k === 3) {
    for (let i = 0; i < n; ) {
      const e0 = first[i];
      const c0 = c[e0], c1 = c[e0 + 1], c2 = c[e0 + 2], c3 = c[e0 + 3];
      for (; i < n && first[i] === e0; i++) {
        const o = 4 * i;
        b[i] = values[o] * c0 + values[o + 1] * c1 + values[o + 2] * c2 + values[o + 3] * c3;
      }
    }
  } else {
    for (let i = 0; i < n; i++) {
      const e0 = first[i], o = i * wd;
      let s = 0;
      for (let a = 0; a <= k; a++) s += values[o + a] * c[e0 + a];
      b[i] = s;
    }
  }
}
