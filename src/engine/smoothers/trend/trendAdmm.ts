/**
 * Specialised ADMM for trend filtering of order k >= 1, after A. Ramdas and
 * R. J. Tibshirani, "Fast and flexible ADMM algorithms for trend filtering",
 * J. Comput. Graph. Statist. 25 (2016) 839-858, with weights and unequal spacing.
 *
 * Problem:  minimise P(b) = 1/2 sum_i w_i (y_i - b_i)^2 + lambda ||D(x, k+1) b||_1.
 * Split:    D(x, k+1) = D1 T with T = diag(k / (x_{i+k} - x_i)) D(x, k) (the
 *           recursion of {@link differenceOperator}), so with alpha = T b the
 *           penalty is lambda ||D1 alpha||_1, a 1-D fused lasso in alpha.
 * Iteration (scaled form, rho > 0, rho = lambda as the paper recommends):
 *   b     <- (W + rho T^T T)^{-1} (W y + rho T^T (alpha - s))   (banded, half-bandwidth k,
 *            factored once per rho by {@link bandedCholesky})
 *   alpha <- argmin 1/2 ||a - (T b + s)||^2 + (lambda / rho) ||D1 a||_1   (exact, {@link totalVariationDenoise}
 *            with unit weights)
 *   s     <- s + T b - alpha.
 * O(n k^2) per iteration, no dense matrices, no Newton systems (which is why it
 * stays accurate on long stretches without knots where the dual interior point
 * does not).
 *
 * Dual point and stopping rule ({@link ADMM_RULE}): the alpha step's own dual
 * v = -cumsum(rho s) satisfies |v| <= lambda exactly (it is the dual of the
 * fused lasso) and D1^T v = rho s. Scaled into the box, v / (1 + delta), it is
 * dual feasible for the original problem with D^T v = rho T^T s =: g, and
 *   G(v) = y.g / (1 + delta) - 1/2 sum g^2 / w / (1 + delta)^2
 * is a lower bound on the optimum. The iteration stops when the relative
 * duality gap (P(b) - G) / max(P(b), 1e-12 E0), E0 = 1/2 sum w (y - weighted mean)^2,
 * is at most the tolerance (checked every iteration, O(n k)); since P is
 * 1-strongly convex in the W-norm, ||b - b*||_W <= sqrt(2 gap). Otherwise it stops
 * after `maxIterations`, reporting the best gap seen (and that iterate).
 *
 * Works on x with unit mean spacing (the scaling of {@link trendScaling}), where
 * rho = lambda balances the two blocks. Unchecked.
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { differenceRows } from '../../linalg/differenceRows';
import { differenceOperator, firstDifferenceTranspose } from '../../linalg/difference';
import { applyRows } from '../../linalg/applyRows';
import { applyRowsTransposed } from '../../linalg/applyRowsTransposed';
import type { SolverStatus } from '../../types';
import { totalVariationDenoise, totalVariationWorkspace } from './totalVariationDenoise';
import { constantFitObjective } from './constantFitObjective';
import { KnotwiseError } from '../../errors';
import { maxAbs } from '../../linalg/maxAbs';
import { scaledInto } from '../../linalg/scaledInto';
import { dividedInto } from '../../linalg/dividedInto';

/** The stopping rule of {@link trendAdmm}, as reported in SolverStatus. */
export const ADMM_RULE = 'ADMM (Ramdas and Tibshirani 2016) until the relative duality gap of the iterate against the fused-lasso dual scaled into the box, (P(b) - G(v)) / max(P(b), 1e-12 * null deviance), is at most the tolerance';

/** State carried between penalties (warm start): alpha = T b and the scaled dual s, with the rho they belong to. */
export interface AdmmState {
  alpha: Float64Array;
  s: Float64Array;
  rho: number;
}

/** Result of {@link trendAdmm}. */
export interface AdmmResult {
  b: Float64Array;
  /** Dual feasible vector (|u| <= lambda) of the certificate, length n - k - 1. */
  u: Float64Array;
  /** Relative duality gap certified for b. */
  achieved: number;
  /** Rows r of D(x, k+1) where alpha jumps (alpha_{r+1} != alpha_r): the knots of the last iterate. */
  knots: number[];
  state: AdmmState;
  status: SolverStatus;
}

/** Rows of T = diag(k / (x_{i+k} - x_i)) D(x, k): k + 1 entries per row, n - k rows. Unchecked. */
export function scaledDifferenceRows(x: Float64Array, k: number): Float64Array {
  const n = x.length;
  const rows = differenceRows(x, k);
  const wd = k + 1;
  for (let r = 0; r < n - k; r++) {
    const s = k / (x[r + k] - x[r]);
    for (let c = 0; c < wd; c++) rows[r * wd + c] *= s;
  }
  return rows;
}

/**
 * Runs the ADMM from `warm` (or from alpha = T y, s = 0).
 *
 * @param x - positions, unit mean spacing
 * @param y - values
 * @param w - positive weights
 * @param k - order >= 1
 * @param lambda - penalty > 0
 * @param tolerance - relative duality gap to stop at
 * @param maxIterations - iteration limit
 * @param warm - state of a nearby penalty
 * @param rows - optional precomputed {@link scaledDifferenceRows}
 * @param stableStop - when positive, stop once the knots (the jumps of alpha) have stayed the same for this many iterations in a row (the certificate is then computed at that iteration), for a seed of the refinement
 * @example
 * ```ts
 * const r = trendAdmm(x, y, w, 3, 1e4, 1e-8, 5000);
 * ```
 * Unchecked.
 */
export function trendAdmm(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, tolerance: number, maxIterations: number, warm?: AdmmState, rows?: Float64Array, stableStop = 0): AdmmResult {
  const n = x.length;
  const mt = n - k; // rows of T
  const m = n - k - 1; // rows of D
  const wd = k + 1;
  const T = rows ?? scaledDifferenceRows(x, k);
  const rho = lambda;
  // the solver's loops are kernels of their own (DEVELOPERS.md, "Long loops and the first call"):
  // with them written here, a fresh process's ADMM at 1e5 points was thrown back to the interpreter
  // a dozen times per call, and even a second call took about 17 ms per iteration
  // band of W + rho T^T T (n x n, half-bandwidth k)
  const band = new Float64Array(n * wd);
  diagonalFromWeights(w, band, wd);
  addScaledGram(T, rho, mt, wd, band);
  if (bandedCholesky(band, n, k) >= 0) throw new KnotwiseError('numerical', `the trend ADMM system is not positive definite (order ${k}, ${n} points); the x values may be too close together for their scale.`);
  const e0 = constantFitObjective(y, w);
  const floor = 1e-12 * e0 + 1e-300;
  const wy = new Float64Array(n);
  weightedValues(w, y, wy);

  const alpha = new Float64Array(mt);
  const s = new Float64Array(mt);
  if (warm && warm.alpha.length === mt) {
    alpha.set(warm.alpha);
    scaledInto(warm.rho / rho, warm.s, s, mt);
  } else {
    applyRows(T, wd, y, alpha);
  }
  const ones = new Float64Array(mt).fill(1);
  const tvWork = totalVariationWorkspace(mt);
  // seeding: the jumps of alpha (the knots) and how long they have stayed the same
  let lastKnots: number[] = [], stable = 0;
  const b = new Float64Array(n);
  const z = new Float64Array(mt);
  const g = new Float64Array(n);
  const v = new Float64Array(m);
  const work = new Float64Array(n);
  const best = { achieved: Infinity, b: new Float64Array(n), u: new Float64Array(m) };
  const pen = lambda / rho;
  let iter = 0;
  let converged = false;
  while (iter < maxIterations) {
    iter++;
    if (k === 1) {
      // b step: right-hand side W y + T^T (rho (alpha - s)), one forward and one backward sweep,
      // the backward one fused with z = T b + s
      forwardSweepFirstOrder(alpha, s, rho, T, band, wy, b, n, mt);
      backwardSweepFirstOrder(T, band, s, b, z, n);
    } else {
      // b step
      scaledDifference(alpha, s, rho, z, mt);
      applyRowsTransposed(T, wd, z, mt, b);
      addInto(b, wy, n);
      bandedCholeskySolve(band, n, k, b);
      // alpha step input
      applyRows(T, wd, b, z);
      addInto(z, s, mt);
    }
    // alpha step
    totalVariationDenoise(z, ones, pen, alpha, tvWork);
    // s step, and the fused-lasso dual v = -cumsum(rho s) (mean of s removed: sum s = 0 in exact arithmetic)
    const sm = differenceAndSum(z, alpha, s, mt) / mt;
    subtractConstant(s, sm, mt);
    if (stableStop > 0) {
      const knots = jumpRows(alpha, JUMP_RELATIVE * maxAbs(alpha));
      stable = iter > 1 && sameRows(knots, lastKnots) ? stable + 1 : 0;
      lastKnots = knots;
      // the certificate every 10 iterations while seeding, and when the knots have settled
      if (stable < stableStop && iter % 10 !== 0 && iter < maxIterations) continue;
    }
    const ach = certificate(x, y, w, k, lambda, b, s, rho, T, v, g, work, floor);
    if (ach < best.achieved) { best.achieved = ach; best.b.set(b); best.u.set(v); }
    if (ach <= tolerance) { converged = true; break; }
    if (stableStop > 0 && stable >= stableStop) break;
  }
  return {
    b: best.b, u: best.u, achieved: best.achieved, knots: jumpRows(alpha, JUMP_RELATIVE * maxAbs(alpha)), state: { alpha: alpha.slice(), s: s.slice(), rho },
    status: { converged, iterations: iter, tolerance, achieved: best.achieved, stoppingRule: ADMM_RULE },
  };
}

// The kernels of the ADMM, each one long loop with nothing after it but the return of a local
// (DEVELOPERS.md, "Long loops and the first call"). Unchecked.

/** The band's diagonal set to the weights (the band's other entries are zero). Unchecked. */
function diagonalFromWeights(w: Float64Array, band: Float64Array, wd: number): void {
  for (let i = 0; i < w.length; i++) band[i * wd] = w[i];
}

/** Adds rho T^T T to the lower band (half-bandwidth wd - 1), row by row of T. Unchecked. */
function addScaledGram(T: Float64Array, rho: number, mt: number, wd: number, band: Float64Array): void {
  for (let r = 0; r < mt; r++) {
    const o = r * wd;
    for (let a = 0; a < wd; a++) {
      const ta = rho * T[o + a];
      for (let c = 0; c <= a; c++) band[(r + a) * wd + (a - c)] += ta * T[o + c];
    }
  }
}

/** wy = W y. Unchecked. */
function weightedValues(w: Float64Array, y: Float64Array, wy: Float64Array): void {
  for (let i = 0; i < w.length; i++) wy[i] = w[i] * y[i];
}

/**
 * Order 1's b step, forward: the right-hand side W y + T^T (rho (alpha - s)) formed on the fly and
 * solved with the factor's lower band (its diagonal holds the reciprocal pivots, see bandedCholesky). Unchecked.
 */
function forwardSweepFirstOrder(alpha: Float64Array, s: Float64Array, rho: number, T: Float64Array, band: Float64Array, wy: Float64Array, b: Float64Array, n: number, mt: number): void {
  let zp = 0, prev = 0;
  for (let i = 0; i < n; i++) {
    const zi = i < mt ? rho * (alpha[i] - s[i]) : 0;
    const rhs = (i > 0 ? T[2 * (i - 1) + 1] * zp : 0) + (i < mt ? T[2 * i] * zi : 0) + wy[i];
    prev = (i > 0 ? rhs - band[2 * i + 1] * prev : rhs) * band[2 * i];
    b[i] = prev;
    zp = zi;
  }
}

/** Order 1's b step, backward, fused with the alpha step's input z = T b + s. Unchecked. */
function backwardSweepFirstOrder(T: Float64Array, band: Float64Array, s: Float64Array, b: Float64Array, z: Float64Array, n: number): void {
  let next = b[n - 1] * band[2 * (n - 1)];
  b[n - 1] = next;
  for (let i = n - 2; i >= 0; i--) {
    const bi = (b[i] - band[2 * (i + 1) + 1] * next) * band[2 * i];
    b[i] = bi;
    z[i] = T[2 * i] * bi + T[2 * i + 1] * next + s[i];
    next = bi;
  }
}

/** z = rho (alpha - s). Unchecked. */
function scaledDifference(alpha: Float64Array, s: Float64Array, rho: number, z: Float64Array, m: number): void {
  for (let r = 0; r < m; r++) z[r] = rho * (alpha[r] - s[r]);
}

/** a += b on the first m entries. Unchecked. */
function addInto(a: Float64Array, b: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) a[i] += b[i];
}

/** s = z - alpha, returning the sum of s (added in index order). Unchecked. */
function differenceAndSum(z: Float64Array, alpha: Float64Array, s: Float64Array, m: number): number {
  let sm = 0;
  for (let r = 0; r < m; r++) { s[r] = z[r] - alpha[r]; sm += s[r]; }
  return sm;
}

/** s -= c on the first m entries. Unchecked. */
function subtractConstant(s: Float64Array, c: number, m: number): void {
  for (let r = 0; r < m; r++) s[r] -= c;
}

/**
 * Relative duality gap of b against the dual v = -cumsum(rho s) scaled into the box
 * (written to `v`). Unchecked.
 */
function certificate(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, b: Float64Array, s: Float64Array, rho: number, T: Float64Array, v: Float64Array, g: Float64Array, work: Float64Array, floor: number): number {
  const n = x.length;
  const m = n - k - 1;
  const vm = runningDual(s, rho, v, m);
  const f = vm > lambda ? vm / lambda : 1;
  // g = D^T v = T^T (D1^T v); D1^T v = rho s up to the rounding of the running sum
  const d1 = work;
  firstDifferenceTranspose(v, d1, m);
  applyRowsTransposed(T, k + 1, d1, n - k, g);
  const yg = dot(y, g, n), gg = weightedSquares(g, w, n), rss = halfWeightedResiduals(y, b, w, n);
  const db = differenceOperator(x, k + 1, b, work);
  const obj = rss + lambda * absoluteSum(db, m);
  const dual = yg / f - (0.5 * gg) / (f * f);
  if (f > 1) dividedInto(v, f, v, m);
  return Math.max(obj - dual, 0) / Math.max(obj, floor);
}

/** v = -cumsum(rho s) over the first m entries, returning the largest |v|. Unchecked. */
function runningDual(s: Float64Array, rho: number, v: Float64Array, m: number): number {
  let acc = 0, vm = 0;
  for (let r = 0; r < m; r++) { acc -= rho * s[r]; v[r] = acc; const a = Math.abs(acc); if (a > vm) vm = a; }
  return vm;
}

/** sum y g over the first n entries, in index order. Unchecked. */
function dot(y: Float64Array, g: Float64Array, n: number): number {
  let t = 0;
  for (let i = 0; i < n; i++) t += y[i] * g[i];
  return t;
}

/** sum g^2 / w, in index order. Unchecked. */
function weightedSquares(g: Float64Array, w: Float64Array, n: number): number {
  let t = 0;
  for (let i = 0; i < n; i++) t += (g[i] * g[i]) / w[i];
  return t;
}

/** 1/2 sum w (y - b)^2, in index order. Unchecked. */
function halfWeightedResiduals(y: Float64Array, b: Float64Array, w: Float64Array, n: number): number {
  let t = 0;
  for (let i = 0; i < n; i++) t += 0.5 * w[i] * (y[i] - b[i]) ** 2;
  return t;
}

/** sum |d| over the first m entries, in index order. Unchecked. */
function absoluteSum(d: Float64Array, m: number): number {
  let t = 0;
  for (let r = 0; r < m; r++) t += Math.abs(d[r]);
  return t;
}

/** Relative size of a jump of alpha counted as a knot (the fused-lasso step gives exact ties elsewhere). */
const JUMP_RELATIVE = 1e-12;

/** Rows where alpha jumps by more than th. Unchecked. */
function jumpRows(alpha: Float64Array, th: number): number[] {
  const out: number[] = [];
  for (let r = 0; r + 1 < alpha.length; r++) if (Math.abs(alpha[r + 1] - alpha[r]) > th) out.push(r);
  return out;
}

/** Whether two lists of rows are the same. Unchecked. */
function sameRows(a: number[], b: number[]): boolean {
  if (a.length !== b.length) return false;
  for (let j = 0; j < a.length; j++) if (a[j] !== b[j]) return false;
  return true;
}
