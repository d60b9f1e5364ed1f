import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { KnotwiseError } from '../../errors';

/**
 * An unpenalised weighted least-squares regression spline of degree k with
 * given interior knots, in the B-spline basis (C. de Boor, "A Practical Guide
 * to Splines", 1978: Cox-de Boor recursion), the refit of relaxed trend
 * filtering. The normal equations B^T W B are banded (half-bandwidth k) and
 * solved by banded Cholesky in O(n k^2); B-splines keep them well conditioned.
 * For k = 0 the refit is the weighted mean of each segment between knots.
 *
 * Knot vector: k + 1 copies of x_0, the interior knots, k + 1 copies of x_{n-1}.
 * Outside [x_0, x_{n-1}] the end pieces are continued as polynomials.
 */
export interface RegressionSpline {
  k: number;
  /** Full knot vector (length p + k + 1). */
  t: Float64Array;
  /** B-spline coefficients (length p). */
  coef: Float64Array;
}

/**
 * Fits the regression spline. For k = 0, `knots` are the first points of each
 * new level (a segment runs from one knot up to, not including, the next).
 *
 * @param x - strictly increasing data positions
 * @param y - values
 * @param w - positive weights
 * @param k - degree 0..3
 * @param knots - interior knots, strictly increasing, inside (x_0, x_{n-1}]
 * @returns the spline and its fitted values at x
 * Unchecked.
 */
export function regressionSplineRefit(x: Float64Array, y: Float64Array, w: Float64Array, k: number, knots: ArrayLike<number>): { spline: RegressionSpline; fitted: Float64Array } {
  const n = x.length;
  const K = knots.length;
  const p = K + k + 1;
  const t = new Float64Array(p + k + 1);
  for (let i = 0; i <= k; i++) { t[i] = x[0]; t[p + i] = x[n - 1]; }
  for (let i = 0; i < K; i++) t[k + 1 + i] = knots[i];
  const coef = new Float64Array(p);
  const fitted = new Float64Array(n);
  if (k === 0) {
    // segment weighted means; segment s = [t_s, t_{s+1}), the last one closed
    const sw = new Float64Array(p), sy = new Float64Array(p);
    let s = 0;
    for (let i = 0; i < n; i++) {
      while (s < p - 1 && x[i] >= t[s + 1]) s++;
      sw[s] += w[i];
      sy[s] += w[i] * y[i];
    }
    for (let j = 0; j < p; j++) coef[j] = sw[j] > 0 ? sy[j] / sw[j] : 0;
    const spline = { k, t, coef };
    s = 0;
    for (let i = 0; i < n; i++) { while (s < p - 1 && x[i] >= t[s + 1]) s++; fitted[i] = coef[s]; }
    return { spline, fitted };
  }
  const wd = k + 1;
  const band = new Float64Array(p * wd);
  const rhs = new Float64Array(p);
  const mus = new Int32Array(n);
  const basis = new Float64Array(n * (k + 1));
  // each pass over the points is a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  splineNormalEquations(x, y, w, t, k, p, band, rhs, mus, basis);
  // a tiny ridge keeps the system defined when a basis function has (almost) no data under it
  let tr = 0;
  for (let j = 0; j < p; j++) tr += band[j * wd];
  for (let j = 0; j < p; j++) band[j * wd] += 1e-12 * (tr / p);
  if (bandedCholesky(band, p, k, 1e-15) >= 0) throw new KnotwiseError('numerical', `the relaxed refit's system is not positive definite (order ${k}, ${p} basis functions); use a smaller relaxed value or fewer knots.`);
  coef.set(rhs);
  bandedCholeskySolve(band, p, k, coef);
  splineFitted(basis, mus, coef, k, fitted);
  return { spline: { k, t, coef }, fitted };
}

/**
 * The band and right side of the weighted normal equations of the B-splines on knot vector t, with
 * each point's interval (mus) and its k + 1 basis values (basis) kept for {@link splineFitted}. Unchecked.
 */
function splineNormalEquations(x: Float64Array, y: Float64Array, w: Float64Array, t: Float64Array, k: number, p: number, band: Float64Array, rhs: Float64Array, mus: Int32Array, basis: Float64Array): void {
  const wd = k + 1;
  const N = new Float64Array(k + 1);
  const left = new Float64Array(k + 1), right = new Float64Array(k + 1);
  for (let i = 0; i < x.length; i++) {
    const mu = intervalOf(t, k, p, x[i]);
    mus[i] = mu;
    bsplineBasis(t, k, mu, x[i], N, left, right);
    for (let a = 0; a <= k; a++) basis[i * (k + 1) + a] = N[a];
    const wi = w[i];
    for (let a = 0; a <= k; a++) {
      const ia = mu - k + a;
      rhs[ia] += wi * N[a] * y[i];
      for (let c = 0; c <= a; c++) band[ia * wd + (a - c)] += wi * N[a] * N[c];
    }
  }
}

/** fitted_i = sum_a basis values times coef over point i's k + 1 B-splines. Unchecked. */
function splineFitted(basis: Float64Array, mus: Int32Array, coef: Float64Array, k: number, fitted: Float64Array): void {
  for (let i = 0; i < fitted.length; i++) {
    let s = 0;
    for (let a = 0; a <= k; a++) s += basis[i * (k + 1) + a] * coef[mus[i] - k + a];
    fitted[i] = s;
  }
}

/** Evaluates a {@link RegressionSpline} at the points `at` (any order). Unchecked. */
export function evaluateRegressionSpline(sp: RegressionSpline, at: ArrayLike<number>): Float64Array {
  const { k, t, coef } = sp;
  const p = coef.length;
  const out = new Float64Array(at.length);
  if (k === 0) {
    for (let j = 0; j < at.length; j++) {
      let s = 0;
      while (s < p - 1 && at[j] >= t[s + 1]) s++;
      // binary search would be faster; segments are few
      out[j] = coef[s];
    }
    return out;
  }
  const N = new Float64Array(k + 1);
  const left = new Float64Array(k + 1), right = new Float64Array(k + 1);
  for (let j = 0; j < at.length; j++) {
    const mu = intervalOf(t, k, p, at[j]);
    bsplineBasis(t, k, mu, at[j], N, left, right);
    let s = 0;
    for (let a = 0; a <= k; a++) s += N[a] * coef[mu - k + a];
    out[j] = s;
  }
  return out;
}

/** Largest mu in [k, p - 1] with t[mu] <= v (clamped at both ends). */
function intervalOf(t: Float64Array, k: number, p: number, v: number): number {
  let lo = k, hi = p - 1;
  if (v >= t[hi]) return hi;
  if (v < t[lo + 1]) return lo;
  while (hi - lo > 1) { const mid = (lo + hi) >> 1; if (t[mid] <= v) lo = mid; else hi = mid; }
  return lo;
}

/** The k + 1 non-zero B-splines of degree k at v on interval mu (Cox-de Boor). */
function bsplineBasis(t: Float64Array, k: number, mu: number, v: number, N: Float64Array, left: Float64Array, right: Float64Array): void {
  N[0] = 1;
  for (let j = 1; j <= k; j++) {
    left[j] = v - t[mu + 1 - j];
    right[j] = t[mu + j] - v;
    let saved = 0;
    for (let r = 0; r < j; r++) {
      const temp = N[r] / (right[r + 1] + left[j - r]);
      N[r] = saved + right[r + 1] * temp;
      saved = left[j - r] * temp;
    }
    N[j] = saved;
  }
}
