/**
 * Solver of the mixed-smoothness trend: a sum of two trend-filtering components of
 * different orders, straight pieces with kinks (a) plus smooth bends (c):
 *
 *   minimise 1/2 sum_i w_i (y_i - a_i - c_i)^2 + lambda1 ||D(x, 2) a||_1 + lambda3 ||D(x, 4) c||_1
 *   subject to sum_i w_i c_i = 0 and sum_i w_i x_i c_i = 0.
 *
 * D(x, q) is the divided-difference operator of trend filtering on uneven x
 * ({@link differenceOperator}; R. J. Tibshirani, Ann. Statist. 42 (2014) 285-323). The null
 * spaces of D(x, 2) and D(x, 4) share the straight lines, so a line could move freely between
 * a and c; the constraint (c weighted-orthogonal to 1 and x) gives every straight line to a.
 * The sum a + c is unique (the loss is strictly convex in it); the split is unique up to that
 * constraint when the L1 terms do not tie (generic data).
 *
 * Method: first the dual interior point of {@link mixedDualInteriorPoint} (banded, O(n) per Newton step,
 * cold start) to the relative gap `interiorTolerance`; where it stalls above that (nearly knot-free fits on
 * long series), the ADMM of {@link mixedAdmm} from the given start, or, with `exactAfterStall`, the block steps
 * below from the interior point's best iterate. Path points and cross-validation folds otherwise stop there
 * (`refine` false). Then block coordinate descent on
 * the same machinery as the seasonal decomposition
 * (solveDecomposition.ts). With c minimised out exactly, the map
 *   F(a) = TF1(y - c*(a); lambda1),   c*(a) = (I - P) TF3(y - a; lambda3)
 * is an exact trend-filtering solve of order 3, the weighted projection P onto straight
 * lines removed, then an exact solve of order 1 ({@link solveTrend} for both). Removing the
 * line from the order-3 solve is exact: D(x, 4) does not see lines, so the constrained
 * minimiser over c is the unconstrained one less its weighted straight-line fit. F is a
 * proximal-gradient step of unit length on the a-block, so its fixed points are the
 * minimisers and plain steps never raise the objective (P. Tseng, J. Optim. Theory Appl.
 * 109 (2001) 475-494: the non-smooth terms are separable across the blocks). The iteration
 * is accelerated by Anderson mixing of the last 5 steps (D. G. Anderson, J. ACM 12 (1965)
 * 547-560; J. Zhang, B. O'Donoghue and S. Boyd, SIAM J. Optim. 30 (2020) 3170-3197): a step
 * from a mixed point is kept only when it does not raise the objective above the last kept
 * one, else the memory is cleared and a plain step taken from that one.
 *
 * If the block steps end above the first stage's objective (an inner solve that failed), the first
 * stage's answer is returned, marked not converged.
 *
 * Stopping rule: a plain step moves the kink component by at most `tolerance` (scaled units:
 * sd of y = 1) at every point; the returned a is the last exact order-1 solve, so block 1's
 * optimality conditions hold exactly for the common residual y - a - c, and block 3's within
 * the last step's change (reported as `achieved`).
 *
 * Works in scaled units (x to unit mean spacing, y to sd 1, w to mean 1). Unchecked.
 */
import type { SolverStatus } from '../../types';
import { solveTrend, seedOf, TrendFit, TrendProblem } from '../trend/solveTrend';
import { differenceOperator } from '../../linalg/difference';
import { weightedPolynomialFit } from '../../linalg/weightedPolynomialFit';
import { mixedAdmm, mixedOperators, MixedAdmmState, MixedOperators } from './mixedAdmm';
import { smallSpdSolve } from '../../linalg/smallSpdSolve';
import { mixedDualInteriorPoint, mixedDualOperator, MixedDualOperator } from './mixedDualInteriorPoint';
import { maxAbsDifference } from '../../linalg/maxAbsDifference';

/** Solution of {@link solveMixed} in the scaled units it was given. */
export interface MixedFit {
  /** Straight pieces with kinks (order-1 component). */
  kinks: Float64Array;
  /** Smooth bends (order-3 component), weighted-orthogonal to straight lines. */
  bends: Float64Array;
  /** Knot rows of D(x, 2) on the kinks and of D(x, 4) on the bends. */
  kinkRows: number[];
  bendRows: number[];
  /** The last order-1 and order-3 trend-filtering solves (knot rows, duals), when the exact block steps ran. */
  kinkFit?: TrendFit;
  bendFit?: TrendFit;
  /** The ADMM's iterates (warm start at the next penalty), when the ADMM ran. */
  admm?: MixedAdmmState;
  /** Objective at the returned point. */
  objective: number;
  /** True when the interior point's answer, converged, is returned as it is (no ADMM, no block steps). */
  interior: boolean;
  status: SolverStatus;
}

/** Where to start and what the previous solve at a nearby penalty knew. Unchecked. */
export interface MixedStart {
  admm?: MixedAdmmState;
  kinkFit?: TrendFit;
  bendFit?: TrendFit;
}

/** Settings of {@link solveMixed}. */
export interface MixedSolveSettings {
  /**
   * Relative duality gap at which the interior point's answer is taken ({@link mixedDualInteriorPoint});
   * 0 skips it. Where it stalls above this, the ADMM runs instead.
   */
  interiorTolerance: number;
  /**
   * Where the interior point stalls, the exact block steps start from its best iterate, even when `refine` is
   * false, instead of the ADMM. The stalls are near the top of a path (few knots), where the ADMM was slow too (up
   * to its 3,000-step limit) and the block steps are cheap.
   */
  exactAfterStall: boolean;
  /** Tolerance eps of the ADMM's residuals ({@link mixedAdmm}). */
  admmTolerance: number;
  /** Iteration limit of the ADMM. */
  admmIterations: number;
  /** Largest change of the kink component in a final plain step (scaled units). */
  tolerance: number;
  /** Most block steps. */
  maxCycles: number;
  /** Relative duality gap asked of each inner trend solve. */
  innerTolerance: number;
  /** Iteration limit of each inner trend solve's interior point. */
  innerIterations: number;
  /** False for cross-validation folds and path points: the first stage's answer (interior point or ADMM) without the exact block steps (but see `exactAfterStall`). */
  refine: boolean;
}

/** Anderson memory (number of past steps mixed), as in the decomposition. */
export const MIXED_ANDERSON_MEMORY = 5;

export const MIXED_RULE = 'block coordinate descent on the kink and bend components, Anderson-accelerated (memory 5, safeguarded by the objective): each step an exact trend-filtering solve of order 3 (less its straight-line part) then one of order 1; stops when a plain step moves the kink component by at most the tolerance times the sd of y at every point; returns the last exact order-1 step with the bends it was taken for';

/** Problems of one series (x and w fixed) whose operators and bases carry over between solves. Unchecked. */
export interface MixedProblems {
  x: Float64Array;
  w: Float64Array;
  one?: TrendProblem;
  three?: TrendProblem;
  ops?: MixedOperators;
  dual?: MixedDualOperator;
}

/** Most Newton steps of the interior point (it converges in 10 to 30 where it converges at all). */
export const MIXED_INTERIOR_ITERATIONS = 60;

/** The objective of the mixed problem. Unchecked. */
export function mixedObjective(x: Float64Array, y: Float64Array, w: Float64Array, a: Float64Array, c: Float64Array, lambda1: number, lambda3: number): number {
  const n = x.length;
  let J = 0;
  for (let i = 0; i < n; i++) { const r = y[i] - a[i] - c[i]; J += 0.5 * w[i] * r * r; }
  const d2 = differenceOperator(x, 2, a);
  for (let j = 0; j < d2.length; j++) J += lambda1 * Math.abs(d2[j]);
  const d4 = differenceOperator(x, 4, c);
  for (let j = 0; j < d4.length; j++) J += lambda3 * Math.abs(d4[j]);
  return J;
}

/**
 * Solves the scaled problem at (lambda1, lambda3). Needs n >= 5. Unchecked.
 *
 * @param probs - x, w and the operators carried between solves on the same points
 */
export function solveMixed(probs: MixedProblems, y: Float64Array, lambda1: number, lambda3: number, s: MixedSolveSettings, start: MixedStart = {}): MixedFit {
  const { x, w } = probs;
  const n = x.length;
  if (!probs.ops) probs.ops = mixedOperators(x, w);
  // the first stage: the interior point's answer (the ADMM's warm start passed on), else the ADMM's
  let ad: { kinks: Float64Array; bends: Float64Array; kinkRows: number[]; bendRows: number[]; state?: MixedAdmmState; status: SolverStatus } | undefined;
  let first: 'interior' | 'stalled interior' | 'admm' = 'admm';
  if (s.interiorTolerance > 0) {
    if (!probs.dual) probs.dual = mixedDualOperator(probs.ops);
    const ip = mixedDualInteriorPoint(probs.dual, y, lambda1, lambda3, s.interiorTolerance, MIXED_INTERIOR_ITERATIONS);
    if (ip.status.converged) first = 'interior';
    else if (s.exactAfterStall) first = 'stalled interior';
    if (first !== 'admm') ad = { ...ip, state: start.admm };
  }
  if (!ad) ad = mixedAdmm(probs.ops, y, lambda1, lambda3, s.admmTolerance, s.admmIterations, start.admm);
  if (!s.refine && first !== 'stalled interior') {
    return {
      kinks: ad.kinks, bends: ad.bends, kinkRows: ad.kinkRows, bendRows: ad.bendRows, admm: ad.state,
      objective: mixedObjective(x, y, w, ad.kinks, ad.bends, lambda1, lambda3), interior: first === 'interior', status: ad.status,
    };
  }
  let a: Float64Array = ad.kinks;
  let c = ad.bends;
  let fit1 = start.kinkFit, fit3 = start.bendFit;
  let innerIterations = 0;
  let innerOk = true;
  const z = new Float64Array(n);
  const F = (aIn: Float64Array): Float64Array => {
    for (let i = 0; i < n; i++) z[i] = y[i] - aIn[i];
    probs.three = { x, y: Float64Array.from(z), w, k: 3, op: probs.three?.op, x01: probs.three?.x01, basis: probs.three?.basis };
    // an exact fit at these penalties (the last step's) is rebuilt from its knots; one at another penalty (the
    // previous point of a path, passed in `start`) only warm-starts the solve
    fit3 = solveTrend(probs.three, lambda3, { tolerance: s.innerTolerance, maxIterations: s.innerIterations, warm: fit3, seed: fit3 && fit3.lambda === lambda3 ? seedOf(fit3) : undefined });
    const line = weightedPolynomialFit(x, fit3.b, w, 1);
    c = Float64Array.from(fit3.b, (v, i) => v - line[i]);
    for (let i = 0; i < n; i++) z[i] = y[i] - c[i];
    probs.one = { x, y: Float64Array.from(z), w, k: 1, op: probs.one?.op, x01: probs.one?.x01, admmRows: probs.one?.admmRows, basis: probs.one?.basis };
    fit1 = solveTrend(probs.one, lambda1, { tolerance: s.innerTolerance, maxIterations: s.innerIterations, warm: fit1, seed: fit1 && fit1.lambda === lambda1 ? seedOf(fit1) : undefined });
    innerIterations += fit3.status.iterations + fit1.status.iterations;
    innerOk = fit3.status.converged && fit1.status.converged;
    return Float64Array.from(fit1.b);
  };
  const sw = Float64Array.from(w, Math.sqrt);
  const dG: Float64Array[] = [], dF: Float64Array[] = [];
  let gPrev: Float64Array | null = null, fPrev: Float64Array | null = null;
  let best: { g: Float64Array; J: number } | null = null;
  let cycles = 0, resets = 0;
  let change = Infinity;
  while (cycles < s.maxCycles) {
    cycles++;
    const g = F(a);
    const J = mixedObjective(x, y, w, g, c, lambda1, lambda3);
    // the inner solves are exact to a relative duality gap of about 1e-10, so the objective is compared with that slack
    if (best && J > best.J * (1 + 1e-9) + 1e-300) {
      dG.length = 0; dF.length = 0; gPrev = null; fPrev = null;
      resets++;
      a = best.g;
      continue;
    }
    best = { g, J };
    const f = new Float64Array(n);
    let fmax = 0;
    for (let i = 0; i < n; i++) { f[i] = g[i] - a[i]; fmax = Math.max(fmax, Math.abs(f[i])); }
    change = fmax;
    if (change <= s.tolerance) { a = g; break; }
    if (gPrev && fPrev) {
      dG.push(Float64Array.from(g, (v, i) => v - gPrev![i]));
      dF.push(Float64Array.from(f, (v, i) => v - fPrev![i]));
      if (dG.length > MIXED_ANDERSON_MEMORY) { dG.shift(); dF.shift(); }
    }
    gPrev = g; fPrev = f;
    const m = dF.length;
    if (m === 0) { a = g; continue; }
    const M = new Float64Array(m * m), b = new Float64Array(m);
    for (let p = 0; p < m; p++) {
      for (let q = 0; q <= p; q++) {
        let v = 0;
        for (let i = 0; i < n; i++) v += sw[i] * dF[p][i] * sw[i] * dF[q][i];
        M[p * m + q] = v; M[q * m + p] = v;
      }
      let v = 0;
      for (let i = 0; i < n; i++) v += w[i] * dF[p][i] * f[i];
      b[p] = v;
    }
    let tr = 0;
    for (let p = 0; p < m; p++) tr += M[p * m + p];
    for (let p = 0; p < m; p++) M[p * m + p] += 1e-10 * tr / m;
    const gamma = smallSpdSolve(M, b, m);
    const next = Float64Array.from(g);
    for (let p = 0; p < m; p++) for (let i = 0; i < n; i++) next[i] -= gamma[p] * dG[p][i];
    a = next;
  }
  if (change <= s.tolerance) {
    // plain steps from the converged point until one moves the kinks by at most the tolerance
    for (let extra = 0; extra < 20; extra++) {
      const g = F(a);
      const d = maxAbsDifference(g, a, n);
      change = d;
      a = g;
      cycles++;
      if (d <= s.tolerance) break;
    }
  }
  a = Float64Array.from(fit1!.b);
  const admmObjective = mixedObjective(x, y, w, ad.kinks, ad.bends, lambda1, lambda3);
  if (!(mixedObjective(x, y, w, a, c, lambda1, lambda3) <= admmObjective)) {
    // the exact steps did not improve on the first stage's answer (inner solves that failed): keep it
    return {
      kinks: ad.kinks, bends: ad.bends, kinkRows: ad.kinkRows, bendRows: ad.bendRows, admm: ad.state, objective: admmObjective, interior: false,
      status: { ...ad.status, converged: false, stoppingRule: `${ad.status.stoppingRule}; the exact block steps that followed did not lower the objective and were discarded` },
    };
  }
  return {
    kinks: a, bends: c, kinkRows: fit1!.knotRows, bendRows: fit3!.knotRows, kinkFit: fit1!, bendFit: fit3!, admm: ad.state, interior: false,
    objective: mixedObjective(x, y, w, a, c, lambda1, lambda3),
    status: {
      converged: change <= s.tolerance && innerOk, iterations: cycles, tolerance: s.tolerance, achieved: change,
      stoppingRule: `${ad.status.stoppingRule}, ${ad.status.iterations} iterations, from which ${MIXED_RULE}; ${innerIterations} trend-solver iterations and ${resets} memory resets in all`,
    },
  };
}

