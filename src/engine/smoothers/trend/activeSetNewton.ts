import { restrictedSplineFit, refinementStepsFor } from '../../basis/restrictedSplineFit';
import { roundWork, BasisCache } from '../../basis/discreteBSplines';
import { residualDual } from '../../linalg/dualFromResidual';
import { boxRelative, certify, gapAgainstDual, PolishResult } from './polishTrend';
import { maxAbs } from '../../linalg/maxAbs';

/** Result of {@link activeSetNewton}. */
export interface ActiveSetNewtonResult {
  /** True when a round changed nothing: (rows, signs) then satisfies every optimality condition. */
  settled: boolean;
  /** Knot rows (increasing) and signs of the last round. */
  rows: number[];
  signs: number[];
  /** Restricted solves used. */
  rounds: number;
  /** Rows changed (left or joined) in each round. */
  changes: number[];
  /**
   * The certified fit (as the refinement of {@link polishTrend} reports it) of the last round when
   * the method settled, or of the first round whose certified relative gap was at most `stopGap`.
   */
  fit?: PolishResult;
}

/**
 * Primal-dual active-set (semismooth Newton) iteration for trend filtering on its
 * box-constrained dual, after M. Hintermueller, K. Ito and K. Kunisch, "The primal-dual
 * active set strategy as a semismooth Newton method", SIAM J. Optim. 13 (2002) 865-888.
 *
 * Active set A (rows with u on the bound, signs s): each round solves the problem restricted
 * to discrete splines with knots A ({@link restrictedSplineFit}: one banded solve in the
 * discrete B-spline basis, the dual's free-set system in a well-conditioned form) and recovers
 * u off A from D^T u = W (y - b) ({@link dualFromResidual}). The next A keeps the rows of A
 * where (D b)_r has the sign s_r, and adds, of each run of consecutive rows with
 * |u_r| > lambda (1 + {@link boxRelative}), the most violating one with the sign of u. When a
 * round changes nothing every optimality condition holds. Unlike the refinement of
 * {@link polishTrend} there is no line search: all sign changes leave at once, which is fast
 * from a nearly right active set (a converged interior point's knots) but not globally
 * convergent on these duals (from a poor start it cycles or grows the active set), so it
 * stops unsettled after `maxRounds`, or as soon as a round changes more than twice as many rows
 * (plus 2) as the one before.
 *
 * With `stopOnRepeat` it also stops unsettled when an active set repeats (the method cycles
 * among a few rows: a monotone method such as {@link polishTrend} finishes from there). With `stopGap` each round's restricted solution is certified ({@link certify}: its relative
 * duality gap after scaling u into the box, valid for any round, settled or not) and the method
 * stops at the first round at or below `stopGap`; a settled round is certified in any case, so
 * no further refinement round is needed to confirm it. With `patience` it stops unsettled once the
 * fewest rows changed in a round has not decreased for that many rounds (no progress).
 *
 * With `slide`, a knot right before a run of violations, with the run's sign, moves to the run's
 * worst row in the same round (one round instead of two: adding the row, then dropping the knot
 * once its sign breaks). That suits starts whose knots are displaced by some rows (the previous
 * penalty's knots, or a fold's knots guessed from the full data): measured on cross-validation
 * (5 folds x 30 penalties, n = 1e4) the restricted solves went from 2,246 to 1,970 (order 1) and
 * from 21,558 to 10,705 (order 3). It does not suit a nearly right start such as a converged
 * interior point's knots: the optimum often holds pairs of adjacent knots of one sign (the dual is
 * flat at its peaks), and sliding splits them (a noiseless kinked series of 60 points then diverged
 * where without it 4 rounds settled; sliding only when the worst row is the one beside the knot
 * split them too).
 *
 * With `outside` (a dual point v with |v| <= lambda and its fit b_v = y - W^-1 D^T v, such as a
 * converged interior point's), a settled round whose own certificate misses `outside.within` is
 * certified against v instead when that gap is smaller ({@link gapAgainstDual}); the result then
 * carries v as its dual. Its own certificate is limited by the precision of the dual recovered from
 * the residual (on long series of order 3, or at penalties where knots cover most rows), v's is not.
 *
 * Works on x scaled to [0, 1]; O(n k^2) per round. Unchecked.
 */
export function activeSetNewton(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rows: ArrayLike<number>, signs: ArrayLike<number>, maxRounds: number, cache?: BasisCache, stopGap = 0, stopOnRepeat = false, patience = Infinity, slide = false, outside?: { v: Float64Array; bv: Float64Array; within: number }): ActiveSetNewtonResult {
  const n = x.length;
  const m = n - k - 1;
  const lim = lambda * (1 + boxRelative(n, k));
  let A: number[] = Array.from(rows);
  let S: number[] = Array.from(signs);
  // the residual, b and u of a round, kept on the cache between calls (the dual's one-pass kernels
  // of orders 1 to 3 need no other work space)
  const { u: ubuf, b: bbuf } = roundWork(cache, n, m);
  let rounds = 0;
  // a looser target needs no refinement steps in the solves ({@link refinementStepsFor})
  const steps = refinementStepsFor(stopGap);
  const changes: number[] = [];
  let fewest = Infinity, since = 0;
  // active sets met so far (by two 32-bit hashes of the signed rows and their count)
  const seen = new Set<string>();
  // [rows changed, max |u|] of a round's scan
  const scan = new Float64Array(2);
  while (rounds < maxRounds) {
    // b lives in bbuf for the round only (a certified result gets a copy)
    const sol = restrictedSplineFit(x, y, w, k, lambda, A, S, cache, bbuf, undefined, steps);
    rounds++;
    if (!sol) break;
    // u lives in ubuf for the round only (a certified result copies it); the residual's sums come in the same pass
    const { u, rss, yg } = residualDual(x, k + 1, y, w, sol.b, ubuf);
    const nA: number[] = [], nS: number[] = [];
    nextActiveSet(u, m, A, S, sol.dA, lim, slide, nA, nS, scan);
    const changed = scan[0], um = scan[1];
    changes.push(changed);
    if (changed === 0 || stopGap > 0) {
      // the round's solution: D b is (D b)_A on A and exactly zero elsewhere; its certificate (against
      // the target, unless the round settled) builds result arrays only for a round that meets it,
      // and a certified one gets a copy of b (the round's b lives in the work space)
      const dmax = maxAbs(sol.dA);
      const fit = certify(y, w, lambda, { b: sol.b, u, umax: um, rss, yg, dA: sol.dA, rows: A, dmax }, changed === 0, rounds, stopGap > 0, changed === 0 ? Infinity : stopGap);
      if (fit.ok) fit.b = Float64Array.from(fit.b);
      if (changed === 0 && fit.ok && outside && !(fit.achieved <= outside.within)) {
        const g = gapAgainstDual(lambda, rss, fit.b, w, A, sol.dA, outside.v, outside.bv);
        if (g < fit.achieved) { fit.u = Float64Array.from(outside.v); fit.achieved = g; }
      }
      if (changed === 0) return { settled: true, rows: A, signs: S, rounds, changes, fit: fit.ok ? fit : undefined };
      if (fit.ok && fit.achieved <= stopGap) return { settled: false, rows: A, signs: S, rounds, changes, fit };
    }
    A = nA;
    S = nS;
    // more than twice the changes of the round before: diverging from this start
    if (changes.length >= 2 && changed > 2 * changes[changes.length - 2] + 2) break;
    // the fewest changes of a round not improved on for `patience` rounds: cycling without progress
    if (changed < fewest) { fewest = changed; since = 0; } else if (++since >= patience) break;
    // an active set met before: the method cycles
    if (stopOnRepeat) {
      let h1 = 0x811c9dc5 | 0, h2 = 17;
      for (let i = 0; i < A.length; i++) {
        const v = 2 * A[i] + (S[i] > 0 ? 1 : 0);
        h1 = Math.imul(h1 ^ v, 0x01000193);
        h2 = (Math.imul(h2, 31) + v) | 0;
      }
      const key = `${A.length}:${h1}:${h2}`;
      if (seen.has(key)) break;
      seen.add(key);
    }
  }
  return { settled: false, rows: A, signs: S, rounds, changes };
}

/**
 * One round's scan of the rows (its own function, so that the first call's compiler works on a small
 * body): the next active set (nA, nS) keeps the rows of A where (D b)_r has the sign s_r and adds, of
 * each run of consecutive rows off A with |u_r| > lim, the most violating one with the sign of u
 * (with `slide`, a knot right before the run with the same sign moves to it); out = [rows changed,
 * max |u|]. Unchecked.
 */
function nextActiveSet(u: Float64Array, m: number, A: number[], S: number[], dA: Float64Array, lim: number, slide: boolean, nA: number[], nS: number[], out: Float64Array): void {
  let changed = 0, um = 0;
  let j = 0;
  for (let r = 0; r < m; ) {
    const ur = Math.abs(u[r]);
    if (ur > um) um = ur;
    if (j < A.length && A[j] === r) {
      if (S[j] * dA[j] > 0) { nA.push(r); nS.push(S[j]); } else changed++;
      j++;
      r++;
      continue;
    }
    if (!(ur > lim)) { r++; continue; }
    let best = r, e = r;
    while (e < m && !(j < A.length && A[j] === e) && Math.abs(u[e]) > lim) { const ue = Math.abs(u[e]); if (ue > um) um = ue; if (ue > Math.abs(u[best])) best = e; e++; }
    const sg = u[best] > 0 ? 1 : -1;
    if (slide && nA.length && nA[nA.length - 1] === r - 1 && nS[nS.length - 1] === sg) { nA.pop(); nS.pop(); changed++; }
    nA.push(best);
    nS.push(sg);
    changed++;
    r = e;
  }
  out[0] = changed; out[1] = um;
}
