/**
 * Primal-dual interior-point solver for trend filtering on its dual, after
 * S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, "l1 trend filtering",
 * SIAM Review 51 (2009), with weights and unequal spacing.
 *
 * Primal:  minimise P(b) = 1/2 sum_i w_i (y_i - b_i)^2 + lambda ||D b||_1,  D = D(x, k+1).
 * Dual:    minimise 1/2 u^T Q u - u^T D y  subject to |u_j| <= lambda,  Q = D W^{-1} D^T,
 *          with b = y - W^{-1} D^T u.
 * Each Newton step solves (Q + diag(d)) du = r with Q banded (half-bandwidth
 * k + 1) by banded Cholesky: O(n k^2) per iteration, no dense matrices. The
 * barrier parameter follows t = max(t, 10 * 2m / surrogate gap); the step keeps
 * the dual strictly inside the box (fraction 0.99) and backtracks on the norm
 * of the residual (S. Boyd and L. Vandenberghe, "Convex Optimization", 2004,
 * section 11.7).
 *
 * Stopping rule ({@link INTERIOR_POINT_RULE}): with b = b(u),
 *   gap = lambda ||D b||_1 - u.D b  (= P(b) - dual objective, >= 0 for |u| <= lambda),
 * divided by max(P(b), 1e-12 E0), E0 = 1/2 sum w (y - weighted mean)^2, is at most
 * the tolerance. Because P is 1-strongly convex in the W-norm, ||b - b*||_W <= sqrt(2 gap).
 *
 * Limitation: Q has condition number of order L^(2k+2) over a stretch of L points
 * without knots, so at penalties near lambda_max on long series (few knots)
 * the Newton steps lose accuracy and the gap may stall above the tolerance;
 * the status then says not converged and reports the gap reached. The best
 * iterate seen is returned; a breakdown (non-finite step) ends the iterations.
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { differenceRows } from '../../linalg/differenceRows';
import { differenceOperator, differenceTranspose } from '../../linalg/difference';
import type { SolverStatus } from '../../types';
import { differenceGram, applyDifferenceGram } from './differenceGram';

/** Result of a trend-filtering solve on the (scaled) problem. */
export interface TrendSolution {
  /** The primal solution b. */
  b: Float64Array;
  /** The dual u with |u| <= lambda and D^T u = W (y - b). */
  u: Float64Array;
  /** Duality gap reached (absolute, in the units of the objective). */
  gap: number;
  /** Primal objective value. */
  objective: number;
  status: SolverStatus;
}

/** Precomputed pieces shared by solves on the same x and w. Unchecked. */
export interface TrendOperator {
  x: Float64Array;
  w: Float64Array;
  winv: Float64Array;
  /** Polynomial order k (penalty on D(x, k+1)). */
  k: number;
  /** Entries of D(x, k+1), k + 2 per row. */
  rows: Float64Array;
  /** Band of D W^{-1} D^T. */
  gram: Float64Array;
}

/** Builds the {@link TrendOperator} for x, w and order k. O(n k^2). Unchecked. */
export function trendOperator(x: Float64Array, w: Float64Array, k: number): TrendOperator {
  const n = x.length;
  const winv = new Float64Array(n);
  for (let i = 0; i < n; i++) winv[i] = 1 / w[i];
  const rows = differenceRows(x, k + 1);
  return { x, w, winv, k, rows, gram: differenceGram(rows, winv, k + 1) };
}

/**
 * Relative pivot floor of the Newton-step factorisation: Q is numerically
 * singular on long series (see the limitation above); its near-null directions
 * are smooth dual vectors that D^T maps to almost nothing, so flooring those
 * pivots perturbs the primal step little and keeps the step defined.
 * Convergence is judged by the gap, computed directly, never by the step.
 */
const PIVOT_FLOOR = 1e-14;

/** The stopping rule of {@link trendDualInteriorPoint}, as reported in SolverStatus. */
export const INTERIOR_POINT_RULE = 'relative duality gap (lambda*||Db||_1 - u.Db) / max(primal objective, 1e-12 * null deviance) at most the tolerance';

/**
 * Solves one trend-filtering problem by the dual interior-point method.
 *
 * @param op - operator for x, w, k
 * @param y - values
 * @param lambda - penalty > 0 (units of the problem as passed in)
 * @param tolerance - relative duality gap to stop at
 * @param maxIterations - Newton-step limit
 * @param u0 - optional warm start (a dual from a nearby lambda); clipped into 0.95 of the box
 * @example
 * ```ts
 * const sol = trendDualInteriorPoint(trendOperator(x, w, 1), y, 10, 1e-10, 100);
 * ```
 * Unchecked.
 */
export function trendDualInteriorPoint(op: TrendOperator, y: Float64Array, lambda: number, tolerance: number, maxIterations: number, u0?: Float64Array): TrendSolution {
  const { x, w, winv, k, rows, gram } = op;
  const n = x.length;
  const q = k + 1;
  const m = n - q;
  const wd = q + 1;
  let ybar = 0, sw = 0;
  for (let i = 0; i < n; i++) { ybar += w[i] * y[i]; sw += w[i]; }
  ybar /= sw;
  let e0 = 0;
  for (let i = 0; i < n; i++) e0 += 0.5 * w[i] * (y[i] - ybar) ** 2;
  const floor = 1e-12 * e0 + 1e-300;

  const p = Float64Array.from(differenceOperator(x, q, y, new Float64Array(n)));
  const u = new Float64Array(m);
  const mu1 = new Float64Array(m);
  const mu2 = new Float64Array(m);
  const f1 = new Float64Array(m);
  const f2 = new Float64Array(m);
  const qu = new Float64Array(m);
  const rd = new Float64Array(m);
  const du = new Float64Array(m);
  const qdu = new Float64Array(m);
  const dmu1 = new Float64Array(m);
  const dmu2 = new Float64Array(m);
  const mat = new Float64Array(m * wd);
  const tmp = new Float64Array(n);
  const b = new Float64Array(n);

  if (u0 && u0.length === m) {
    for (let i = 0; i < m; i++) {
      const v = u0[i];
      u[i] = v > 0.95 * lambda ? 0.95 * lambda : v < -0.95 * lambda ? -0.95 * lambda : v;
    }
  }
  for (let i = 0; i < m; i++) { f1[i] = u[i] - lambda; f2[i] = -u[i] - lambda; }
  let t: number;
  if (u0) {
    applyDifferenceGram(rows, winv, q, u, qu, tmp);
    let g = 0;
    for (let i = 0; i < m; i++) { const dbi = p[i] - qu[i]; g += lambda * Math.abs(dbi) - u[i] * dbi; }
    // start no closer to the end of the central path than a surrogate gap of 1e-6 of the null deviance
    t = Math.min(Math.max(1 / lambda, (2 * m) / Math.max(g, 1e-300)), (2 * m) / (1e-6 * e0 + 1e-300));
  } else {
    t = 1 / lambda;
  }
  for (let i = 0; i < m; i++) { mu1[i] = 1 / (t * -f1[i]); mu2[i] = 1 / (t * -f2[i]); }

  let iter = 0;
  let achieved = Infinity;
  let gapAbs = Infinity;
  let objective = NaN;
  let converged = false;
  const best = { achieved: Infinity, gap: Infinity, objective: NaN, b: new Float64Array(n), u: new Float64Array(m) };
  const alpha = 0.01, beta = 0.5, mufac = 10;
  for (;;) {
    applyDifferenceGram(rows, winv, q, u, qu, tmp);
    // b = y - W^{-1} D^T u ; D b = p - Q u
    differenceTranspose(x, q, u, tmp);
    let obj = 0;
    for (let i = 0; i < n; i++) { const r = winv[i] * tmp[i]; b[i] = y[i] - r; obj += 0.5 * w[i] * r * r; }
    let l1 = 0, ud = 0;
    for (let i = 0; i < m; i++) { const v = p[i] - qu[i]; l1 += Math.abs(v); ud += u[i] * v; }
    obj += lambda * l1;
    objective = obj;
    gapAbs = Math.max(lambda * l1 - ud, 0);
    achieved = gapAbs / Math.max(obj, floor);
    if (!Number.isFinite(achieved)) break;
    if (achieved < best.achieved) { best.achieved = achieved; best.gap = gapAbs; best.objective = obj; best.b.set(b); best.u.set(u); }
    if (achieved <= tolerance) { converged = true; break; }
    if (iter >= maxIterations) break;
    iter++;
    let eta = 0;
    for (let i = 0; i < m; i++) eta -= f1[i] * mu1[i] + f2[i] * mu2[i];
    t = Math.max(t, (mufac * 2 * m) / eta);
    const it = 1 / t;
    let rnorm2 = 0;
    for (let i = 0; i < m; i++) {
      const r = qu[i] - p[i] + mu1[i] - mu2[i];
      rd[i] = r;
      const c1 = -mu1[i] * f1[i] - it;
      const c2 = -mu2[i] * f2[i] - it;
      rnorm2 += r * r + c1 * c1 + c2 * c2;
      // (Q + diag(mu1/-f1 + mu2/-f2)) du = -rd - c1/f1 + c2/f2
      du[i] = -r - c1 / f1[i] + c2 / f2[i];
    }
    mat.set(gram);
    for (let i = 0; i < m; i++) mat[i * wd] += mu1[i] / -f1[i] + mu2[i] / -f2[i];
    if (bandedCholesky(mat, m, q, PIVOT_FLOOR) >= 0) break;
    bandedCholeskySolve(mat, m, q, du);
    let finite = true;
    for (let i = 0; i < m; i++) if (!Number.isFinite(du[i])) { finite = false; break; }
    if (!finite) break;
    let smax = 1;
    for (let i = 0; i < m; i++) {
      const c1 = -mu1[i] * f1[i] - it;
      const c2 = -mu2[i] * f2[i] - it;
      dmu1[i] = (c1 - mu1[i] * du[i]) / f1[i];
      dmu2[i] = (c2 + mu2[i] * du[i]) / f2[i];
      if (dmu1[i] < 0) smax = Math.min(smax, -mu1[i] / dmu1[i]);
      if (dmu2[i] < 0) smax = Math.min(smax, -mu2[i] / dmu2[i]);
      if (du[i] > 0) smax = Math.min(smax, -f1[i] / du[i]);
      else if (du[i] < 0) smax = Math.min(smax, f2[i] / du[i]);
    }
    let s = 0.99 * smax;
    applyDifferenceGram(rows, winv, q, du, qdu, tmp);
    const rn = Math.sqrt(rnorm2);
    for (let ls = 0; ls < 60; ls++) {
      let r2 = 0;
      for (let i = 0; i < m; i++) {
        const ui = u[i] + s * du[i];
        const m1 = mu1[i] + s * dmu1[i];
        const m2 = mu2[i] + s * dmu2[i];
        const r = rd[i] + s * (qdu[i] + dmu1[i] - dmu2[i]);
        const c1 = -m1 * (ui - lambda) - it;
        const c2 = -m2 * (-ui - lambda) - it;
        r2 += r * r + c1 * c1 + c2 * c2;
      }
      if (Math.sqrt(r2) <= (1 - alpha * s) * rn) break;
      s *= beta;
    }
    for (let i = 0; i < m; i++) {
      u[i] += s * du[i];
      mu1[i] += s * dmu1[i];
      mu2[i] += s * dmu2[i];
      f1[i] = u[i] - lambda;
      f2[i] = -u[i] - lambda;
    }
  }
  // the best iterate seen (the last one unless the iteration broke down)
  return {
    b: best.b, u: best.u, gap: best.gap, objective: best.objective,
    status: { converged, iterations: iter, tolerance, achieved: best.achieved, stoppingRule: INTERIOR_POINT_RULE },
  };
}
