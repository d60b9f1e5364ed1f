import { residualDual } from '../../linalg/dualFromResidual';
import { restrictedSplineStart, refinementStepsFor, RestrictedSplineStart } from '../../basis/restrictedSplineFit';
import { RestrictedSystem, withoutKnot, solveRestrictedSystem } from '../../basis/restrictedSystem';
import { refinementWork, BasisCache } from '../../basis/discreteBSplines';
import { maxAbs } from '../../linalg/maxAbs';

/** Result of {@link polishTrend}. */
export interface PolishResult {
  /** True when the refined solution passed the optimality check. */
  ok: boolean;
  b: Float64Array;
  u: Float64Array;
  /** Knot rows (rows of D with a non-zero entry). */
  knots: number[];
  /** (D b) at the knot rows, from the restricted solve's coefficients (exact; differencing b is not on long series). */
  dKnots: Float64Array;
  /** Relative duality gap certified for the result (see certify). */
  achieved: number;
  /** Active-set rounds used. */
  rounds: number;
}

/**
 * Relative slack of the dual bound |u| <= lambda (1 + slack) within which a row is not
 * added to the active set: max(1e-8, 100 eps n^(k-2)), the precision of u from the
 * compensated running sums of {@link dualFromResidual} on a restricted solve accurate to
 * about 1e-12. Violations this small change the objective by about slack times the
 * penalty term; the certificate ({@link certify}) scales u into the box, so what they
 * cost is in the reported gap.
 */
export function boxRelative(n: number, k: number): number {
  return Math.max(1e-8, 100 * 2.2e-16 * Math.pow(n, Math.max(0, k - 2)));
}

/**
 * Exact refinement of a trend-filtering solution from a guessed active set: a
 * primal active-set method for the same problem, in the manner of
 * M. R. Osborne, B. Presnell and B. A. Turlach, "On the LASSO and its dual",
 * J. Comput. Graph. Statist. 9 (2000).
 *
 * The initial A is the rows `initial` when given (knots found by another solver,
 * with the signs of u0), else, of each run of rows with |u0_r| >= lambda (1 - 1e-6) of one
 * sign, the row with the largest |u0_r|. For knot rows A with signs s it solves exactly
 *   minimise 1/2 sum w (y - b)^2 + lambda s_A^T (D b)_A  subject to (D b)_j = 0 for j not in A,
 * with b a discrete spline with knots A, by the banded solve of
 * {@link restrictedSplineFit} in O(n k^2) (no limit on |A|), which also gives (D b)_A.
 * Starting from the weighted polynomial fit (feasible for every A), if the
 * new solution breaks a sign s_r (D b)_r >= 0 the iterate moves only up to
 * the first sign change and that row leaves A (at a zero step, every row at zero
 * that would change sign leaves together). Otherwise the full dual u is
 * recovered from D^T u = W (y - b) ({@link dualFromResidual}); of each run of
 * consecutive rows with |u_r| > lambda (1 + {@link boxRelative}) the largest joins A with the
 * sign of u (for order 3, of those rows only the largest few: {@link JOINING_AT_LEAST}). When no row violates, all optimality conditions of the original
 * problem hold: the solution is optimal up to rounding, with exact zeros of
 * D b off the knots. At most `maxRounds` restricted solves, each O(n k^2); stops if an
 * active set repeats. With `stopGap` > 0 it also stops at the first sign-consistent round whose
 * certificate ({@link certify}, which scales u into the box) is at most `stopGap`.
 *
 * A round that only drops knots from the last solve's active set (orders 2 and 3) needs only the
 * signs of (D b)_A, not b: it is solved from that solve's normal equations with the knots removed
 * ({@link withoutKnot}, O(p k^2), no pass over the n points), and only a round whose signs all hold
 * is solved again from the data, for its fit and dual (and checked again with the refined (D b)_A).
 * b itself is carried only through full steps: the steps that stop at a sign change need D b on the
 * rows alone. Measured on the `trend-cv` bench series at 1e4 (5 folds x 30 penalties): order 3's
 * refinement made 2,380 such rounds of its 2,918 (the same rounds and knots as when every round was
 * solved from the data), and its cross-validation took 3.64 to 3.72 s instead of 4.39 to 4.43 s
 * (three alternating pairs of fresh processes). Likewise a solve from the data after knots joined is
 * finished (its refinement steps and fitted values, {@link restrictedSplineStart}) only when its step
 * breaks no sign: a step that stops at a sign change needs (D b)_A alone, from the first solve of the
 * normal equations (within 2e-14 of the refined values, measured). On the `trend-cv` series at 1e4
 * (5 x 30, warm, least of 3 to 4 in one process, alternating with the version that finished every
 * solve; together with the dual's pass without its largest-value tracking, {@link residualDual}):
 * order 3's cross-validation took 1.11 to 1.15 s instead of 1.21 to 1.23 s (its full-data path 0.49
 * to 0.51 s instead of 0.57 to 0.58 s), order 1's 0.23 to 0.24 s instead of 0.24 to 0.25 s; the same
 * fits, paths and scores bit for bit on the 9-series dump, the automatic choice and the mixed trend.
 *
 * Works on x scaled to [0, 1]. `cache` ({@link BasisCache}) keeps the basis between rounds and calls on the same x. Unchecked.
 */
export function polishTrend(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, u0: Float64Array, maxRounds = 200, initial?: ArrayLike<number>, cache?: BasisCache, stopGap = 0): PolishResult {
  const n = x.length;
  const m = n - k - 1;
  // the active set: sgn[r] = sign of u on knot row r, 0 off the knots
  const sgn = new Int8Array(m);
  // initial guess: the given rows with the signs of u0, else of each run of consecutive rows
  // with |u0_r| >= lambda (1 - 1e-6), the largest (a smooth dual is flat near its peaks, and
  // adjacent knots would be nearly collinear columns)
  const near = lambda * (1 - 1e-6);
  if (initial) for (let j = 0; j < initial.length; j++) { const r = initial[j]; if (u0[r] !== 0) sgn[r] = u0[r] > 0 ? 1 : -1; }
  for (let r = 0; r < m && !initial; ) {
    if (!(Math.abs(u0[r]) >= near)) { r++; continue; }
    let best = r, e = r;
    while (e < m && Math.abs(u0[e]) >= near && Math.sign(u0[e]) === Math.sign(u0[r])) { if (Math.abs(u0[e]) > Math.abs(u0[best])) best = e; e++; }
    sgn[best] = u0[best] > 0 ? 1 : -1;
    r = e;
  }
  // the iterate starts at the weighted polynomial fit (D b = 0), feasible in the span of any active
  // set; only D of the iterate on the active rows is carried along the steps (zero at that start):
  // its fitted values are needed only at a full step, where they are the round's fit
  const dcur = new Float64Array(m);
  let u: Float64Array = new Float64Array(m);
  // the full steps' fitted values and duals, in two pairs of arrays used in turn (the last full step's
  // pair stays with its certificate while the next one is solved); a result returned gets copies
  const work = refinementWork(cache, n, m);
  let side = 0;
  // active sets met so far, by two 32-bit hashes of the signed rows and their count (a repeat
  // means the method cycles)
  const seen = new Set<string>();
  let last: Certifiable | undefined;
  const lim = lambda * (1 + boxRelative(n, k));
  // the normal equations of the last solve from the data (orders 2 and 3) and the active set they belong to
  let kept: { rows: number[]; system: RestrictedSystem } | undefined;
  const keep: { system?: RestrictedSystem } = {};
  // a looser target needs no refinement steps in the solves ({@link refinementStepsFor})
  const steps = refinementStepsFor(stopGap);
  // a solve from the data, factored and solved once: its (D b)_A decides a round that drops a knot,
  // and only a round whose signs all hold finishes it (refinement steps, fitted values)
  const fromData = (rowsA: number[], sA: number[]): RestrictedSplineStart | null => {
    keep.system = undefined;
    const sol = restrictedSplineStart(x, y, w, k, lambda, rowsA, sA, cache, k >= 2 ? keep : undefined, steps);
    kept = sol && keep.system ? { rows: rowsA, system: keep.system } : undefined;
    return sol;
  };
  // how far the step from b_cur towards the round's solution (D b on the rows: dA) may go before the
  // first active row changes sign (tau), with that row (drop; -1 for a full step)
  const signStep = (rowsA: number[], sA: number[], dA: Float64Array) => {
    let dmax = 0;
    for (let j = 0; j < rowsA.length; j++) dmax = Math.max(dmax, Math.abs(dA[j]), Math.abs(dcur[rowsA[j]]));
    let tau = 1, drop = -1;
    for (let j = 0; j < rowsA.length; j++) {
      const sg = sA[j];
      const a0 = sg * dcur[rowsA[j]], a1 = sg * dA[j];
      if (a1 < -1e-12 * dmax) {
        const t = a0 > 0 ? a0 / (a0 - a1) : 0;
        if (t < tau) { tau = t; drop = rowsA[j]; }
      }
    }
    return { dmax, tau, drop };
  };
  // after a round that only dropped knots, the next active set is the last one without them (no scan of the rows)
  let shrunk: { rows: number[]; signs: number[] } | undefined;
  let rounds = 0;
  for (; rounds < maxRounds; rounds++) {
    const rowsA: number[] = [], sA: number[] = [];
    if (shrunk) {
      for (let j = 0; j < shrunk.rows.length; j++) if (sgn[shrunk.rows[j]] !== 0) { rowsA.push(shrunk.rows[j]); sA.push(shrunk.signs[j]); }
    } else activeRows(sgn, m, rowsA, sA);
    shrunk = undefined;
    let h1 = 0x811c9dc5 | 0, h2 = 17;
    for (let j = 0; j < rowsA.length; j++) {
      const v = 2 * rowsA[j] + (sA[j] > 0 ? 1 : 0);
      h1 = Math.imul(h1 ^ v, 0x01000193);
      h2 = (Math.imul(h2, 31) + v) | 0;
    }
    const key = `${rowsA.length}:${h1}:${h2}`;
    if (seen.has(key)) break; // the active set cycles: give up
    seen.add(key);
    // the round's (D b)_A: from the kept normal equations when the round only removed knots (orders 2
    // and 3), else from a solve from the data, which keeps its equations for the rounds after it
    let started: RestrictedSplineStart | null = null;
    let dA: Float64Array | null = null;
    const reduced = kept && reducedSystem(kept.system, kept.rows, rowsA);
    if (reduced) {
      dA = solveRestrictedSystem(reduced, lambda, sA);
      if (dA) kept = { rows: rowsA, system: reduced };
    }
    if (!dA) {
      started = fromData(rowsA, sA);
      if (!started) break;
      dA = started.dA;
    }
    let step = signStep(rowsA, sA, dA);
    let sol: { b: Float64Array; dA: Float64Array } | null = null;
    if (step.drop < 0) {
      // no sign broke: the round's fit from the data (its b and its refined (D b)_A), checked again
      if (!started) started = fromData(rowsA, sA);
      if (!started) break;
      sol = started.finish(work.b[side]);
      dA = sol.dA;
      step = signStep(rowsA, sA, dA);
    }
    const { dmax, tau, drop } = step;
    if (drop >= 0) {
      // D b on the active rows moves with the step, in place: the rows off this set are read again
      // only after the next full step, which replaces dcur
      for (let j = 0; j < rowsA.length; j++) { const r = rowsA[j]; dcur[r] += tau * (dA[j] - dcur[r]); }
      sgn[drop] = 0;
      if (tau <= 1e-12) {
        // a zero step: every row that is at zero now and would change sign leaves together
        for (let j = 0; j < rowsA.length; j++) {
          const r = rowsA[j], sg = sgn[r];
          if (sg === 0) continue;
          if (sg * dA[j] < -1e-12 * dmax && Math.abs(dcur[r]) <= 1e-12 * dmax) sgn[r] = 0;
        }
      }
      shrunk = { rows: rowsA, signs: sA };
      continue;
    }
    // a full step (no sign broke, so the round was finished above): D b is (D b)_A on A and exactly
    // zero elsewhere (the certified state keeps its own copy)
    dcur.fill(0);
    for (let j = 0; j < rowsA.length; j++) dcur[rowsA[j]] = dA[j];
    const bnew = sol!.b;
    const rd = residualDual(x, k + 1, y, w, bnew, work.u[side]);
    side = 1 - side;
    u = rd.u;
    last = { b: bnew, u, rss: rd.rss, yg: rd.yg, dA, rows: rowsA, dmax };
    // add the most violating row of each run of consecutive violations |u_r| > lambda (order 3: the largest few of them)
    const added = addViolations(u, sgn, m, lim, joiningAtMost(k, rowsA.length));
    if (!added) return owned(certify(y, w, lambda, last, true, rounds + 1), work);
    if (stopGap > 0) {
      // a looser target (cross-validation folds): the first sign-consistent round certified at it is enough
      const c = certify(y, w, lambda, last, false, rounds + 1, true, stopGap);
      if (c.ok) return owned(c, work);
    }
  }
  // stopped early (cycle, budget): the last sign-consistent solution still comes with an
  // honest gap when its dual is close to feasible
  if (last) {
    const c = certify(y, w, lambda, last, false, rounds);
    if (c.ok) return owned(c, work);
  }
  return { ok: false, b: new Float64Array(n), u: u.slice(), knots: [], dKnots: new Float64Array(0), achieved: Infinity, rounds };
}

/** The result with its own copies of any array that lives in the refinement's work space (a later refinement on the same cache writes there). Unchecked. */
function owned(r: PolishResult, work: { b: Float64Array[]; u: Float64Array[] }): PolishResult {
  if (r.b === work.b[0] || r.b === work.b[1]) r.b = r.b.slice();
  if (r.u === work.u[0] || r.u === work.u[1]) r.u = r.u.slice();
  return r;
}

/** The active set's rows (increasing) and signs from sgn (its own function, as a pass over the rows). Unchecked. */
function activeRows(sgn: Int8Array, m: number, rowsA: number[], sA: number[]): void {
  for (let r = 0; r < m; r++) if (sgn[r] !== 0) { rowsA.push(r); sA.push(sgn[r]); }
}

/**
 * Of order 3's violations, at most this many join the active set in one round of {@link polishTrend},
 * or a quarter of the round's knots when that is more ({@link joiningAtMost}): the largest |u_r| first.
 *
 * Rows that join together interact through the basis (each knot's function spans k + 2 knots), and
 * the solve with all of them often gives some of them a sign opposite to their violation (a single
 * joining row always gets its own sign: the solve moves along the violation's gradient). The step
 * then stops at zero and those rows leave again: on order 3's path the active set swung between some
 * 9 and 16 to 18 knots for dozens of rounds while knots moved to their optimal rows (most of them
 * adjacent pairs of one sign). Measured on the bench series at 1e4 (`benchSeries`, four seeds): the
 * full-data path of order 3 (30 penalties) took 4,588 solves from the data instead of 5,534 (all
 * violations joining; 4 at most: 5,154; a third of the knots and 5 at least: 4,569; an eighth and
 * 4: 4,883), its 5 x 30 cross-validation 8,307 instead of 9,625, and the cross-validation took 1.01
 * to 1.10 s instead of 1.17 to 1.40 s on the `trend-cv` series and 1.04 to 1.12 s instead of 1.42
 * to 1.51 s on another seed (warm, least of 3, three alternating runs). Full-data fits are the same
 * certified optima (the 9-series dump: the same fits bit for bit; its nine single fits of order 3 took
 * 15 to 191 rounds where they took 15 to 425, one of them more: 62 against 57). Fold fits stop at a looser gap, so their scores move a little: on
 * eight seeded curves of 2,000 to 1e4 points, by at most 0.038 of their standard error within 5 standard
 * errors of the minimum (0.055 elsewhere); on two of them the minimum moved by one or two grid points,
 * between scores less than 0.03 standard errors apart. Orders 1 and 2 keep every violation (order 2
 * made 2 to 3% more solves with the limit, at 3,000 and 1e4 points). A start far from the optimum
 * (no knots at a small penalty) takes more rounds: the knots then grow by a quarter per round.
 */
export const JOINING_AT_LEAST = 4;

/** The most rows that may join an active set of K knots in one round of {@link polishTrend} at order k ({@link JOINING_AT_LEAST}). Unchecked. */
export function joiningAtMost(k: number, K: number): number {
  return k === 3 ? Math.max(JOINING_AT_LEAST, Math.floor(K / 4)) : Infinity;
}

/**
 * Adds to the active set (sgn) the most violating row of each run of consecutive rows off it with
 * |u_r| > lim, with the sign of u (its own function, as a pass over the rows), or of those rows the
 * `most` with the largest |u_r| (ties: the first row); whether any was added. Unchecked.
 */
function addViolations(u: Float64Array, sgn: Int8Array, m: number, lim: number, most: number): boolean {
  const worst: number[] = [];
  worstOfRuns(u, sgn, m, lim, worst);
  if (worst.length > most) {
    worst.sort((a, b) => Math.abs(u[b]) - Math.abs(u[a]) || a - b);
    worst.length = most;
  }
  for (let j = 0; j < worst.length; j++) sgn[worst[j]] = u[worst[j]] > 0 ? 1 : -1;
  return worst.length > 0;
}

/**
 * The most violating row (largest |u_r|, the first of equals) of each run of consecutive rows off the
 * active set with |u_r| > lim, appended to `worst` in row order: the pass over the rows of
 * {@link addViolations}, alone in its function with nothing after its loop (DEVELOPERS.md, "Long
 * loops and the first call": with the selection after it in the same function, Node's compiler threw
 * the function's compiled loop away 405 times in a fresh cross-validation of order 3 at 1e4). Unchecked.
 */
function worstOfRuns(u: Float64Array, sgn: Int8Array, m: number, lim: number, worst: number[]): void {
  for (let r = 0; r < m; ) {
    if (sgn[r] !== 0 || !(Math.abs(u[r]) > lim)) { r++; continue; }
    let best = r;
    let e = r;
    while (e < m && sgn[e] === 0 && Math.abs(u[e]) > lim) { if (Math.abs(u[e]) > Math.abs(u[best])) best = e; e++; }
    worst.push(best);
    r = e;
  }
}

/**
 * Certificate of a sign-consistent restricted solution: with u from D^T u = g,
 * g = W (y - b), and delta = max(0, max |u| / lambda - 1), the vector
 * u / (1 + delta) is dual feasible and G(u / (1 + delta)) = (y.g) / (1 + delta) -
 * (1/2) sum g^2 / w / (1 + delta)^2, so P(b) - G is a valid duality gap, formed as
 * lambda ||D b||_1 - u.D b over the active rows plus the cost of scaling u into the box
 * (no cancellation of P against G). D b is exactly zero off the active rows (the
 * restricted solve's space). Unless `optimal` (no row violates by more than
 * {@link boxRelative}) or `anyScale`, accepted only when delta <= 1e-4. The gap is valid for
 * any delta (weak duality for the feasible u / (1 + delta)); `anyScale` is for callers that
 * accept a round by its gap alone (a looser target, such as cross-validation folds). With
 * `within`, a gap above it is reported as not ok without building the result. Unchecked.
 */
export function certify(y: Float64Array, w: Float64Array, lambda: number, last: Certifiable | undefined, optimal: boolean, rounds: number, anyScale = false, within = Infinity): PolishResult {
  const fail = (achieved = Infinity): PolishResult => ({ ok: false, b: new Float64Array(y.length), u: new Float64Array(0), knots: [], dKnots: new Float64Array(0), achieved, rounds });
  if (!last) return fail();
  const { b, u, rss, yg, dA, rows, dmax } = last;
  const um = last.umax ?? maxAbs(u);
  const delta = Math.max(0, um / lambda - 1);
  if (!optimal && !anyScale && delta > 1e-4) return fail();
  const { l1, ud } = knotSums(u, rows, dA);
  const achieved = restrictedGap(lambda, delta, rss, yg, l1, ud);
  // a round checked against a target it misses: no result arrays needed
  if (!(achieved <= within)) return { ok: false, b, u, knots: [], dKnots: new Float64Array(0), achieved, rounds };
  const scale = 1 / (1 + delta);
  const knots: number[] = [], kept: number[] = [];
  for (let j = 0; j < rows.length; j++) if (Math.abs(dA[j]) > 1e-10 * dmax) { knots.push(rows[j]); kept.push(dA[j]); }
  const us = new Float64Array(u.length);
  for (let r = 0; r < u.length; r++) us[r] = u[r] * scale;
  const dKnots = Float64Array.from(kept);
  return { ok: true, b, u: us, knots, dKnots, achieved, rounds };
}

/**
 * The relative duality gap of {@link certify} from its sums: u / f with f = 1 + delta is dual
 * feasible. Its dual value is G(u) - e (y.g - g.W^-1 g (1 - e / 2)), e = 1 - 1 / f, and
 * P(b) - G(u) = lambda ||D b||_1 - u.D b since D^T u = g; so the gap is that sum over the active
 * rows plus the loss from scaling u into the box, each formed without the cancellation of P - G.
 * Rows whose violation was below the slack of {@link boxRelative} are paid for here, not ignored.
 *
 * @param delta - max(0, max |u| / lambda - 1)
 * @param rss - 1/2 sum w (y - b)^2 (so g.W^-1 g = 2 rss)
 * @param yg - y.g, g = W (y - b)
 * @param l1 - ||D b||_1 over the active rows (D b is zero elsewhere)
 * @param ud - u.D b over the active rows
 * @returns gap / P(b) (0 when P(b) is 0)
 * Unchecked.
 */
export function restrictedGap(lambda: number, delta: number, rss: number, yg: number, l1: number, ud: number): number {
  const obj = rss + lambda * l1;
  const gg = 2 * rss;
  const e = 1 - 1 / (1 + delta);
  const gap = Math.max(lambda * l1 - ud, 0) + Math.max(e * (yg - gg * (1 - e / 2)), 0);
  return obj > 0 ? gap / obj : 0;
}

/**
 * The relative duality gap of a restricted solution b against an outside dual point v with
 * |v| <= lambda, such as a converged interior point's iterate, whose fit b_v = y - W^-1 D^T v is given:
 *
 *   P(b) - G(v) = 1/2 ||b - b_v||_W^2 + sum_A (lambda |(D b)_r| - v_r (D b)_r),
 *
 * since G(v) is the Lagrangian's minimum over b, reached at b_v, and the Lagrangian is
 * 1/2 ||.||_W^2-strongly convex (expand 1/2 ||y - b||_W^2 + v.D b about b_v). Both terms are
 * non-negative for |v| <= lambda and are summed without the cancellation of P against G. D b is
 * (D b)_A = dA on the rows A and zero elsewhere (the restricted solve's space). It certifies fits
 * that their own recovered dual cannot: on the knot rows that dual should be exactly +-lambda, and
 * its error there bounds the gap of {@link certify} from below, while the outside v carries no such
 * error. When b is the exact optimum the gap is at most v's own (P(b) <= P(b_v)).
 * Relative to P(b) = rss + lambda ||D b||_1; Infinity when |v| exceeds lambda.
 *
 * @param rss - 1/2 sum w (y - b)^2
 * @example
 * ```ts
 * gapAgainstDual(lambda, rss, fitted, w, rows, dA, ipFit.u, ipFit.b); // <= the interior point's gap at the optimum
 * ```
 * Unchecked.
 */
export function gapAgainstDual(lambda: number, rss: number, b: Float64Array, w: Float64Array, rows: ArrayLike<number>, dA: Float64Array, v: Float64Array, bv: Float64Array): number {
  if (!(maxAbs(v) <= lambda)) return Infinity;
  const { l1, ud } = knotSums(v, rows, dA);
  const gap = 0.5 * weightedSquaredDistance(b, bv, w) + Math.max(lambda * l1 - ud, 0);
  const obj = rss + lambda * l1;
  return obj > 0 ? gap / obj : 0;
}

/**
 * The sums of a certificate's penalty terms over the knot rows, where D b = dA (zero elsewhere):
 * l1 = ||D b||_1 = sum |dA_j| and ud = u.D b = sum u_{rows_j} dA_j. Unchecked.
 */
function knotSums(u: Float64Array, rows: ArrayLike<number>, dA: Float64Array): { l1: number; ud: number } {
  let l1 = 0, ud = 0;
  for (let j = 0; j < rows.length; j++) { l1 += Math.abs(dA[j]); ud += u[rows[j]] * dA[j]; }
  return { l1, ud };
}

/** sum w (a - c)^2 over the points. Unchecked. */
function weightedSquaredDistance(a: Float64Array, c: Float64Array, w: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) { const d = a[i] - c[i]; s += w[i] * d * d; }
  return s;
}

/** A restricted solution with its recovered dual and the sums of its residual ({@link residualDual}), as {@link certify} takes it. Unchecked. */
export interface Certifiable {
  b: Float64Array; u: Float64Array;
  /** max |u| when the caller has it already (the active-set rounds' scan); else certify forms it. */
  umax?: number;
  rss: number; yg: number;
  /** (D b) on the knot rows `rows`, in their order (D b is zero elsewhere). */
  dA: Float64Array; rows: number[]; dmax: number;
}

/**
 * The kept system of active set `from` reduced to `to` by {@link withoutKnot}, when `to` only
 * removes knots from `from` (one or more, the last first); undefined otherwise. Unchecked.
 */
function reducedSystem(system: RestrictedSystem, from: number[], to: number[]): RestrictedSystem | undefined {
  if (to.length >= from.length) return undefined;
  const gone: number[] = [];
  let j = 0;
  for (let i = 0; i < from.length; i++) {
    if (j < to.length && to[j] === from[i]) j++;
    else gone.push(i);
  }
  if (j !== to.length) return undefined;
  let s: RestrictedSystem | null = system;
  for (let q = gone.length - 1; q >= 0 && s; q--) s = withoutKnot(s, gone[q]);
  return s ?? undefined;
}
