/**
 * Primal-dual interior-point solver for the mixed-smoothness trend on its dual (the method of
 * {@link trendDualInteriorPoint}, after S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, "l1 trend
 * filtering", SIAM Review 51 (2009) 339-360, extended to the sum of two components).
 *
 * Primal:  minimise P(a, c) = 1/2 ||y - a - c||_W^2 + lambda1 ||D(x, 2) a||_1 + lambda3 ||D(x, 4) c||_1.
 *
 * D(x, 4) = S D(x, 2) with S banded, (n - 4) x (n - 2), three entries per row (the recursion
 * D(x, j + 1) = D1 diag(j / (x_{i+j} - x_i)) D(x, j) of {@link differenceRows}; S is built by
 * forward substitution on the rows and tested for this identity). The residual v = W (y - a - c)
 * must be D(x, 2)^T u1 = D(x, 4)^T u3 with |u1| <= lambda1, |u3| <= lambda3; since D(x, 2)^T is
 * injective, u1 = S^T u3, so with u = u3 and Q = D(x, 4) W^{-1} D(x, 4)^T (half-bandwidth 4):
 *
 * Dual:    minimise 1/2 u^T Q u - u^T D(x, 4) y  subject to |u| <= lambda3 and |S^T u| <= lambda1,
 *          with the fitted sum f = a + c = y - W^{-1} D(x, 4)^T u.
 *
 * The multipliers of the two constraint sets are the primal differences: alpha = D(x, 2) a
 * (kinks) on |S^T u| <= lambda1 and D(x, 4) c on |u| <= lambda3. Each iteration factors
 * Q + diag(box terms) + S diag(kink terms) S^T (banded, half-bandwidth 4) once and solves twice:
 * Mehrotra's predictor-corrector (S. Mehrotra, SIAM J. Optim. 2 (1992) 575-601; S. J. Wright,
 * "Primal-Dual Interior-Point Methods", SIAM 1997, ch. 10), a step of 0.99 of the longest one
 * keeping slacks and multipliers positive. O(n) per iteration, no dense matrices.
 *
 * Stopping rule ({@link MIXED_INTERIOR_POINT_RULE}): the primal point is formed from the iterate,
 * a with D(x, 2) a = alpha (the kink multipliers) and c = f - a, so that
 *   gap = P(a, c) - dual objective = sum_j (lambda1 |alpha_j| - (S^T u)_j alpha_j)
 *                                    + sum_r (lambda3 |(D4 c)_r| - u_r (D4 c)_r)  >= 0
 * is a certificate whatever the iterate; iterations stop when gap / max(P, 1e-12 E0) is at
 * most the tolerance (E0 the constant fit's objective). Because P is 1-strongly convex in
 * the sum a + c (W-norm), ||f - f*||_W <= sqrt(2 gap). Stalls (8 iterations without halving
 * the best gap, or a step that is not finite) end the iterations, reported as not converged;
 * the best iterate is returned.
 *
 * Returned components: a is integrated from alpha (a_0 = a_1 = 0), c = f - a, and the weighted
 * straight-line part of c is moved to a, which changes neither penalty; the gap reported is that
 * of this point. alpha is kept whole: off the knots its entries are of the order of the gap,
 * and setting them to zero moves D(x, 4) c by S alpha, which raised the relative gap from 1e-10
 * to 2e-8 .. 1e-7 on the cvxopt reference cases. Knot rows (kinks and bends) are those whose
 * multiplier exceeds a share of its slack ({@link KNOT_SLACK_SHARE}), the strictly complementary
 * classification, exact once the gap is small enough; the returned a and c are within the gap of
 * piecewise polynomials on them.
 *
 * Limitation: Q is ill-conditioned over long knot-free stretches (see trendDualInteriorPoint),
 * so at penalties near the top of a path on long series the method can stall; the caller then
 * uses another solver. Works in scaled units (unit mean spacing, y of sd 1). Unchecked.
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { differenceOperator, differenceTranspose } from '../../linalg/difference';
import { differenceGram, applyDifferenceGram } from '../../linalg/differenceGram';
import type { SolverStatus } from '../../types';
import { constantFitObjective } from '../trend/constantFitObjective';
import { weightedPolynomialFit } from '../../linalg/weightedPolynomialFit';
import type { MixedOperators } from './mixedAdmm';

/** Pieces shared by solves on the same x and w: the ADMM's operators (rows of D(x, 2) and D(x, 4)) and these. */
export interface MixedDualOperator extends MixedOperators {
  winv: Float64Array;
  /** Rows of S with D(x, 4) = S D(x, 2): row r holds S(r, r .. r + 2). */
  s: Float64Array;
  /** Band of Q = D(x, 4) W^{-1} D(x, 4)^T, half-bandwidth 4. */
  gram: Float64Array;
}

/**
 * S with D(x, 4) = S D(x, 2), by forward substitution on the first three columns of each row
 * of D(x, 4) (row r of D(x, 4) spans columns r .. r + 4, row r + p of D(x, 2) columns r + p .. r + p + 2).
 * Unchecked.
 */
export function kinkToBendRows(r2: Float64Array, r4: Float64Array, n: number): Float64Array {
  const m = n - 4;
  const s = new Float64Array(3 * m);
  for (let r = 0; r < m; r++) {
    const d0 = r4[5 * r], d1 = r4[5 * r + 1], d2 = r4[5 * r + 2];
    const s0 = d0 / r2[3 * r];
    const s1 = (d1 - s0 * r2[3 * r + 1]) / r2[3 * (r + 1)];
    const s2 = (d2 - s0 * r2[3 * r + 2] - s1 * r2[3 * (r + 1) + 1]) / r2[3 * (r + 2)];
    s[3 * r] = s0; s[3 * r + 1] = s1; s[3 * r + 2] = s2;
  }
  return s;
}

/** Builds the {@link MixedDualOperator} on the ADMM's operators of the same points. O(n). Unchecked: n >= 6, x strictly increasing. */
export function mixedDualOperator(ops: MixedOperators): MixedDualOperator {
  const winv = Float64Array.from(ops.w, (v) => 1 / v);
  return { ...ops, winv, s: kinkToBendRows(ops.r2, ops.r4, ops.x.length), gram: differenceGram(ops.r4, winv, 4) };
}

/** Result in the scaled units the problem was given in. */
export interface MixedDualSolution {
  kinks: Float64Array;
  bends: Float64Array;
  /** Rows of D(x, 2) where the kinks bend and of D(x, 4) where the bends have knots. */
  kinkRows: number[];
  bendRows: number[];
  /** The dual u (bends' box) at the returned point. */
  u: Float64Array;
  /** Duality gap of the returned point (absolute) and its primal objective. */
  gap: number;
  objective: number;
  status: SolverStatus;
}

export const MIXED_INTERIOR_POINT_RULE = 'primal-dual interior point on the dual of the mixed problem (Mehrotra predictor-corrector): relative duality gap of the returned kinks and bends at most the tolerance (stopping early after 8 iterations without halving it)';

const STALL_ITERATIONS = 8;
/**
 * A row is a knot when its multiplier exceeds this share of its slack. Exact complementarity would put the line
 * at 1, but at a gap of 1e-7 knots with tiny jumps still have multipliers below their slacks. Against exact fits
 * (the same penalties finished by the exact block steps: 93 path points of six invented series of 156 to 730
 * points, two widths) the bend knots were off by 1.43 on average at 1 (38 points short, 5 over), 0.69 at 0.1 and
 * 0.47 at 0.01 (18 short, 16 over); the kinks by 0.06 to 0.14; at 0.001 the kinks were off by 0.38.
 */
const KNOT_SLACK_SHARE = 0.01;
const PIVOT_FLOOR = 1e-14;

/** out = S z (length n - 4, z of length n - 2). Unchecked. */
function applyS(s: Float64Array, z: Float64Array, out: Float64Array): void {
  for (let r = 0; r < out.length; r++) out[r] = s[3 * r] * z[r] + s[3 * r + 1] * z[r + 1] + s[3 * r + 2] * z[r + 2];
}

/** out = S^T u (length n - 2). Unchecked. */
function applySt(s: Float64Array, u: Float64Array, out: Float64Array): void {
  out.fill(0);
  for (let r = 0; r < u.length; r++) { const v = u[r]; out[r] += s[3 * r] * v; out[r + 1] += s[3 * r + 1] * v; out[r + 2] += s[3 * r + 2] * v; }
}

/**
 * Solves the mixed problem at (lambda1, lambda3) from a cold start.
 *
 * @param op - operator of x and w ({@link mixedDualOperator})
 * @param y - values (scaled)
 * @param lambda1 - penalty on D(x, 2) a, > 0
 * @param lambda3 - penalty on D(x, 4) c, > 0
 * @param tolerance - relative duality gap to stop at
 * @param maxIterations - Newton-step limit
 * @example
 * ```ts
 * const sol = mixedDualInteriorPoint(mixedDualOperator(mixedOperators(x, w)), y, 2, 50, 1e-8, 100);
 * ```
 * Unchecked.
 */
export function mixedDualInteriorPoint(op: MixedDualOperator, y: Float64Array, lambda1: number, lambda3: number, tolerance: number, maxIterations: number): MixedDualSolution {
  const { x, w, winv, r2, r4, s: S, gram } = op;
  const n = x.length, m = n - 4, k = n - 2, wd = 5;
  const e0 = constantFitObjective(y, w);
  const floor = 1e-12 * e0 + 1e-300;
  const p = differenceOperator(x, 4, y, new Float64Array(m));
  const u = new Float64Array(m), g = new Float64Array(k);
  // box slacks s1 = lambda3 - u, s2 = lambda3 + u (multipliers m1, m2); kink slacks t1 = lambda1 - g, t2 = lambda1 + g (n1, n2)
  const m1 = new Float64Array(m).fill(1), m2 = new Float64Array(m).fill(1);
  const n1 = new Float64Array(k).fill(1), n2 = new Float64Array(k).fill(1);
  const qu = new Float64Array(m), rd = new Float64Array(m), tmp = new Float64Array(n);
  const alpha = new Float64Array(k), sa = new Float64Array(m);
  const mat = new Float64Array(m * wd);
  const du = new Float64Array(m), dg = new Float64Array(k);
  const dm1 = new Float64Array(m), dm2 = new Float64Array(m), dn1 = new Float64Array(k), dn2 = new Float64Array(k);
  const c1 = new Float64Array(m), c2 = new Float64Array(m), e1 = new Float64Array(k), e2 = new Float64Array(k);
  const rhs = new Float64Array(m), hk = new Float64Array(k), dk = new Float64Array(k);
  const best = { achieved: Infinity, u: new Float64Array(m), n1: new Float64Array(k), n2: new Float64Array(k), m1: new Float64Array(m), m2: new Float64Array(m) };
  const N = 2 * m + 2 * k;

  /** Gap and objective at (u, alpha): D4 c = D4 f - S alpha with D4 f = p - Q u. */
  const gapAt = (): { gap: number; obj: number } => {
    applyS(S, alpha, sa);
    let gk = 0, gb = 0, l1 = 0, l3 = 0, uqu = 0;
    for (let j = 0; j < k; j++) { const a = alpha[j], aa = a < 0 ? -a : a; l1 += aa; gk += lambda1 * aa - g[j] * a; }
    for (let r = 0; r < m; r++) {
      const b = p[r] - qu[r] - sa[r];
      const bb = b < 0 ? -b : b; l3 += bb; gb += lambda3 * bb - u[r] * b; uqu += u[r] * qu[r];
    }
    return { gap: Math.max(gk + gb, 0), obj: 0.5 * uqu + lambda1 * l1 + lambda3 * l3 };
  };

  /** Longest step <= 1 keeping slacks and multipliers non-negative. */
  const longest = (): number => {
    let t = 1;
    for (let i = 0; i < m; i++) {
      const s1 = lambda3 - u[i], s2 = lambda3 + u[i], d = du[i];
      if (dm1[i] < 0 && t * -dm1[i] > m1[i]) t = m1[i] / -dm1[i];
      if (dm2[i] < 0 && t * -dm2[i] > m2[i]) t = m2[i] / -dm2[i];
      if (d > 0) { if (t * d > s1) t = s1 / d; } else if (d < 0) { if (t * -d > s2) t = s2 / -d; }
    }
    for (let j = 0; j < k; j++) {
      const t1 = lambda1 - g[j], t2 = lambda1 + g[j], d = dg[j];
      if (dn1[j] < 0 && t * -dn1[j] > n1[j]) t = n1[j] / -dn1[j];
      if (dn2[j] < 0 && t * -dn2[j] > n2[j]) t = n2[j] / -dn2[j];
      if (d > 0) { if (t * d > t1) t = t1 / d; } else if (d < 0) { if (t * -d > t2) t = t2 / -d; }
    }
    return t;
  };

  /** du from the factored matrix for complementarity targets tau and corrections (c1, c2, e1, e2); then dg and the multiplier steps. */
  const direction = (tau: number): void => {
    for (let j = 0; j < k; j++) {
      const t1 = lambda1 - g[j], t2 = lambda1 + g[j];
      hk[j] = (tau - n1[j] * t1 - e1[j]) / t1 - (tau - n2[j] * t2 - e2[j]) / t2;
    }
    applyS(S, hk, rhs);
    for (let i = 0; i < m; i++) {
      const s1 = lambda3 - u[i], s2 = lambda3 + u[i];
      rhs[i] = -rd[i] - rhs[i] - ((tau - m1[i] * s1 - c1[i]) / s1 - (tau - m2[i] * s2 - c2[i]) / s2);
    }
    du.set(rhs);
    bandedCholeskySolve(mat, m, 4, du);
    applySt(S, du, dg);
    for (let i = 0; i < m; i++) {
      const s1 = lambda3 - u[i], s2 = lambda3 + u[i];
      dm1[i] = (tau - m1[i] * s1 - c1[i] + m1[i] * du[i]) / s1;
      dm2[i] = (tau - m2[i] * s2 - c2[i] - m2[i] * du[i]) / s2;
    }
    for (let j = 0; j < k; j++) {
      const t1 = lambda1 - g[j], t2 = lambda1 + g[j];
      dn1[j] = (tau - n1[j] * t1 - e1[j] + n1[j] * dg[j]) / t1;
      dn2[j] = (tau - n2[j] * t2 - e2[j] - n2[j] * dg[j]) / t2;
    }
  };

  let iter = 0, lastGain = 0, converged = false;
  for (;;) {
    applyDifferenceGram(r4, winv, 4, u, qu, tmp);
    applySt(S, u, g);
    for (let j = 0; j < k; j++) alpha[j] = n1[j] - n2[j];
    const { gap, obj } = gapAt();
    const achieved = gap / Math.max(obj, floor);
    if (!Number.isFinite(achieved)) break;
    if (achieved < best.achieved) {
      if (achieved < 0.5 * best.achieved) lastGain = iter;
      best.achieved = achieved; best.u.set(u); best.n1.set(n1); best.n2.set(n2); best.m1.set(m1); best.m2.set(m2);
    }
    if (achieved <= tolerance) { converged = true; break; }
    if (iter >= maxIterations || iter - lastGain >= STALL_ITERATIONS) break;
    iter++;
    // dual residual rd = Q u - p + (m1 - m2) + S (n1 - n2), complementarity, and the Newton matrix
    for (let j = 0; j < k; j++) dk[j] = n1[j] - n2[j];
    applyS(S, dk, rd);
    let comp = 0;
    mat.set(gram);
    for (let i = 0; i < m; i++) {
      const s1 = lambda3 - u[i], s2 = lambda3 + u[i];
      rd[i] += qu[i] - p[i] + m1[i] - m2[i];
      comp += m1[i] * s1 + m2[i] * s2;
      mat[i * wd] += m1[i] / s1 + m2[i] / s2;
    }
    for (let j = 0; j < k; j++) {
      const t1 = lambda1 - g[j], t2 = lambda1 + g[j];
      comp += n1[j] * t1 + n2[j] * t2;
      dk[j] = n1[j] / t1 + n2[j] / t2;
    }
    // S diag(dk) S^T: row r of S spans columns r .. r + 2, so entries (r, r - d) for d <= 2
    for (let r = 0; r < m; r++) {
      for (let d = 0; d <= 2 && d <= r; d++) {
        const q = r - d;
        let v = 0;
        for (let col = r; col <= q + 2; col++) v += S[3 * r + (col - r)] * dk[col] * S[3 * q + (col - q)];
        mat[r * wd + d] += v;
      }
    }
    if (bandedCholesky(mat, m, 4, PIVOT_FLOOR) >= 0) break;
    // predictor (affine scaling)
    c1.fill(0); c2.fill(0); e1.fill(0); e2.fill(0);
    direction(0);
    const aff = longest();
    let compAff = 0;
    for (let i = 0; i < m; i++) compAff += (m1[i] + aff * dm1[i]) * (lambda3 - u[i] - aff * du[i]) + (m2[i] + aff * dm2[i]) * (lambda3 + u[i] + aff * du[i]);
    for (let j = 0; j < k; j++) compAff += (n1[j] + aff * dn1[j]) * (lambda1 - g[j] - aff * dg[j]) + (n2[j] + aff * dn2[j]) * (lambda1 + g[j] + aff * dg[j]);
    const sigma = Math.pow(Math.max(compAff, 0) / Math.max(comp, 1e-300), 3);
    // corrector: second-order terms of the predictor (ds1 = -du, ds2 = du, dt1 = -dg, dt2 = dg)
    for (let i = 0; i < m; i++) { c1[i] = -du[i] * dm1[i]; c2[i] = du[i] * dm2[i]; }
    for (let j = 0; j < k; j++) { e1[j] = -dg[j] * dn1[j]; e2[j] = dg[j] * dn2[j]; }
    direction(sigma * comp / N);
    const smax = longest();
    let finite = Number.isFinite(smax);
    for (let i = 0; i < m && finite; i++) if (!Number.isFinite(du[i])) finite = false;
    if (!finite) break;
    const step = Math.min(1, 0.99 * smax);
    for (let i = 0; i < m; i++) { u[i] += step * du[i]; m1[i] += step * dm1[i]; m2[i] += step * dm2[i]; }
    for (let j = 0; j < k; j++) { n1[j] += step * dn1[j]; n2[j] += step * dn2[j]; }
  }

  // the best iterate; knots where a multiplier exceeds its slack
  u.set(best.u);
  applyDifferenceGram(r4, winv, 4, u, qu, tmp);
  applySt(S, u, g);
  const kinkRows: number[] = [];
  for (let j = 0; j < k; j++) {
    alpha[j] = best.n1[j] - best.n2[j];
    if (best.n1[j] > KNOT_SLACK_SHARE * (lambda1 - g[j]) || best.n2[j] > KNOT_SLACK_SHARE * (lambda1 + g[j])) kinkRows.push(j);
  }
  const { gap, obj } = gapAt();
  const bendRows: number[] = [];
  for (let r = 0; r < m; r++) if (best.m1[r] > KNOT_SLACK_SHARE * (lambda3 - u[r]) || best.m2[r] > KNOT_SLACK_SHARE * (lambda3 + u[r])) bendRows.push(r);
  // f = y - W^{-1} D4^T u; a from D(x, 2) a = alpha with a_0 = a_1 = 0; c = f - a; the line of c moved to a
  differenceTranspose(x, 4, u, tmp);
  const f = Float64Array.from(y, (v, i) => v - winv[i] * tmp[i]);
  const a = new Float64Array(n);
  for (let j = 0; j < k; j++) a[j + 2] = (alpha[j] - r2[3 * j] * a[j] - r2[3 * j + 1] * a[j + 1]) / r2[3 * j + 2];
  const c = Float64Array.from(f, (v, i) => v - a[i]);
  const line = weightedPolynomialFit(x, c, w, 1);
  for (let i = 0; i < n; i++) { c[i] -= line[i]; a[i] += line[i]; }
  const achieved = gap / Math.max(obj, floor);
  return {
    kinks: a, bends: c, kinkRows, bendRows, u: Float64Array.from(u), gap, objective: obj,
    status: { converged: converged && achieved <= tolerance, iterations: iter, tolerance, achieved, stoppingRule: MIXED_INTERIOR_POINT_RULE },
  };
}
