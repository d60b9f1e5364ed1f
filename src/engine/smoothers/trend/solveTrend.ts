import type { SolverStatus } from '../../types';
import { totalVariationDenoise } from './totalVariationDenoise';
import { trendDualInteriorPoint, trendOperator, TrendOperator, TrendSolution, INTERIOR_POINT_RULE } from './trendDualInteriorPoint';
import { polishTrend, PolishResult } from './polishTrend';
import { polynomialDual, PolynomialDual } from './trendLambdaMax';
import { trendAdmm, scaledDifferenceRows, AdmmState, AdmmResult, ADMM_RULE } from './trendAdmm';
import { basisCache, BasisCache } from '../../basis/discreteBSplines';
import { activeSetNewton } from './activeSetNewton';
import { maxAbs } from '../../linalg/maxAbs';
import { maxAbsDifference } from '../../linalg/maxAbsDifference';
import { residualDual } from '../../linalg/dualFromResidual';
import { applyRows } from '../../linalg/applyRows';
import { firstDifferenceTranspose } from '../../linalg/difference';
import { dividedInto } from '../../linalg/dividedInto';
import { scaledInto } from '../../linalg/scaledInto';

/** A scaled trend-filtering problem: x (unit mean spacing), y, w (scaled) and order k. Unchecked. */
export interface TrendProblem {
  x: Float64Array;
  y: Float64Array;
  w: Float64Array;
  k: number;
  /** Built on first use for k >= 1. */
  op?: TrendOperator;
  /** x mapped to [0, 1], built on first use. */
  x01?: Float64Array;
  /** Weighted polynomial fit, its dual and lambda_max (on x), built on first use ({@link polynomialOf}). */
  poly?: PolynomialDual;
  /** Rows of the ADMM split operator ({@link scaledDifferenceRows}), built on first use. */
  admmRows?: Float64Array;
  /** Discrete B-spline basis kept between refinement rounds and solves on x01 ({@link BasisCache}). */
  basis?: BasisCache;
}

/** Knot rows and the signs of D b on them: all an exact fit needs to be rebuilt in one refinement round. */
export interface KnotSeed {
  rows: number[];
  signs: number[];
}

/** The {@link KnotSeed} of a fit: its knot rows with the signs of u there. Unchecked. */
export function seedOf(fit: TrendFit): KnotSeed {
  return { rows: fit.knotRows.slice(), signs: fit.knotRows.map((r) => Math.sign(fit.u[r] || 1)) };
}

/** Solution of {@link solveTrend}. */
export interface TrendFit {
  b: Float64Array;
  /** Dual vector (|u| <= lambda; D^T u = W (y - b)). */
  u: Float64Array;
  lambda: number;
  /** Knot rows of D(x, k+1) (row r = knot at point r + k, or r + 1 for k = 0). */
  knotRows: number[];
  /** (D(x, k+1) b) at the knot rows when the refinement produced the fit (exact); otherwise absent. */
  knotDifferences?: Float64Array;
  status: SolverStatus;
  /** ADMM state when the ADMM ran (warm start for the next penalty). */
  admm?: AdmmState;
  /** With `interiorFirst`: whether that first interior-point attempt converged, and the relative gap it reached. */
  interior?: { converged: boolean; achieved: number };
}

/**
 * A {@link TrendFit} with every field present, always in this order. Fits made by the different
 * strategies (or copied with a new status) then share one object shape, so that code reading them is
 * compiled once: a path's loop that read `knotRows` from fits of several shapes threw its compiled
 * code away at each new shape (29 times in one cross-validation of order 1 at 1e4, in a fresh
 * process). The status is rebuilt the same way. Unchecked.
 */
export function trendFit(b: Float64Array, u: Float64Array, lambda: number, knotRows: number[], status: SolverStatus, knotDifferences?: Float64Array, admm?: AdmmState, interior?: { converged: boolean; achieved: number }): TrendFit {
  const st: SolverStatus = { converged: status.converged, iterations: status.iterations, tolerance: status.tolerance, achieved: status.achieved, stoppingRule: status.stoppingRule };
  return { b, u, lambda, knotRows, knotDifferences, status: st, admm, interior };
}

/** `fit` with another status (the same shape, see {@link trendFit}). Unchecked. */
function withStatus(fit: TrendFit, status: SolverStatus): TrendFit {
  return trendFit(fit.b, fit.u, fit.lambda, fit.knotRows, status, fit.knotDifferences, fit.admm, fit.interior);
}

/** Iteration limit of the ADMM when it seeds the refinement. */
const ADMM_SEED_ITERATIONS = 1000;

/**
 * The ADMM hands over to the refinement once its knots have not changed for this many iterations.
 * One (two successive iterations with the same knots) rather than two: on 21 order-1 fits where the
 * interior point stalls (three seeded shapes, 3e4 to 3e5 points, penalties n / 100 to n) the fits are
 * bit for bit the same, the ADMM ran 2 to 62 iterations instead of 3 to 83 and the refinement after
 * it 0 to 10 more rounds, and the two together took 2.9 to 3.4 s instead of 3.9 to 4.5 s (warm, two
 * runs each).
 */
const ADMM_STABLE_ITERATIONS = 1;

/** Round limit of the refinement from no knots when the active-set method from the polynomial fit fails ({@link fromPolynomial}). */
const FROM_POLYNOMIAL_ROUNDS = 3000;

/**
 * A stalled interior point whose relative gap is still at or above this made no progress: its
 * dual says nothing about the knots, and the refinement is not started from it. Measured on the
 * single fits of {@link fromPolynomial}: 8,910 iterations in all with this rule against 11,883
 * without it on the 32, and 8,621 against 9,421 on the 16 more (every fit certified either way).
 */
const INTERIOR_USEFUL_GAP = 0.5;

/**
 * Rounds of the active-set Newton method started from a converged interior point's knots. They
 * also stop, unsettled, once an active set repeats: the method is deterministic, so it cycles and
 * would never settle (nothing a full run would settle is lost). On 275 such starts (single fits of
 * four series per size at n = 1e3, 3e3, 1e4 and 3e4, orders 1 to 3, six penalties each) the 40
 * that do not settle within 8 rounds took 242 rounds instead of 309. A rule on progress (stop once
 * the fewest rows changed in a round has not fallen for 3 rounds) would have cut that to 208 with
 * none of those 235 settled fits lost, but an order-2 fit elsewhere (2,000 points) changes 5, 7,
 * 9, 7, 11, 6, 4 and 0 rows and settles in the eighth round: not used.
 */
const NEWTON_ROUNDS = 8;

/**
 * Largest error of a dual recovered from a fit, relative to lambda, with which the active-set Newton
 * rounds are started from a converged interior point. Their settled fit is kept only with a
 * certificate that scales the dual recovered from it (D^T u = W (y - b), {@link residualDual}) into
 * the box; on the knot rows that u should be exactly +-lambda, so its error there, relative to
 * lambda, is a floor under the certified gap (in the measurements below the gap of a settled fit
 * was its dual's excess over the bound times the fit's y.W (y - b) / P(b), about 1 to 2, and
 * nothing else). That error grows as lambda falls towards 1e-10 of lambda_max and below (the
 * residual's running sums are far larger than lambda) and it is what kept the exact fit from
 * certifying there. The interior point's own fit measures it before any round: its b is
 * y - W^-1 D^T u for its own u, so the dual recovered from b gives back its u up to the same
 * recovery error. Where that is above this limit the rounds cannot end certified and are not run;
 * the interior point's certified answer stands, as it did after them.
 * Measured on single fits of seven seeded shapes (gaps in x with weights, heavy-tailed spikes, a
 * weekly pattern on a level shift, Doppler, Blocks, and the bench's two series) at n = 1e3, 3e3 and
 * 1e4, orders 1 to 3, penalties 1e-2 to 1e-15 of lambda_max: of 375 starts the rounds' fit was kept
 * in 90, whose recovered dual was within 9.7e-8 of lambda; 219 starts were above 1e-6, none of them
 * kept, and their rounds took 2.2 s of the 6.2 s of all 375 solves (one process, after the first).
 * Checked on another 371 (n = 2e3, 5e3 and 3e4): 136 kept, within 3.7e-7 (the largest seen), 144
 * above the limit, none kept, 1.9 of 8.7 s. A settled fit's excess was from a hundredth to a few
 * thousand times this measure, hence the margin (3e-7 would have lost one kept fit there). The
 * measure is one pass over the data ({@link residualDual}).
 * A settled round is now also certified against the interior point's own dual where its recovered
 * one misses ({@link activeSetNewton}'s `outside`, {@link gapAgainstDual}), so some rounds above the
 * limit would end certified after all. Measured on the same seven shapes at n = 1e3, 3e3 and 1e4,
 * orders 1 to 3, 1e-2 to 1e-15 of lambda_max (441 single fits, one process each way): with the limit
 * lifted, 176 of the 189 fits at 1e-10 of lambda_max and below became exact fits instead of 37 (there
 * knots cover nearly every row), none more above 1e-10, and in that run every penalty took longer
 * (order 3 on the bench's side-by-side series at 1e4 and lambda 0.1: 28 to 83 ms warm, its rounds
 * cycling without settling). So the limit stays.
 */
export const DUAL_RECOVERY_LIMIT = 1e-6;

export const POLY_RULE = 'exact: lambda at or above lambda_max, where the weighted polynomial fit of degree k is the solution (max |u| <= lambda)';

export const DP_RULE = 'exact dynamic programming (Johnson 2013): no iterations or tolerance';

export const ACTIVE_SET_RULE = 'exact active-set refinement from a known knot set, kept only with a duality-gap certificate: optimal when every |u| <= lambda up to the precision of u and u = lambda * sign(D b) on the knots';

/** How the active-set strategies certify what they return (the end of their rule texts). */
const GAP_CERTIFIED = 'kept only with a duality-gap certificate at most the tolerance: u from D^T u = W (y - b) scaled into the box |u| <= lambda, gap = lambda ||D b||_1 - u.D b plus the cost of the scaling';

export const WARM_RULE = `primal-dual active-set rounds (Hintermueller, Ito & Kunisch 2002) from the previous penalty's knots, ${GAP_CERTIFIED}`;

export const TREND_RULE = `${INTERIOR_POINT_RULE}; from its knots, at most ${NEWTON_ROUNDS} rounds of an active-set Newton method (fewer once an active set repeats), whose settled knots are kept only with a duality-gap certificate, from the dual recovered from their residual or else from the interior point's dual (else the interior point's answer stands; the rounds are not run when the dual recovered from the interior point's own fit is more than ${DUAL_RECOVERY_LIMIT.toExponential()} of lambda from its dual, where they rarely end certified); where the interior point stalls, for order 1 ${ADMM_RULE}, stopping early once ${ADMM_STABLE_ITERATIONS + 1} successive iterations have had the same knots, then an exact active-set refinement kept only with a duality-gap certificate: optimal when every |u| <= lambda up to the precision of u and u = lambda * sign(D b) on the knots`;

/** Relative size below which an entry of D b counts as zero for k >= 1 without refinement: the interior-point error in D b off the knots is of order gap / (m * distance of u to the bound), far below this. */
export const KNOT_RELATIVE = 1e-8;

/** Relative distance of |u_r| to lambda within which row r counts as on the bound. */
export const DUAL_BOUND_RELATIVE = 1e-6;

/** Options of {@link solveTrend}: one object, read by every strategy. */
export interface SolveTrendOptions {
  /** Relative duality gap to reach. */
  tolerance: number;
  /** Iteration limit of the interior point. */
  maxIterations: number;
  /** The fit at a nearby penalty (the previous point of a path): warm start of the interior point and of its restarts. */
  warm?: TrendFit;
  /**
   * False for cross-validation folds, which only need predictions: a converged interior point is
   * then returned without the exact refinement (default true).
   */
  refine?: boolean;
  /**
   * Try the dual interior point first, from a cold start, and return its answer when it converges
   * (cross-validation folds at penalties where it was seen to converge: {@link trendPath}). When it
   * stalls the usual chain runs; either way the fit's `interior` says what the first attempt reached.
   * Only with `refine` false; otherwise ignored.
   */
  interiorFirst?: boolean;
  /** Knots and signs of an exact fit at this penalty (a path point): rebuilt first. */
  seed?: KnotSeed;
  /**
   * A guess of the knots and signs (a fit of nearby data at this penalty, such as the full-data
   * fit for a cross-validation fold): the active-set method starts from it instead of `warm`'s knots.
   */
  guess?: KnotSeed;
  /**
   * With `guess`: the monotone refinement starts from the guess, without the primal-dual active-set
   * rounds (order 3's fold fits while the interior point takes the penalties with many knots:
   * {@link FOLD_GUESS_REFINED_DIRECTLY} in trendPath; order 3's start from the coarse series,
   * {@link COARSE_REFINED_DIRECTLY}). Default false.
   */
  refineGuessDirectly?: boolean;
}

/** What the strategies of {@link solveTrend} share for one solve. Unchecked. */
interface SolveContext {
  prob: TrendProblem;
  lambda: number;
  opt: SolveTrendOptions;
  poly: PolynomialDual;
  /** N^k: D(x01) = N^k D(x), so on x01 lambda and u are divided by it. */
  f: number;
  /** Work spent so far (interior-point and ADMM iterations, restricted solves). */
  iterations: number;
  /** With `interiorFirst`: the cold interior-point solve already made, which strategy 3 then starts from. */
  cold?: TrendSolution;
  /**
   * The refinement with the smallest gap at this penalty so far, certified or not, shared by the
   * contexts the strategies copy from this one (a refinement at another penalty, such as the middle
   * of a halved step, is not recorded): when no strategy certifies a fit, strategy 3 returns it if
   * it beats the interior point's own answer.
   */
  nearest: { lambda: number; pol?: PolishResult };
}

/**
 * Solves trend filtering of order k at one (scaled) penalty by a short chain of strategies,
 * each tried only when the ones before it did not certify a fit:
 *
 * 1. {@link exactFit}: k = 0 by exact dynamic programming; lambda >= lambda_max by the weighted
 *    polynomial fit (exact).
 * 1b. With `interiorFirst` and `refine` false (cross-validation folds): the dual interior point from
 *    a cold start, returned when it converges; when it stalls, 2b and then 3 (which starts from that
 *    solve instead of solving again).
 * 2. {@link fromSeed}: with `seed` (an exact fit's knots and signs at this penalty) the
 *    refinement rebuilds it in a round or two.
 * 2b. {@link fromWarmActiveSet} (orders 1 to 3): with `guess` (a fold's start from the full-data
 *    fit) or a converged `warm` fit, the primal-dual active-set method (Hintermueller, Ito &
 *    Kunisch 2002) from those knots, finished if it cycles by the monotone refinement, each
 *    result kept only with its duality-gap certificate.
 * 2c. {@link fromCoarseGuess} (orders 1 to 3, a single fit from nothing on at least
 *    {@link COARSE_FROM} points): the same problem on every {@link COARSE_STEP}th point by the
 *    interior point, and strategy 2b from its knots.
 * 3. {@link interiorPointThenRefine}: the dual interior point ({@link trendDualInteriorPoint}).
 *    With `refine` false (cross-validation folds) a converged one is returned as it is. Else,
 *    when it converges, the active-set Newton method ({@link activeSetNewton}, at most
 *    {@link NEWTON_ROUNDS} rounds, fewer once an active set repeats) starts from its knots and a
 *    settled knot set is certified by its own recovered dual or, where that is too imprecise, by the
 *    interior point's dual ({@link gapAgainstDual}); otherwise the interior point's own certified
 *    answer is returned (dense knots of order 3, where the rounds cycle and further rounds were
 *    measured to be wasted). The rounds are not run at all when the dual recovered from the interior
 *    point's own fit is more than {@link DUAL_RECOVERY_LIMIT} of lambda from its dual: their own
 *    certificate cannot succeed there, and the interior point's dual certified them only at
 *    penalties where knots cover nearly every row. When it stalls: for
 *    k = 1 the ADMM of {@link trendAdmm} proposes the knots; then the refinement of
 *    {@link polishTrend} (unless the interior point made no progress) and restarts (cold interior
 *    point, the previous penalty's knots, the warm start over a halved step of
 *    {@link fromHalvedStep}, the active-set method from the polynomial fit of
 *    {@link fromPolynomial}), each only while no answer is certified at the tolerance.
 *
 * Every refinement on x mapped to [0, 1] shares one discrete B-spline basis cache on the
 * problem ({@link BasisCache}). `status.iterations` counts interior-point iterations (the coarse
 * series' included), ADMM iterations and restricted solves together.
 *
 * Knot rows: k = 0, the rows where b jumps (exact); k >= 1 after a successful refinement, the
 * rows where D b is non-zero (exact zeros elsewhere); otherwise rows with
 * |u_r| >= lambda (1 - 1e-6) and |(D b)_r| > 1e-8 max |D b|.
 * Unchecked.
 */
export function solveTrend(prob: TrendProblem, lambda: number, opt: SolveTrendOptions): TrendFit {
  const exact = exactFit(prob, lambda, opt.tolerance);
  if (exact) return exact;
  const ctx = contextOf(prob, lambda, opt);
  if (!opt.interiorFirst || opt.refine !== false) return fromSeed(ctx) ?? fromWarmActiveSet(ctx) ?? fromCoarseGuess(ctx) ?? interiorPointThenRefine(ctx);
  // strategy 1b (folds only): the interior point from a cold start. Converged, strategy 3 returns it as
  // it is; stalled, the active-set method runs, and strategy 3 after it starts from this solve
  if (!prob.op) prob.op = trendOperator(prob.x, prob.w, prob.k);
  const cold = ctx.cold = trendDualInteriorPoint(prob.op, prob.y, lambda, opt.tolerance, opt.maxIterations);
  const interior = { converged: cold.status.converged, achieved: cold.status.achieved };
  const viaActiveSet = cold.status.converged ? undefined : fromWarmActiveSet(ctx);
  const fit = viaActiveSet ? withStatus(viaActiveSet, { ...viaActiveSet.status, iterations: viaActiveSet.status.iterations + cold.status.iterations }) : interiorPointThenRefine(ctx);
  return trendFit(fit.b, fit.u, fit.lambda, fit.knotRows, fit.status, fit.knotDifferences, fit.admm, interior);
}

/** Rounds of the active-set Newton method started from the previous penalty's knots. */
const WARM_NEWTON_ROUNDS = 30;

/**
 * Orders 2 and 3: those rounds stop once the fewest rows changed in a round has not improved for
 * this many rounds. Measured on a 5 x 30 cross-validation at n = 1e4 before knots slid: 8 rounds
 * gave 18% fewer restricted solves for order 2 and 1% fewer for order 3 than no limit (4 or 12 did
 * worse). With sliding knots, order 3 did better with more patience (24 rounds: 16 to 18% fewer
 * restricted solves than 8 on two seeded series). Since the monotone refinement that takes over
 * solves its rounds that only drop knots without a pass over the data ({@link polishTrend}), handing
 * over sooner pays again: on the `trend-cv` series and two more seeds at 1e4 (5 x 30, two runs each),
 * order 3's cross-validation took 9.4 to 9.8 s in all with 8 against 11.4 to 11.7 s with 24 (4: 9.5
 * to 9.8 s; 2 moved one series' minimum by a df), and order 2's 6.6 s with 4 against 6.9 to 7.0 s
 * with 8 (2: 6.3 to 6.6 s); every minimum stayed at the same df.
 */
const WARM_NEWTON_PATIENCE = [Infinity, Infinity, 4, 8];

/**
 * Orders whose fits warm-started from the previous penalty's fit (a full-data path, and the halves of
 * {@link fromHalvedStep}) start the monotone refinement of {@link polishTrend} from its knots, without
 * the primal-dual active-set rounds. Since order 3's refinement lets only the largest few violations
 * join per round (JOINING_AT_LEAST in polishTrend.ts) it moves the previous knots to the new optimum in fewer
 * solves than the rounds and the refinement after them (on order 3's path the rounds settled at 2 of 30
 * penalties at 1e4, and their last set was often further from the optimum than their start, with pairs
 * of adjacent knots split by hundreds of rows). Measured on order 3's path of 30 penalties over four
 * bench series (`benchSeries`): 2,111 solves from the data instead of 2,899 at 1e3 points, 2,842
 * instead of 3,798 at 3,000, 3,826 instead of 4,588 at 1e4 and 4,621 instead of 5,514 at 3e4, with every
 * penalty certified by the same route; the path took 0.44 to 0.46 s instead of 0.48 to 0.52 s at 1e4
 * and 1.04 to 1.15 s instead of 1.27 to 1.36 s at 3e4 (warm, least of 3, alternating runs). Before that
 * limit, the refinement alone from the previous knots took more rounds than with the active-set rounds
 * first (4,864 to 5,921 against 2,882 on the `trend-cv` series), and two penalties failed. Order 2 made
 * fewer solves this way too (2,402 instead of 3,182 at 1e4) but took no less time (0.24 to 0.31 s both),
 * and keeps the rounds.
 */
export const WARM_REFINED_DIRECTLY = [false, false, false, true];

/** Round limit of that refinement for order 1. */
const WARM_POLISH_ROUNDS = 60;

/** Round limit of that refinement for orders 2 and 3, plus 3 rounds per starting knot. */
const WARM_POLISH_ROUNDS_HIGHER = 200;

/**
 * Strategy 2b: along a path (or a fold's path) the previous penalty's knots are a near-right
 * active set. The primal-dual active-set method of {@link activeSetNewton} (M. Hintermueller,
 * K. Ito and K. Kunisch, "The primal-dual active set strategy as a semismooth Newton method",
 * SIAM J. Optim. 13 (2002) 865-888) starts from them, one banded solve per round; its settled
 * round carries the duality-gap certificate. Without refinement (cross-validation folds) the
 * first round certified at the tolerance is enough. When the rounds cycle (an active set repeats)
 * or run out, the monotone refinement of {@link polishTrend} finishes from the last active set.
 * Not certified: undefined, and the interior point takes over.
 *
 * Measured on cross-validation (5 folds x 30 penalties, n = 3000 to 5000) it halves the work of
 * order 1. Knots slide here (see {@link activeSetNewton}): the start's knots are displaced by some
 * rows, and a knot moved in one round instead of two halved the restricted solves of order 3 (a fold
 * fit's median from 120 rounds to 36 at n = 1e4). For orders 2 and 3 (duals of third and fourth
 * differences) the rounds may still cycle, and the monotone refinement then finishes; still
 * each round is one banded solve where an interior-point iteration is a larger one, and at the
 * smallest penalties of order 3, where the interior point stalls, it is what converges. A fold fit
 * (no refinement wanted) stops at the first round certified at the tolerance. Unchecked.
 */
function fromWarmActiveSet(ctx: SolveContext, rule = WARM_RULE, mostPolishRounds = Infinity): TrendFit | undefined {
  const { warm, guess, refine = true, tolerance } = ctx.opt;
  const { prob, lambda, f } = ctx;
  if (prob.k < 1) return undefined;
  const start = guess ?? (warm && warm.status.converged ? seedOf(warm) : undefined);
  if (!start) return undefined;
  // the monotone refinement straight from the start: a fold's guess when asked, a path's previous knots by order
  const skip = guess !== undefined ? ctx.opt.refineGuessDirectly === true : refine && WARM_REFINED_DIRECTLY[prob.k];
  const asn = skip ? undefined : activeSetNewton(x01Of(prob), prob.y, prob.w, prob.k, lambda / f, start.rows, start.signs, WARM_NEWTON_ROUNDS, cacheOf(prob), refine ? 0 : tolerance, true, WARM_NEWTON_PATIENCE[prob.k], true);
  if (asn) ctx.iterations += asn.rounds;
  let pol = asn?.fit;
  // cycling among a few rows: the monotone refinement finishes from the last active set
  if (!(pol && certifiedAt(pol, tolerance))) {
    // orders 2 and 3: knots move further between penalties and between the full data and a fold
    // (measured: 60 to 200 rounds from the previous knots at n = 1e4, about 3 per knot)
    const maxRounds = Math.min(mostPolishRounds, prob.k === 1 ? WARM_POLISH_ROUNDS : WARM_POLISH_ROUNDS_HIGHER + 3 * start.rows.length);
    const from = asn ?? start;
    pol = refineFromKnots(ctx, from.rows, from.signs, maxRounds, refine ? 0 : tolerance);
  }
  return pol && certifiedAt(pol, tolerance) ? refinedFit(pol, f, lambda, tolerance, ctx.iterations - pol.rounds, undefined, rule) : undefined;
}

/** Every this many points make the coarse series of {@link fromCoarseGuess}. */
export const COARSE_STEP = 10;

/** {@link fromCoarseGuess} runs from this many points (its coarse series then has 100). */
export const COARSE_FROM = 1000;

/**
 * {@link fromCoarseGuess} gives up when the coarse fit has knots at more than this share of its
 * rows: knots that dense (order 3 at small penalties) are not where the full series has them, and
 * without a limit the active-set method and refinement from them took far longer than the interior
 * point (order 3 at 1e5 points, coarse knots on 99%, 96% and 71% of the rows: 68.7 s, 13.7 s and
 * 2.2 s against 0.28 to 0.31 s). Half instead of a quarter was within 2% on 342 fits of orders 1
 * to 3 (nine series, 1,200 to 50,000 points): the more cautious limit is kept.
 */
export const COARSE_DENSEST = 0.25;

/**
 * Below this share of lambda_max {@link fromCoarseGuess} is not tried: its coarse fit would be too
 * dense. Measured on four series of 30,000 points (noise, a random walk, the bench's two series),
 * the coarse fit had knots on 74% to 100% of its rows at 1e-12 lambda_max for order 3 and on all of
 * them for order 2 (at 1e-10: 21% to 89% and 93% to 100%).
 */
export const COARSE_SMALLEST = 1e-11;

/**
 * The coarse interior point's knots are used when its relative gap is at most this, converged or
 * not: order 1 at large penalties stalls short of the tolerance on the coarse series as on the
 * full one (a gap of 1.5e-6 on a random walk of 3,000 points at a tenth of lambda_max), and its
 * knots are still a start a few rows off.
 */
export const COARSE_USEFUL_GAP = 1e-4;

/**
 * Round limit of the refinement after the active-set rounds from the coarse knots: the previous
 * penalty's limit ({@link WARM_POLISH_ROUNDS} for order 1; 200 plus 3 per starting knot for orders
 * 2 and 3), but at most this, so that a start that does not suit costs a bounded number of solves. The
 * starts that succeeded on 120 fits of orders 2 and 3 (six series of 3,000 and 30,000 points, five
 * penalties each) took at most about 240 solves all told; with a limit of 60 rounds for every
 * order, those that succeeded fell from 48 to 28 of the 60 order-2 fits and from 32 to 22 of order 3's.
 */
export const COARSE_POLISH_ROUNDS = 400;

/**
 * The coarse penalty per order, times lambda / 10 / c^k: order 1 takes a larger one. With the same
 * factor (1) for every order, the coarse fit of order 1 on long noisy series had about twice the
 * knots of the full fit (1,753 against 798 on 1e6 points of the bench's series at lambda 1,000),
 * and the rounds from them failed there (the interior point then took over after 1.4 s); with
 * sqrt(10) they succeed (1.9 to 2.6 s for the fit instead of 3.8 to 4.7 s), and over 60 fits of
 * order 1 on six series (3,000 and 30,000 points, five penalties each) the total time was about the
 * same as with 1 or 10. Order 2 did best with 1 (1,126 ms against 1,262 and 1,413 ms over its 60
 * fits), order 3 about the same with any.
 */
export const COARSE_PENALTY_FACTOR = [1, Math.sqrt(10), 1, 1];

/**
 * Per order: the monotone refinement starts straight from the coarse knots, without the
 * active-set rounds (as order 3 does from the previous penalty's knots: {@link WARM_REFINED_DIRECTLY}).
 * Measured on order 3's fits over nine series (1,200 to 50,000 points, five or six penalties each,
 * warm): 2,054 ms and 2,970 ms on two sets against 2,161 and 3,061 ms for the interior point's
 * route in the same runs, where the rounds first had given 2,207 ms against 2,278 and 3,333 ms
 * against 3,123 (on one series with gaps in x the rounds from 48 coarse knots to an optimum with
 * 146 moved away, 80 to 195 rows per round, and the refinement after them did not finish). Order 2
 * did worse this way (2,354 ms against 2,090 on the second set), so it keeps the rounds.
 */
export const COARSE_REFINED_DIRECTLY = [false, false, false, true];

export const COARSE_RULE = `primal-dual active-set rounds (Hintermueller, Ito & Kunisch 2002; for order 3 the exact active-set refinement alone) started from the knots of the same problem on every ${COARSE_STEP}th point (solved there by the dual interior point), ${GAP_CERTIFIED}`;

/**
 * Strategy 2c: a single fit with nothing to start from (no previous penalty, no seed or guess)
 * on at least {@link COARSE_FROM} points solves the same problem on every {@link COARSE_STEP}th
 * point first (the dual interior point, {@link trendDualInteriorPoint}), and starts the
 * active-set method and refinement of {@link fromWarmActiveSet} on the full series from that
 * fit's knots, each moved
 * to the full series' row of the same point. The coarse problem keeps x in the same units and
 * the same penalty per unit of data: half the weighted squares of every 10th point are a tenth
 * of the full sum, so its penalty is lambda / 10, then scaled with x to unit mean spacing (D b
 * gains a factor c^k when x is divided by c). A multigrid-style warm start: the coarse knots
 * are an active set displaced by a few rows, what the sliding rounds of {@link activeSetNewton}
 * are for. Kept only with its duality-gap certificate, like every strategy; undefined (the
 * interior point takes over) when the coarse fit's gap is above {@link COARSE_USEFUL_GAP}, it
 * has knots on more than {@link COARSE_DENSEST} of its rows, or the rounds and refinement from
 * them fail.
 * Unchecked.
 */
function fromCoarseGuess(ctx: SolveContext): TrendFit | undefined {
  const { prob, lambda, opt } = ctx;
  const { x, y, w, k } = prob;
  const n = x.length;
  if (k < 1 || n < COARSE_FROM || opt.warm || opt.guess || opt.seed || opt.refine === false || lambda < COARSE_SMALLEST * ctx.poly.lambdaMax) return undefined;
  const nc = Math.floor((n - 1) / COARSE_STEP) + 1;
  const xc = new Float64Array(nc), yc = new Float64Array(nc), wc = new Float64Array(nc);
  everyNthPoint(x, y, w, COARSE_STEP, xc, yc, wc);
  // x to unit mean spacing, and lambda / COARSE_STEP (the data term's share) times c^k for x / c
  const c = (xc[nc - 1] - xc[0]) / (nc - 1);
  dividedInto(xc, c, xc, nc);
  const lc = (COARSE_PENALTY_FACTOR[k] * lambda) / COARSE_STEP / Math.pow(c, k);
  const cp: TrendProblem = { x: xc, y: yc, w: wc, k, op: trendOperator(xc, wc, k) };
  const coarse = trendDualInteriorPoint(cp.op!, yc, lc, opt.tolerance, opt.maxIterations);
  ctx.iterations += coarse.status.iterations;
  if (!(coarse.status.achieved <= COARSE_USEFUL_GAP)) return undefined;
  const knots = knotRowsOf(cp, coarse.b, coarse.u, lc);
  if (knots.length > COARSE_DENSEST * (nc - k - 1)) return undefined;
  // coarse row r is the knot at coarse point r + k, full point COARSE_STEP (r + k), full row that
  // minus k: increasing with r, and at most n - 11 - k since r + k <= nc - 2 and COARSE_STEP (nc - 1) <= n - 1
  const rows = knots.map((r) => COARSE_STEP * (r + k) - k);
  const signs = knots.map((r) => (coarse.u[r] < 0 ? -1 : 1));
  const sub: SolveContext = { ...ctx, opt: { ...opt, guess: { rows, signs }, refineGuessDirectly: COARSE_REFINED_DIRECTLY[k] } };
  const fit = fromWarmActiveSet(sub, COARSE_RULE, COARSE_POLISH_ROUNDS);
  ctx.iterations = sub.iterations;
  return fit;
}

/**
 * Halvings of the log-penalty step that {@link fromHalvedStep} may make (2: down to a quarter of
 * the step). Measured on order 3's path (30 penalties) over three seeded bench series at n = 1e4:
 * one point of each path failed to warm-start at 16 to 19 knots; on one series the interior
 * point, the refinements after it and the previous knots failed too, and the continuation from
 * lambda_max took 2,215 restricted solves there. One halving certified it instead, in 1,184 rounds
 * all told for that point (the three paths: 8,447 restricted solves instead of 9,778, 12% less
 * time, measured before the refinement's drop rounds became cheap). The other two points were certified before this fallback and did not change.
 */
const HALVINGS = 2;

export const FROM_POLYNOMIAL_RULE = `${WARM_RULE}, started from the weighted polynomial fit (exact at lambda_max, no knots); else the exact active-set refinement from no knots`;

export const HALVED_RULE = `${WARM_RULE}, reached over the log-penalty step halved (the geometric mean of the two penalties solved first from the previous penalty's fit)`;

/**
 * A warm start over a shorter step. When the fits started from the previous penalty's fit have
 * failed, the active-set method of {@link fromWarmActiveSet} solves the geometric mean of the two
 * penalties from that fit, then this penalty from the result; a half that fails is halved again,
 * `depth` halvings at most. Knots move less over a shorter step, and each half keeps its
 * duality-gap certificate (the middle one at this solve's tolerance). Undefined without a converged
 * warm fit at a larger penalty, or when a half fails. Unchecked.
 */
function fromHalvedStep(ctx: SolveContext, depth: number): TrendFit | undefined {
  const { warm } = ctx.opt;
  if (depth <= 0 || ctx.prob.k < 1 || !warm || !warm.status.converged || !(warm.lambda > ctx.lambda)) return undefined;
  const sub = (lambda: number, from: TrendFit): TrendFit | undefined => {
    const c: SolveContext = { ...ctx, lambda, opt: { ...ctx.opt, warm: from, guess: undefined }, iterations: 0 };
    const fit = fromWarmActiveSet(c) ?? fromHalvedStep(c, depth - 1);
    ctx.iterations += c.iterations;
    return fit;
  };
  const half = sub(Math.sqrt(warm.lambda * ctx.lambda), warm);
  const fit = half && sub(ctx.lambda, half);
  return fit && withStatus(fit, { ...fit.status, iterations: ctx.iterations, stoppingRule: HALVED_RULE });
}

/** {@link fromHalvedStep} on its own, from `opt.warm` (exported for its tests). Unchecked. */
export function solveTrendOverHalvedStep(prob: TrendProblem, lambda: number, opt: SolveTrendOptions, depth = HALVINGS): TrendFit | undefined {
  return fromHalvedStep(contextOf(prob, lambda, opt), depth);
}

/** A fresh {@link SolveContext} of one solve. Unchecked. */
function contextOf(prob: TrendProblem, lambda: number, opt: SolveTrendOptions): SolveContext {
  return { prob, lambda, opt, poly: polynomialOf(prob), f: Math.pow(prob.x[prob.x.length - 1] - prob.x[0], prob.k), iterations: 0, nearest: { lambda } };
}

/** Exact answers without iterations: k = 0 (dynamic programming) and lambda >= lambda_max (the polynomial). Unchecked. */
function exactFit(prob: TrendProblem, lambda: number, tolerance: number): TrendFit | undefined {
  const { x, y, w, k } = prob;
  const n = x.length;
  if (k === 0) {
    const b = totalVariationDenoise(y, w, lambda);
    const u = new Float64Array(n - 1);
    const knotRows: number[] = [];
    // each pass a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
    levelDualAndJumps(y, w, b, u, 1e-13 * maxAbs(b), knotRows);
    return trendFit(b, u, lambda, knotRows, { converged: true, iterations: 1, tolerance: 0, achieved: 0, stoppingRule: DP_RULE });
  }
  // at or above lambda_max the weighted polynomial fit is the exact solution
  const poly = polynomialOf(prob);
  if (lambda >= poly.lambdaMax) return polynomialFit(poly, lambda, tolerance);
  return undefined;
}

/** x mapped to [0, 1], the refinement's coordinates (built once). Unchecked. */
function x01Of(prob: TrendProblem): Float64Array {
  if (!prob.x01) {
    const x = prob.x, n = x.length, N = x[n - 1] - x[0];
    prob.x01 = new Float64Array(n);
    toUnitInterval(x, N, prob.x01);
  }
  return prob.x01;
}

/** The discrete B-spline cache of the problem's refinements (built once). Unchecked. */
function cacheOf(prob: TrendProblem): BasisCache {
  if (!prob.basis) prob.basis = basisCache();
  return prob.basis;
}

/** The refinement of {@link polishTrend} on x01 started from given knot rows and signs (dual on the bound there). Unchecked. */
function refineFromKnots(ctx: SolveContext, rows: ArrayLike<number>, signs: ArrayLike<number>, maxRounds?: number, stopGap = 0): PolishResult {
  const { prob, lambda, f } = ctx;
  const n = prob.x.length;
  const start = new Float64Array(n - prob.k - 1);
  for (let j = 0; j < rows.length; j++) start[rows[j]] = (signs[j] >= 0 ? 1 : -1) * (lambda / f);
  return counted(ctx, polishTrend(x01Of(prob), prob.y, prob.w, prob.k, lambda / f, start, maxRounds, rows, cacheOf(prob), stopGap));
}

/** Strategy 2: an exact fit known by its knots (a path point), rebuilt in a round or two. Unchecked. */
function fromSeed(ctx: SolveContext): TrendFit | undefined {
  const { seed, refine = true } = ctx.opt;
  return seed && refine ? fromKnots(ctx, seed) : undefined;
}

/** The refinement of {@link polishTrend} from knots and signs (at most `maxRounds` rounds), kept when certified at the tolerance. Unchecked. */
function fromKnots(ctx: SolveContext, seed: KnotSeed, maxRounds?: number): TrendFit | undefined {
  const pol = refineFromKnots(ctx, seed.rows, seed.signs, maxRounds);
  return certifiedAt(pol, ctx.opt.tolerance) ? refinedFit(pol, ctx.f, ctx.lambda, ctx.opt.tolerance, ctx.iterations - pol.rounds, undefined, ACTIVE_SET_RULE) : undefined;
}

/**
 * Strategy 3: the dual interior point, its knots refined exactly; the ADMM for k = 1 where the
 * interior point stalls; restarts (cold interior point, the previous penalty's knots, a warm
 * start over a halved step, the active-set method from the polynomial fit), each only while no
 * answer is certified at the tolerance. The best answer is returned (certified when one is). Unchecked.
 */
function interiorPointThenRefine(ctx: SolveContext): TrendFit {
  const { prob, lambda, f } = ctx;
  const { tolerance, maxIterations, warm, refine = true } = ctx.opt;
  const { x, y, w, k } = prob;
  const n = x.length;
  if (!prob.op) prob.op = trendOperator(x, w, k);
  const x01 = x01Of(prob);
  const cache = cacheOf(prob);
  let sol = ctx.cold ?? trendDualInteriorPoint(prob.op, y, lambda, tolerance, maxIterations, warm?.u);
  // without refinement (cross-validation folds) a converged interior point is enough; one that
  // stalled is not, and goes on to the refinement like any other
  if (!refine && sol.status.converged) return trendFit(sol.b, sol.u, lambda, knotRowsOf(prob, sol.b, sol.u, lambda), { ...sol.status, iterations: ctx.iterations + sol.status.iterations, stoppingRule: TREND_RULE });
  const u01 = new Float64Array(sol.u.length);
  dividedInto(sol.u, f, u01, u01.length);
  let pol: PolishResult = { ok: false, b: sol.b, u: sol.u, knots: [], dKnots: new Float64Array(0), achieved: Infinity, rounds: 0 };
  // a converged interior point knows the knots: start the refinement from them (the rows where
  // D b is non-zero and u is on the bound), not from runs of u near the bound, which merge close knots
  if (sol.status.converged) {
    // a converged interior point knows the knots (the rows where D b is non-zero and u is on the
    // bound); from them the active-set Newton method settles in a few rounds, and the settled exact
    // fit is certified by its own recovered dual or else by the interior point's dual (which carries
    // no recovery error). When it does not settle (dense knots of order 3), the interior point's own
    // certified answer stands: no further refinement rounds. Nor are the rounds run when the dual
    // recovered from the interior point's own fit is too far from its dual (DUAL_RECOVERY_LIMIT)
    const rows = knotRowsOf(prob, sol.b, sol.u, lambda);
    if (maxAbsDifference(residualDual(x01, k + 1, y, w, sol.b).u, u01, u01.length) <= DUAL_RECOVERY_LIMIT * (lambda / f)) {
      const asn = activeSetNewton(x01, y, w, k, lambda / f, rows, rows.map((r) => (sol.u[r] >= 0 ? 1 : -1)), NEWTON_ROUNDS, cache, 0, true, Infinity, false, { v: u01, bv: sol.b, within: tolerance });
      ctx.iterations += asn.rounds;
      // a settled round always comes with its certificate (its own, or the interior point's dual's
      // where that is smaller); kept when it meets the tolerance
      const settled = asn.settled ? asn.fit : undefined;
      if (settled && certifiedAt(settled, tolerance)) return refinedFit(settled, f, lambda, tolerance, ctx.iterations - settled.rounds + sol.status.iterations);
    }
    return trendFit(sol.b, sol.u, lambda, rows, { ...sol.status, iterations: ctx.iterations + sol.status.iterations, stoppingRule: TREND_RULE });
  }
  let admmIterations = 0;
  let admm: AdmmResult | undefined;
  if (!sol.status.converged && k === 1) {
    // the interior point stalled (long series): the ADMM finds the knots, the refinement makes them exact
    if (!prob.admmRows) prob.admmRows = scaledDifferenceRows(x, k);
    // warm start from the interior point's iterate: alpha = T b, rho s = D1^T u (rho = lambda)
    const mt = n - k;
    const alpha = applyRows(prob.admmRows, k + 1, sol.b, new Float64Array(mt));
    const sc = new Float64Array(mt);
    firstDifferenceTranspose(sol.u, sc, mt - 1);
    dividedInto(sc, lambda, sc, mt);
    admm = trendAdmm(x, y, w, k, lambda, tolerance, ADMM_SEED_ITERATIONS, { alpha, s: sc, rho: lambda }, prob.admmRows, ADMM_STABLE_ITERATIONS);
    admmIterations = admm.status.iterations;
    const ua = new Float64Array(admm.u.length);
    dividedInto(admm.u, f, ua, ua.length);
    pol = counted(ctx, polishTrend(x01, y, w, k, lambda / f, ua, undefined, admm.knots, cache));
    if (certifiedAt(pol, tolerance)) return refinedFit(pol, f, lambda, tolerance, ctx.iterations - pol.rounds + sol.status.iterations + admmIterations, admm.state);
  }
  // each fallback below runs only while no answer is certified at the tolerance (a refinement that
  // stopped early may still be ok with a larger gap: the best such answer is kept for the end)
  const certified = (p: PolishResult) => certifiedAt(p, tolerance);
  // the refinement from a stalled interior point's dual, unless it made no progress
  const fromInterior = (): PolishResult => (sol.status.achieved < INTERIOR_USEFUL_GAP ? counted(ctx, polishTrend(x01, y, w, k, lambda / f, u01, undefined, undefined, cache)) : pol);
  if (!certified(pol)) pol = better(pol, fromInterior());
  if (!certified(pol) && warm && !ctx.cold) {
    // a warm start can stall where a cold one does not
    const cold = trendDualInteriorPoint(prob.op, y, lambda, tolerance, maxIterations);
    const iters = sol.status.iterations + cold.status.iterations;
    if (cold.status.achieved < sol.status.achieved) sol = cold;
    sol = { ...sol, status: { ...sol.status, iterations: iters } };
    if (!sol.status.converged) {
      dividedInto(sol.u, f, u01, u01.length);
      pol = better(pol, fromInterior());
    }
  }
  if (!certified(pol) && !sol.status.converged) {
    // the interior-point dual is unreliable here (see its limitation note): restart the
    // active-set refinement from the previous penalty's knots, then warm starts over a halved
    // step, then the active-set method from the polynomial fit
    if (warm && warm.knotRows.length) { const seed = seedOf(warm); pol = better(pol, refineFromKnots(ctx, seed.rows, seed.signs)); }
    const restart = certified(pol) ? undefined : fromHalvedStep(ctx, HALVINGS) ?? fromPolynomial(ctx);
    if (restart) return withStatus(restart, { ...restart.status, iterations: restart.status.iterations + sol.status.iterations });
  }
  // every refinement of this solve, the earlier strategies' and the restarts' included, that came
  // close without a certificate
  if (ctx.nearest.pol) pol = better(pol, ctx.nearest.pol);
  const spent = ctx.iterations + sol.status.iterations + admmIterations;
  if (pol.ok && (pol.achieved <= tolerance || pol.achieved <= sol.status.achieved) && !(admm && admm.achieved < pol.achieved)) {
    return refinedFit(pol, f, lambda, tolerance, spent - pol.rounds, admm?.state);
  }
  if (admm && admm.achieved < sol.status.achieved) {
    const status = { converged: admm.achieved <= tolerance, iterations: spent, tolerance, achieved: admm.achieved, stoppingRule: TREND_RULE };
    return trendFit(admm.b, admm.u, lambda, knotRowsOf(prob, admm.b, admm.u, lambda), status, undefined, admm.state);
  }
  const knotRows = knotRowsOf(prob, sol.b, sol.u, lambda);
  return trendFit(sol.b, sol.u, lambda, knotRows, { ...sol.status, iterations: spent, stoppingRule: TREND_RULE });
}

/** Whether a refinement is certified at the tolerance. Unchecked. */
function certifiedAt(pol: PolishResult, tolerance: number): boolean {
  return pol.ok && pol.achieved <= tolerance;
}

/** Of two refinements, the one with an answer and the smaller certified gap (`a` on a tie). Unchecked. */
function better(a: PolishResult, b: PolishResult): PolishResult {
  return b.ok && (!a.ok || b.achieved < a.achieved) ? b : a;
}

/**
 * Adds a refinement's rounds to the work count of the solve, and keeps it as the solve's nearest
 * refinement when it is at the solve's penalty with a smaller gap ({@link SolveContext.nearest}). Unchecked.
 */
function counted(ctx: SolveContext, pol: PolishResult): PolishResult {
  ctx.iterations += pol.rounds;
  const near = ctx.nearest;
  if (near.lambda === ctx.lambda) near.pol = near.pol ? better(near.pol, pol) : pol;
  return pol;
}

/**
 * The last restart: the active-set method of {@link fromWarmActiveSet} started from the weighted
 * polynomial fit (exact at lambda_max, no knots), finished by the monotone refinement, else the
 * refinement alone from no knots with a budget of {@link FROM_POLYNOMIAL_ROUNDS} rounds; certified
 * at the solve's tolerance or undefined.
 *
 * It replaces a continuation from lambda_max in 4 steps per decade, each step refined from the
 * step before's knots, whose refinements ran out of rounds (knots have to travel far on long
 * series). Measured on 32 single fits (orders 2 and 3; 3e4 and 1e5 points; the bench's two series;
 * penalties 1e-2 to 1e-5 of lambda_max): that chain certified 17, left 10 above the tolerance and
 * refused 5; the same continuation warm-started step by step as along a path certified all 32,
 * with 15,016 iterations in all (interior-point iterations and restricted solves) at one step per
 * decade, 11,792 at one per two decades, 9,630 at one per four and 8,910 in one step from the
 * polynomial fit. On 16 more (1e4 and 1e5 points, 1e-6 and 1e-7 of lambda_max), where the earlier
 * chain certified 4 and refused 9, the one step certified all 16. Unchecked.
 */
function fromPolynomial(ctx: SolveContext): TrendFit | undefined {
  const { lambda, poly } = ctx;
  if (!(poly.lambdaMax > lambda)) return undefined;
  const c: SolveContext = { ...ctx, opt: { ...ctx.opt, warm: polynomialFit(poly, poly.lambdaMax, ctx.opt.tolerance), guess: undefined, seed: undefined }, iterations: 0 };
  const fit = fromWarmActiveSet(c) ?? fromKnots(c, { rows: [], signs: [] }, FROM_POLYNOMIAL_ROUNDS);
  ctx.iterations += c.iterations;
  return fit && withStatus(fit, { ...fit.status, iterations: ctx.iterations, stoppingRule: FROM_POLYNOMIAL_RULE });
}

/** The weighted polynomial fit as the exact {@link TrendFit} at a penalty at or above lambda_max (copies of b and u). Unchecked. */
function polynomialFit(poly: PolynomialDual, lambda: number, tolerance: number): TrendFit {
  return trendFit(Float64Array.from(poly.b), Float64Array.from(poly.u), lambda, [], { converged: true, iterations: 0, tolerance, achieved: 0, stoppingRule: POLY_RULE });
}

/** The weighted polynomial fit of degree k, its dual and lambda_max for `prob`, computed once. Unchecked. */
export function polynomialOf(prob: TrendProblem): PolynomialDual {
  if (!prob.poly) prob.poly = polynomialDual(prob.x, prob.y, prob.w, prob.k);
  return prob.poly;
}

/**
 * A {@link TrendFit} from a refinement on x in [0, 1]: u and D b scale back by N^k (`f`),
 * D(x01) = N^k D(x). `before` counts the iterations spent before the refinement. Unchecked.
 */
function refinedFit(pol: PolishResult, f: number, lambda: number, tolerance: number, before: number, admm?: AdmmState, rule = TREND_RULE): TrendFit {
  const status = { converged: pol.achieved <= tolerance, iterations: before + pol.rounds, tolerance, achieved: pol.achieved, stoppingRule: rule };
  return trendFit(pol.b, scaledCopy(pol.u, f), lambda, pol.knots, status, scaledCopy(pol.dKnots, 1 / f), admm);
}

// Loops over the points or rows of the solver's own, each a kernel of its own (DEVELOPERS.md, "Long
// loops and the first call": inside the long solver they made Node throw its compiled code away). Unchecked.

/** Every step-th point of (x, y, w), from the first, into (xc, yc, wc). Unchecked. */
function everyNthPoint(x: Float64Array, y: Float64Array, w: Float64Array, step: number, xc: Float64Array, yc: Float64Array, wc: Float64Array): void {
  for (let i = 0, j = 0; i < xc.length; i++, j += step) { xc[i] = x[j]; yc[i] = y[j]; wc[i] = w[j]; }
}

/** out_i = (x_i - x_0) / N: x mapped to [0, 1] for N = x_{n-1} - x_0. Unchecked. */
function toUnitInterval(x: Float64Array, N: number, out: Float64Array): void {
  for (let i = 0; i < x.length; i++) out[i] = (x[i] - x[0]) / N;
}

/** A copy of v times c ({@link scaledInto}: a typed array's `from` with a mapping function is several times slower). Unchecked. */
function scaledCopy(v: Float64Array, c: number): Float64Array {
  const out = new Float64Array(v.length);
  scaledInto(c, v, out, v.length);
  return out;
}

/**
 * Knot rows of an interior-point solution: |u_r| >= lambda (1 - 1e-6) and |(D b)_r| > 1e-8 max |D b|.
 * Each pass is a function ending with its loop (DEVELOPERS.md, "Long loops and the first call"). Unchecked.
 */
function knotRowsOf(prob: TrendProblem, b: Float64Array, u: Float64Array, lambda: number): number[] {
  const k = prob.k;
  const m = prob.x.length - k - 1;
  const db = applyRows(prob.op!.rows, k + 2, b, new Float64Array(m));
  const out: number[] = [];
  boundKnotRows(u, db, lambda * (1 - DUAL_BOUND_RELATIVE), KNOT_RELATIVE * maxAbs(db), out);
  return out;
}

/** Appends to `out` the rows r with |u_r| >= ubound and |db_r| > dbound. Unchecked. */
function boundKnotRows(u: Float64Array, db: Float64Array, ubound: number, dbound: number, out: number[]): void {
  for (let r = 0; r < db.length; r++) if (Math.abs(u[r]) >= ubound && Math.abs(db[r]) > dbound) out.push(r);
}

/**
 * Order 0: the dual u_i = -sum_{j <= i} w_j (y_j - b_j) (D^T u = W (y - b) for first differences), and
 * the rows i where b jumps by more than `jump` appended to knotRows. Unchecked.
 */
function levelDualAndJumps(y: Float64Array, w: Float64Array, b: Float64Array, u: Float64Array, jump: number, knotRows: number[]): void {
  let acc = 0;
  for (let i = 0; i < u.length; i++) {
    acc -= w[i] * (y[i] - b[i]);
    u[i] = acc;
    if (Math.abs(b[i + 1] - b[i]) > jump) knotRows.push(i);
  }
}
