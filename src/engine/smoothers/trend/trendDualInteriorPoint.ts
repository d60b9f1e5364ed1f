/**
 * Primal-dual interior-point solver for trend filtering on its dual, after
 * S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, "l1 trend filtering",
 * SIAM Review 51 (2009), with weights and unequal spacing.
 *
 * Primal:  minimise P(b) = 1/2 sum_i w_i (y_i - b_i)^2 + lambda ||D b||_1,  D = D(x, k+1).
 * Dual:    minimise 1/2 u^T Q u - u^T D y  subject to |u_j| <= lambda,  Q = D W^{-1} D^T,
 *          with b = y - W^{-1} D^T u.
 * Each iteration factors Q + diag(mu1 / s1 + mu2 / s2) (Q banded, half-bandwidth
 * k + 1) once by banded Cholesky and solves twice: Mehrotra's predictor-corrector
 * (S. Mehrotra, "On the implementation of a primal-dual interior point method",
 * SIAM J. Optim. 2 (1992); S. J. Wright, "Primal-Dual Interior-Point Methods",
 * SIAM 1997, ch. 10): an affine-scaling predictor, centring sigma = (mu_aff / mu)^3,
 * and a second-order corrector, then a step of 0.99 of the longest one keeping
 * u strictly inside the box and the multipliers positive. O(n k^2) per
 * iteration, no dense matrices.
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
 * iterate seen is returned; a breakdown (non-finite step), 8 iterations
 * without halving the best gap, or 3 iterations in a row whose gap rose end the iterations
 * (on order 1 at 1e5 points, lambda 10,000 of the bench series the gap reaches 3.3e-7 at the
 * 21st iteration and then rises: the 8-iteration rule alone ran 27 iterations, this one 24; on
 * nine seeded series (orders 1 to 3, 500 to 10,000 points, single fits and cross-validation) the
 * fitted values and cross-validation curves were the same bit for bit, with up to 5 fewer
 * iterations per fit).
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { differenceRows } from '../../linalg/differenceRows';
import { differenceOperator, differenceTranspose } from '../../linalg/difference';
import type { SolverStatus } from '../../types';
import { differenceGram, applyDifferenceGram } from '../../linalg/differenceGram';
import { constantFitObjective } from './constantFitObjective';
import { maxAbs } from '../../linalg/maxAbs';
import { scaledInto } from '../../linalg/scaledInto';
import { FIRST_CALL_POINTS } from '../../linalg/firstCallPoints';

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
  /** Work space of {@link trendDualInteriorPoint} on this operator, built on its first solve. */
  work?: InteriorWork;
}

/**
 * Arrays of one interior-point solve that do not outlive it, kept on the operator so that the solves
 * along a path or a fold's penalties (on the same x and w) reuse them instead of allocating about
 * a dozen arrays of n each time. Solves are synchronous, so two never share them at once. Unchecked.
 */
export interface InteriorWork {
  dy: Float64Array; u: Float64Array; mu1: Float64Array; mu2: Float64Array;
  qu: Float64Array; rd: Float64Array; du: Float64Array; dmu1: Float64Array; dmu2: Float64Array; mat: Float64Array;
  inv1: Float64Array; inv2: Float64Array; du2: Float64Array; tmp: Float64Array;
}

/** The operator's {@link InteriorWork}, built on first use (m dual rows, n points, band width wd). Unchecked. */
function interiorWork(op: TrendOperator, n: number, m: number, wd: number): InteriorWork {
  if (!op.work || op.work.u.length !== m || op.work.tmp.length !== n) {
    const a = () => new Float64Array(m);
    op.work = {
      dy: new Float64Array(n), u: a(), mu1: a(), mu2: a(), qu: a(), rd: a(), du: a(), dmu1: a(), dmu2: a(),
      mat: new Float64Array(m * wd), inv1: a(), inv2: a(), du2: a(), tmp: new Float64Array(n),
    };
  }
  return op.work;
}

/** Builds the {@link TrendOperator} for x, w and order k. O(n k^2). Unchecked. */
export function trendOperator(x: Float64Array, w: Float64Array, k: number): TrendOperator {
  const winv = reciprocals(w);
  const rows = differenceRows(x, k + 1);
  return { x, w, winv, k, rows, gram: differenceGram(rows, winv, k + 1) };
}

/** 1 / w_i (a loop of its own: DEVELOPERS.md, "Long loops and the first call"). Unchecked. */
function reciprocals(w: Float64Array): Float64Array {
  const winv = new Float64Array(w.length);
  for (let i = 0; i < w.length; i++) winv[i] = 1 / w[i];
  return winv;
}

/**
 * Relative pivot floor of the Newton-step factorisation: Q is numerically
 * singular on long series (see the limitation above); its near-null directions
 * are smooth dual vectors that D^T maps to almost nothing, so flooring those
 * pivots perturbs the primal step little and keeps the step defined.
 * Convergence is judged by the gap, computed directly, never by the step.
 */
const PIVOT_FLOOR = 1e-14;

/** Iterations in a row whose gap rose, after which the method is considered stalled (the Newton steps have lost their accuracy). */
const STALL_RISES = 3;

/** Iterations without halving the best gap after which the method is considered stalled. */
const STALL_ITERATIONS = 8;

/** The stopping rule of {@link trendDualInteriorPoint}, as reported in SolverStatus. */
export const INTERIOR_POINT_RULE = 'relative duality gap (lambda*||Db||_1 - u.Db) / max(primal objective, 1e-12 * null deviance) at most the tolerance (stopping early after 8 iterations without halving it, or 3 in a row in which it rose)';

/**
 * Solves one trend-filtering problem by the dual interior-point method.
 *
 * @param op - operator for x, w, k
 * @param y - values
 * @param lambda - penalty > 0 (units of the problem as passed in)
 * @param tolerance - relative duality gap to stop at
 * @param maxIterations - Newton-step limit
 * @param u0 - optional warm start (a dual from a nearby lambda); scaled so that max |u| <= 0.95 lambda
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
  const e0 = constantFitObjective(y, w);
  const floor = 1e-12 * e0 + 1e-300;

  // the operator's work space (every array written before it is read, u zeroed below); b and the
  // best dual are returned, so they are new
  const { dy, u, mu1, mu2, qu, rd, du, dmu1, dmu2, mat, inv1, inv2, du2, tmp } = interiorWork(op, n, m, wd);
  // p = D y, written in dy (a view of its first m entries)
  const p = differenceOperator(x, q, y, dy);
  u.fill(0);
  const b = new Float64Array(n);

  // the solver's own loops are kernels of their own (DEVELOPERS.md, "Long loops and the first call")
  if (u0 && u0.length === m) warmStartDual(u0, lambda, u, m);
  // Q u of the start and, in the same pass, the sums of its objective and gap (the loop's first)
  const sums = new Float64Array(3);
  applyDifferenceGram(rows, winv, q, u, qu, tmp, p, sums);
  let t: number;
  if (u0) {
    const g = startGap(p, qu, u, lambda, m);
    // start no closer to the end of the central path than a surrogate gap of 1e-6 of the null deviance
    t = Math.min(Math.max(1 / lambda, (2 * m) / Math.max(g, 1e-300)), (2 * m) / (1e-6 * e0 + 1e-300));
  } else {
    t = 1 / lambda;
  }
  startMultipliers(t, lambda, u, mu1, mu2, m);

  let iter = 0;
  let achieved = Infinity;
  let gapAbs = Infinity;
  let converged = false;
  const best = { achieved: Infinity, gap: Infinity, objective: NaN, u: new Float64Array(m) };
  const fraction = 0.99;
  let lastGain = 0;
  let rises = 0, previous = Infinity;
  for (;;) {
    // with b = y - W^{-1} D^T u: 1/2 sum w (y - b)^2 = 1/2 u.Q u and D b = p - Q u, so the
    // objective and the gap need no b (formed once, for the best iterate, at the end)
    const l1 = sums[0], ud = sums[1], uqu = sums[2];
    const obj = 0.5 * uqu + lambda * l1;
    gapAbs = Math.max(lambda * l1 - ud, 0);
    achieved = gapAbs / Math.max(obj, floor);
    if (!Number.isFinite(achieved)) break;
    rises = achieved > previous ? rises + 1 : 0;
    previous = achieved;
    if (achieved < best.achieved) {
      if (achieved < 0.5 * best.achieved) lastGain = iter;
      best.achieved = achieved; best.gap = gapAbs; best.objective = obj; best.u.set(u);
    }
    if (achieved <= tolerance) { converged = true; break; }
    if (iter >= maxIterations) break;
    if (iter - lastGain >= STALL_ITERATIONS) break; // stalled: the best gap has not halved for a while
    if (rises >= STALL_RISES) break; // stalled: the gap rose in each of the last iterations
    iter++;
    // the Newton system (the Gram band copied, its diagonal raised by mu1 / s1 + mu2 / s2) and, in the
    // same pass, the complementarity mu . s and the predictor's right side (affine scaling: sigma = 0).
    // The box constraints' values f1 = u - lambda, f2 = -u - lambda (slacks s1 = -f1, s2 = -f2) are
    // formed from u in each kernel that uses them (the numbers two stored arrays held, with less
    // memory traffic); the reciprocal slacks once, here (the loops below multiply)
    const comp = newtonSystem(lambda, u, mu1, mu2, qu, p, inv1, inv2, rd, gram, mat, wd, m, du);
    const muAvg = comp / (2 * m);
    if (bandedCholesky(mat, m, q, PIVOT_FLOOR) >= 0) break;
    bandedCholeskySolve(mat, m, q, du);
    const aff = affineMultiplierStep(du, mu1, mu2, inv1, inv2, dmu1, dmu2, lambda, u, m);
    const compAff = complementarityAfter(aff, du, dmu1, dmu2, mu1, mu2, lambda, u, m);
    const sigma = Math.pow(Math.max(compAff, 0) / Math.max(comp, 1e-300), 3);
    const target = sigma * muAvg;
    // corrector: mu1 s1 = target - ds1_aff dmu1_aff, with ds1 = -du, ds2 = du; its right side
    // replaces du in place (du2 and tmp keep c1 and c2 for the multiplier step)
    correctorRightSide(target, du, dmu1, dmu2, mu1, mu2, lambda, u, rd, inv1, inv2, du, du2, tmp, m);
    bandedCholeskySolve(mat, m, q, du);
    const smax = correctorMultiplierStep(target, du, mu1, mu2, lambda, u, inv1, inv2, du2, tmp, dmu1, dmu2, m);
    if (!Number.isFinite(smax)) break;
    const step = Math.min(1, fraction * smax);
    // the step and, in the same pass, Q u and the sums of the objective and the gap (first over a
    // few rows, then the rest: DEVELOPERS.md, "Long loops and the first call")
    tmp.fill(0);
    sums[0] = 0; sums[1] = 0; sums[2] = 0;
    const head = Math.min(m, FIRST_CALL_POINTS);
    stepAndGram(step, du, dmu1, dmu2, u, mu1, mu2, rows, winv, q, tmp, qu, p, sums, 0, head, m);
    stepAndGram(step, du, dmu1, dmu2, u, mu1, mu2, rows, winv, q, tmp, qu, p, sums, head, m, m);
    stepAndGram(step, du, dmu1, dmu2, u, mu1, mu2, rows, winv, q, tmp, qu, p, sums, m, m + q, m);
  }
  // the best iterate seen (the last one unless the iteration broke down); b = y - W^{-1} D^T u
  differenceTranspose(x, q, best.u, tmp);
  primalFromDual(y, winv, tmp, b);
  return {
    b, u: best.u, gap: best.gap, objective: best.objective,
    status: { converged, iterations: iter, tolerance, achieved: best.achieved, stoppingRule: INTERIOR_POINT_RULE },
  };
}

/** The warm start scaled into the new box, keeping its shape: max |u| -> 0.95 lambda (u = u0 when inside). Unchecked. */
function warmStartDual(u0: Float64Array, lambda: number, u: Float64Array, m: number): void {
  const um = maxAbs(u0);
  scaledInto(um > 0.95 * lambda ? (0.95 * lambda) / um : 1, u0, u, m);
}

/** The duality gap of a warm start: sum lambda |D b| - u.D b, with D b = p - Q u. Unchecked. */
function startGap(p: Float64Array, qu: Float64Array, u: Float64Array, lambda: number, m: number): number {
  let g = 0;
  for (let i = 0; i < m; i++) { const dbi = p[i] - qu[i]; g += lambda * Math.abs(dbi) - u[i] * dbi; }
  return g;
}

/** The multipliers on the central path at t: mu = 1 / (t s). Unchecked. */
function startMultipliers(t: number, lambda: number, u: Float64Array, mu1: Float64Array, mu2: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) { const f1 = u[i] - lambda, f2 = -u[i] - lambda; mu1[i] = 1 / (t * -f1); mu2[i] = 1 / (t * -f2); }
}

/** b = y - W^{-1} D^T u, with D^T u given in dtu. Unchecked. */
function primalFromDual(y: Float64Array, winv: Float64Array, dtu: Float64Array, b: Float64Array): void {
  for (let i = 0; i < y.length; i++) b[i] = y[i] - winv[i] * dtu[i];
}

// The kernels of one interior-point iteration, each a loop over the m dual rows. They are separate
// functions so that the first call's compiler works on small bodies: a loop inside the long solver
// made Node compile the whole solver on the spot once per loop. Unchecked.

/**
 * The Newton system: mat = the Gram band with mu1 / s1 + mu2 / s2 added to its diagonal; the
 * reciprocal slacks, the dual residual rd = Q u - p + mu1 - mu2, the predictor's right side
 * du = -rd + mu1 - mu2 (sigma = 0), and the complementarity mu . s returned. Slacks s1 = -f1, s2 = -f2
 * with f1 = u - lambda, f2 = -u - lambda. Unchecked.
 */
function newtonSystem(lambda: number, u: Float64Array, mu1: Float64Array, mu2: Float64Array, qu: Float64Array, p: Float64Array, inv1: Float64Array, inv2: Float64Array, rd: Float64Array, gram: Float64Array, mat: Float64Array, wd: number, m: number, du: Float64Array): number {
  let comp = 0;
  for (let i = 0; i < m; i++) {
    const s1 = -(u[i] - lambda), s2 = -(-u[i] - lambda);
    const i1 = 1 / s1, i2 = 1 / s2;
    inv1[i] = i1; inv2[i] = i2;
    comp += mu1[i] * s1 + mu2[i] * s2;
    const r = qu[i] - p[i] + mu1[i] - mu2[i];
    rd[i] = r;
    const o = i * wd;
    mat[o] = gram[o] + (mu1[i] * i1 + mu2[i] * i2);
    for (let d = 1; d < wd; d++) mat[o + d] = gram[o + d];
    du[i] = -r + mu1[i] - mu2[i];
  }
  return comp;
}

/**
 * The predictor's multiplier steps, dmu1 = (-mu1 s1 + mu1 du) / s1 and dmu2 = (-mu2 s2 - mu2 du) / s2,
 * and, in the same pass, the longest step t <= 1 along (du, dmu1, dmu2) that keeps the slacks s1 = -f1,
 * s2 = -f2 (s1 - t du, s2 + t du) and the multipliers mu1, mu2 non-negative. Limits are compared
 * before dividing (t b > a for b > 0 rather than t > a / b), each limit by {@link tighterStep}: the
 * rarely taken updates of t then hold no operation of their own whose type the compiler has not yet
 * seen (written out, their negations and divisions threw the compiled kernels away three to five times
 * in a fresh fit; with the one small function, which the compiler inlines, a fresh order-1 fit at 1e4
 * compiled the two step kernels 4 times instead of 9 and took about 5% less CPU time, warm solves the
 * same). The rule is written out here and in {@link correctorMultiplierStep}: as a function of one
 * whole row it was measured to make an iteration at 8,000 points 10 to 30% slower. Unchecked.
 */
function affineMultiplierStep(du: Float64Array, mu1: Float64Array, mu2: Float64Array, inv1: Float64Array, inv2: Float64Array, dmu1: Float64Array, dmu2: Float64Array, lambda: number, u: Float64Array, m: number): number {
  let t = 1;
  for (let i = 0; i < m; i++) {
    const d = du[i];
    const s1 = -(u[i] - lambda), s2 = -(-u[i] - lambda);
    const d1 = -mu1[i] + mu1[i] * d * inv1[i];
    const d2 = -mu2[i] - mu2[i] * d * inv2[i];
    dmu1[i] = d1; dmu2[i] = d2;
    if (d1 < 0) t = tighterStep(t, mu1[i], -d1);
    if (d2 < 0) t = tighterStep(t, mu2[i], -d2);
    if (d > 0) t = tighterStep(t, s1, d);
    else if (d < 0) t = tighterStep(t, s2, -d);
  }
  return t;
}

/**
 * The step length t, or a / b when a step of t along a rate b > 0 would use up more than the room a
 * (compared before dividing: t b > a). One function for the four limits of the step rules, so that its
 * division has been seen by the compiler once any of them has been met. Unchecked.
 */
function tighterStep(t: number, a: number, b: number): number {
  return t * b > a ? a / b : t;
}

/** The complementarity after a step of length a along the predictor. Unchecked. */
function complementarityAfter(a: number, du: Float64Array, dmu1: Float64Array, dmu2: Float64Array, mu1: Float64Array, mu2: Float64Array, lambda: number, u: Float64Array, m: number): number {
  let c = 0;
  for (let i = 0; i < m; i++) {
    const f1 = u[i] - lambda, f2 = -u[i] - lambda;
    c += (mu1[i] + a * dmu1[i]) * (-f1 - a * du[i]) + (mu2[i] + a * dmu2[i]) * (-f2 + a * du[i]);
  }
  return c;
}

/**
 * The corrector's right side: with ds1 = -du, ds2 = du of the predictor, c1 = -du dmu1, c2 = du dmu2,
 * Q du + dmu1 - dmu2 = -rd, dmu1 = (-mu1 s1 + target - c1 + mu1 du) / s1, dmu2 = (-mu2 s2 + target - c2 - mu2 du) / s2;
 * c1 and c2 are kept for the multiplier step. `rhs` may be `du` itself (entry i is read before it is
 * written). Unchecked.
 */
function correctorRightSide(target: number, du: Float64Array, dmu1: Float64Array, dmu2: Float64Array, mu1: Float64Array, mu2: Float64Array, lambda: number, u: Float64Array, rd: Float64Array, inv1: Float64Array, inv2: Float64Array, rhs: Float64Array, c1s: Float64Array, c2s: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) {
    const s1 = -(u[i] - lambda), s2 = -(-u[i] - lambda);
    const d = du[i];
    const c1 = -d * dmu1[i], c2 = d * dmu2[i];
    rhs[i] = -rd[i] - (-mu1[i] * s1 + target - c1) * inv1[i] + (-mu2[i] * s2 + target - c2) * inv2[i];
    c1s[i] = c1;
    c2s[i] = c2;
  }
}

/**
 * The corrector's multiplier steps from its du and the kept c1, c2 and, in the same pass, the longest
 * step along them (the rule of {@link affineMultiplierStep}, written out); NaN when an entry of du is not finite. Unchecked.
 */
function correctorMultiplierStep(target: number, du: Float64Array, mu1: Float64Array, mu2: Float64Array, lambda: number, u: Float64Array, inv1: Float64Array, inv2: Float64Array, c1s: Float64Array, c2s: Float64Array, dmu1: Float64Array, dmu2: Float64Array, m: number): number {
  let t = 1, finite = true;
  for (let i = 0; i < m; i++) {
    const d = du[i];
    const f1 = u[i] - lambda, f2 = -u[i] - lambda;
    const d1 = (mu1[i] * f1 + target - c1s[i] + mu1[i] * d) * inv1[i];
    const d2 = (mu2[i] * f2 + target - c2s[i] - mu2[i] * d) * inv2[i];
    dmu1[i] = d1; dmu2[i] = d2;
    if (!Number.isFinite(d)) finite = false;
    if (d1 < 0) t = tighterStep(t, mu1[i], -d1);
    if (d2 < 0) t = tighterStep(t, mu2[i], -d2);
    if (d > 0) t = tighterStep(t, -f1, d);
    else if (d < 0) t = tighterStep(t, -f2, -d);
  }
  return finite ? t : NaN;
}

/**
 * Rows from .. to - 1 of the step and, in the same pass, of Q u = D W^{-1} D^T u for the new u
 * ({@link applyDifferenceGram}'s arithmetic in its order): u, mu1 and mu2 move by `step` along their
 * directions; row r of D^T u is scattered into tmp (zeroed by the caller), after which tmp_r is
 * complete and is scaled by 1 / w_r, and row r - q of D gathers (Q u)_{r-q} from tmp_{r-q} .. tmp_r,
 * with the sums [||p - Q u||_1, u.(p - Q u), u.Q u] carried in `sums` (read before the loop, written
 * after it). Rows r >= m (r < m + q, called last) only complete tmp_r and gather row r - q: the
 * caller's last call, over m .. m + q - 1, finishes the last q entries of tmp and rows m - q .. m - 1. Unchecked.
 */
export function stepAndGram(step: number, du: Float64Array, dmu1: Float64Array, dmu2: Float64Array, u: Float64Array, mu1: Float64Array, mu2: Float64Array, rows: Float64Array, winv: Float64Array, q: number, tmp: Float64Array, qu: Float64Array, p: Float64Array, sums: Float64Array, from: number, to: number, m: number): void {
  const wd = q + 1;
  let l1 = sums[0], ud = sums[1], uqu = sums[2];
  for (let r = from; r < to; r++) {
    if (r < m) {
      u[r] += step * du[r];
      mu1[r] += step * dmu1[r];
      mu2[r] += step * dmu2[r];
      const ur = u[r];
      const o = r * wd;
      for (let c = 0; c < wd; c++) tmp[r + c] += rows[o + c] * ur;
    }
    tmp[r] *= winv[r];
    const g = r - q;
    if (g >= 0) {
      const og = g * wd;
      let sg = 0;
      for (let c = 0; c <= q; c++) sg += rows[og + c] * tmp[g + c];
      qu[g] = sg;
      const v = p[g] - sg;
      l1 += Math.abs(v); ud += u[g] * v; uqu += u[g] * sg;
    }
  }
  sums[0] = l1; sums[1] = ud; sums[2] = uqu;
}

