/**
 * The mixed-smoothness trend: straight pieces with kinks plus smooth bends, for
 * series that are kinked in one stretch and smooth in another (which defeat every
 * single-order method: straight pieces draw a smooth turn as a run of small kinks,
 * smooth bends round every kink off).
 *
 *   minimise 1/2 sum_i w_i (y_i - a_i - c_i)^2 + lambda1 ||D(x, 2) a||_1 + lambda3 ||D(x, 4) c||_1,
 *   c weighted-orthogonal to straight lines (every straight line belongs to a),
 *
 * a sum of two L1 trend-filtering components of orders 1 and 3 (R. J. Tibshirani, Ann.
 * Statist. 42 (2014) 285-323; the sum of trend-filtering components of different orders as
 * in S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, SIAM Review 51 (2009) 339-360, section 6),
 * solved by {@link solveMixed}.
 *
 * Penalties. lambda1 (`penalty`) is in (units of y) x (units of x) x (units of weight), as
 * trend filtering of order 1; lambda3 = lambda1 (width / 4)^2 with `width` in units of x. A
 * slope change s spread over a width L costs about 16 s lambda3 / L^2 as a smooth bend and
 * s lambda1 as kinks, so features narrower than about `width` are drawn as kinks and wider
 * ones as smooth bends. With neither given both are chosen by K-fold cross-validation on the
 * shared folds ({@link crossValidate}): for each width of a doubling grid ({@link mixedWidths}:
 * 4, 8, 16 and 32 mean spacings of x, those up to n / 4), a path of `searchPoints` values of lambda1 log-spaced
 * from the smallest penalty at which both components are polynomials down to 1e-4 of it (further, at the same
 * spacing, while its fits have fewer than n / 5 df: {@link MIXED_PATH_RATIO}), so
 * widths x 10 x (folds + 1) mixed fits at the defaults (4 widths from 128 points; path and fold fits by the dual
 * interior point, {@link mixedDualInteriorPoint}, or the ADMM where it stalls; the chosen one made exact by the block
 * steps of {@link solveMixed}); `cv` takes the lowest error over the grid,
 * `cv-simpler` the fewest df within one standard error of it ({@link choosePenalty} on the
 * grid ordered by df). A df target solves for lambda1 at the given width (default 12 mean
 * spacings).
 *
 * Degrees of freedom: kinks + bend knots + 4, the dimension of the sum of the two spline
 * spaces (straight lines counted once; Tibshirani & Taylor, Ann. Statist. 40 (2012), for the
 * generalised lasso). This counts generic fits exactly; a kink whose neighbouring rows are all
 * bend knots would be counted twice. On the cross-validated fits of the kinked-then-smooth test
 * series the count equals the dimension of the sum of the two spaces computed directly (the
 * tests compute the rank), so the df matched against other methods is the lasso's own.
 *
 * A trend describes the past; its end values are revised as data arrive and it is not a
 * forecast (every result carries the 'boundary' note).
 */
import { KnotwiseError, showNumber } from '../../errors';
import type { Series } from '../../series';
import type { Criterion, CriterionPoint, Evaluation, FitResult, Knot, SolverStatus, NoiseAssumption } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { PENALTY_OPTIONS, SEASON_OPTION } from '../../analysis/penaltyOptions';
import { QUIET, RunContext } from '../../analysis/runContext';
import { crossValidate } from '../../select/crossValidate';
import { foldPlan, NoiseDependence } from '../../select/noiseDependence';
import { choosePenalty, edgeWarning } from '../../select/choosePenalty';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { knotBends } from '../../diagnostics/knotBends';
import { trendScaling, TrendScaling } from '../trend/trendScaling';
import { polynomialDual } from '../trend/trendLambdaMax';
import { interpolateTrend } from '../trend/interpolateTrend';
import { knotPositions, CV_TOLERANCE } from '../trend/trendPath';
import { solveMixed, MixedFit, MixedProblems, MixedSolveSettings, MixedStart } from './solveMixed';
import { foldData } from '../../select/foldData';

/** Smallest width of the cross-validation grid, in mean spacings of x. */
export const MIXED_SMALLEST_WIDTH = 4;

/** Widest width of the cross-validation grid, in mean spacings of x (the former grid's widest was 36). */
export const MIXED_WIDEST_WIDTH = 32;

/**
 * Widths of the cross-validation grid for n points, in mean spacings of x: 4, 8, 16, 32 (each twice
 * the one before), those up to n / 4, and at least the first. The ratio lambda3 / lambda1 grows as the
 * square of the width, so neighbouring widths differ by a factor 4 in the ratio. A coarser grid
 * (4, 12 and 36 spacings, a factor 9 in the ratio) missed the band where the fit is a true mixture:
 * on the invented kinked-then-smooth series (200 points, 7 seeds) widths up to 12 spacings gave the
 * pure order-3 fit (no kinks), 36 and more drew the smooth humps as runs of kinks, and the mixtures
 * with the lowest error against the truth came at 16 to 32 spacings (test/engine/smoothers/mixedAdaptivity.test.ts).
 * Wider widths (64, 128 spacings on long series) were tried and left out for their cost: they are
 * the slowest (many kinks, slow block steps): with them the choice took 7.9 to 9.1 s of CPU time at
 * 1,000 points on two seeded kinked-then-smooth series, without them 1.0 to 1.3 s. They were not
 * chosen on the benchmark's 500-point series; at 1,000 points 128 spacings had the lowest score, by
 * less than 1%, so on long series with wide kinked stretches this grid may miss a slightly better width.
 *
 * @example
 * ```ts
 * mixedWidths(200); // [4, 8, 16, 32]
 * ```
 */
export function mixedWidths(n: number): number[] {
  const out = [MIXED_SMALLEST_WIDTH];
  while (2 * out[out.length - 1] <= Math.min(n / 4, MIXED_WIDEST_WIDTH)) out.push(2 * out[out.length - 1]);
  return out;
}

/** Width used with a fixed penalty or a df target when none is given, in mean spacings of x. */
export const MIXED_DEFAULT_WIDTH = 12;

/**
 * Smallest lambda1 of the path relative to its largest, unless the path's fits are still simple there: it then
 * goes on at the same spacing (at most as many points again) until a fit has {@link MIXED_PATH_DF_SHARE} n degrees
 * of freedom. The top is set by the cubic's order-3 dual, which grows like n^4 in mean spacings of x, while kinks
 * appear at lambda1 of the order of the order-1 dual (like n^2): from about 500 points 1e-4 of the top no longer
 * reached them, and the cross-validated fit had no kinks (on 730 points every fit of the path was the cubic).
 */
export const MIXED_PATH_RATIO = 1e-4;

/**
 * Degrees of freedom, as a share of the points, that a path reaches before it stops (unless it reaches 1e-4 of
 * its top first with more, or runs twice its length): fits that rich lie past the minimum of a cross-validation
 * curve on the series this was measured on (the cross-validated choices came at 14 to 49 df on 200 to 1,000 points).
 */
export const MIXED_PATH_DF_SHARE = 0.2;

/** Settings of {@link fitMixed} (resolved options). */
export interface MixedSettings {
  penalty?: number;
  df?: number;
  /** In units of x. */
  width?: number;
  rule?: 'cv' | 'cv-simpler';
  folds?: number;
  /** What cross-validation assumes of the noise (default 'correlated'). */
  noise?: NoiseAssumption;
  searchPoints?: number;
  /** Largest change of the kink component in a final block step, relative to the sd of y (default 1e-5). */
  tolerance?: number;
  /** Most exact block steps (default {@link MIXED_MAX_CYCLES}). */
  maxIterations?: number;
}

/** State kept for evaluation at new x (the data's units). */
export interface MixedModel {
  x: Float64Array;
  kinks: Float64Array;
  bends: Float64Array;
  /** lambda3 in the data's units and the width it came from. */
  bendPenalty: number;
  width: number;
  /** Number of knots of the smooth-bend component, and their rows of D(x, 4) (knot between points r + 1 and r + 3). */
  bendKnots: number;
  bendRows: number[];
  /** Cross-validation of each width tried: its best score, se, df and penalty. */
  widths?: { width: number; penalty: number; df: number; cv: number; se: number }[];
}

/** Fewest points: the order-3 component needs 5, cross-validation more. */
export const MIXED_MIN_POINTS = 6;

/** lambda1 and lambda3 between the data's units and the scaled ones: lambda1 = l1' m c h, lambda3 = l3' m c h^3. */
function toData1(l: number, sc: TrendScaling): number { return l * sc.m * sc.c * sc.h; }
function toScaled1(l: number, sc: TrendScaling): number { return l / (sc.m * sc.c * sc.h); }

/** Scaled ratio lambda3' / lambda1' for a width in units of x: (width / (4 h))^2. */
function ratioOf(width: number, sc: TrendScaling): number { return (width / (4 * sc.h)) ** 2; }

/** Degrees of freedom of a mixed fit: kinks + bend knots + 4. */
export function mixedDf(fit: MixedFit): number {
  return fit.kinkRows.length + fit.bendRows.length + 4;
}

/**
 * Default limit of the exact block steps of the returned fit. True mixtures (both parts with knots)
 * can need hundreds: on the 200-point acceptance series (mixedAdaptivity.test.ts, seeds 1 to 7) the
 * cross-validated fits took 85 to 869 steps to reach the tolerance, and with the former limit of 100
 * five of the seven stopped short (the kinks still moving by up to 4e-3 sd of y), with a df a few
 * knots off the exact fit's. Each step is two exact trend-filtering solves, so a fit that converges
 * early costs no more.
 */
export const MIXED_MAX_CYCLES = 1000;

/**
 * The returned fit: the dual interior point ({@link mixedDualInteriorPoint}) to a relative gap of 1e-7 (the ADMM
 * where it stalls), then the exact block steps of {@link solveMixed}. From the interior point's answer the block
 * steps reach their tolerance in 2 steps on the invented kinked-then-smooth series (200 points, 7 seeds), where
 * from the ADMM's they took 85 to 869.
 */
const FULL: MixedSolveSettings = { interiorTolerance: 1e-7, exactAfterStall: false, admmTolerance: 1e-6, admmIterations: 5000, tolerance: 1e-5, maxCycles: MIXED_MAX_CYCLES, innerTolerance: 1e-10, innerIterations: 400, refine: true };
/**
 * Points of a penalty path (their df and warm starts): the interior point alone (its knots classified at a gap of
 * 1e-7, within 2 of the exact fit's count on a 730-point series, 0.5 off on average: KNOT_SLACK_SHARE in
 * mixedDualInteriorPoint.ts; finishing every point exactly would cost about 0.7 s there, estimated from the 9 ms
 * the exact steps took per point); where it stalls (the top of a path: few knots), the exact block steps from its
 * best iterate, at most 200 of them. On the invented 200-point kinked-then-smooth series (7 seeds) this took the
 * cross-validated choice from 0.93 to 1.27 s to 0.18 to 0.22 s, every path point converged (4 of 10 of the chosen
 * width's did not: the ADMM stopped at its step limit there), and the choices and scores stayed the same (the fold
 * fits did not change). The exact steps used to start only from an iterate within a relative gap of 1e-2, the ADMM
 * running above that: at the top point (the cubic) it took 198 steps, 18 to 42 ms a width on the 730-point bench
 * series, and on the next three points it stopped after one step each with the cubic, a fit with no knots that
 * cannot be the optimum below the top (such points are marked not converged). From any stalled iterate the exact
 * steps take 2 steps there, 2 to 7 ms, and find the 1 to 3 bend knots those points have: every path point converges,
 * the cross-validation takes 3 to 5% less time, and the choices on the bench and test series stayed the same.
 */
const PATH: MixedSolveSettings = { ...FULL, exactAfterStall: true, maxCycles: 200, admmTolerance: 1e-5, admmIterations: 3000, refine: false };
/**
 * Cross-validation folds: the interior point at the looser gap of trend filtering's folds ({@link CV_TOLERANCE},
 * 1e-3 since this release, 1e-5 before: they only predict held-out points; measured on the 13 series of the bench and
 * tests (156 to 730 points of the automatic choice's bench shapes, the 7 acceptance series, two 500-point series):
 * every chosen df the same, the best score of every width within 0.001 of its value at 1e-5 in relative terms, the
 * chosen width and penalty the same but on one series (730 points: 32 spacings instead of 16, widths whose best scores
 * agree to about 1e-4, at the same df and the same bend penalty), and the cross-validation taking 0.52 to 0.96 of the
 * time on 12 of them (1.5 times on one 200-point series, one run)), from the first penalty of the path at which it converged on the full data,
 * and one before it; the ADMM at the larger penalties above, where the interior point stalls (nearly knot-free
 * fits: ill-conditioned Newton systems) and a failed attempt would only add its cost.
 */
const FOLD: MixedSolveSettings = { ...FULL, interiorTolerance: CV_TOLERANCE, admmTolerance: 1e-4, admmIterations: 3000, refine: false };
const FOLD_ADMM: MixedSolveSettings = { ...FOLD, interiorTolerance: 0 };

/**
 * The top of a path at ratio r (scaled): the smallest lambda1 at which the weighted cubic fit
 * is the solution (lambda3 = r lambda1 at or above lambda_max of order 3, and lambda1 at or
 * above the order-1 dual of the cubic fit's residual); 0 when y is itself a cubic (callers then
 * take 1). Unchecked.
 */
function pathTop(x: Float64Array, y: Float64Array, w: Float64Array, r: number): number {
  const cubic = polynomialDual(x, y, w, 3);
  const resid = Float64Array.from(y, (v, i) => v - cubic.b[i]);
  const one = polynomialDual(x, resid, w, 1).lambdaMax;
  return Math.max(one, cubic.lambdaMax / r);
}

/** One width's path on the full data and its cross-validation. Unchecked. */
interface WidthPath {
  width: number;
  ratio: number;
  /** Scaled lambda1, decreasing. */
  grid: Float64Array;
  fits: MixedFit[];
  cv: Float64Array;
  se: Float64Array;
}

/**
 * Fits the mixed-smoothness trend to a clean series.
 *
 * @param series - clean series (ties merged), at least 6 points
 * @param s - a fixed penalty (lambda1, data units) with an optional width, a df target, or a
 *   cross-validation rule (default 'cv', 5 folds, 12 penalties per width)
 * @throws {@link KnotwiseError} `too-few-points`, `bad-option`, `numerical`
 * @example
 * ```ts
 * const r = fitMixed(seriesFromArrays(x, y), { rule: 'cv' });
 * (r.model as MixedModel).kinks; // straight pieces with kinks; .bends the smooth part
 * ```
 */
export function fitMixed(series: Series, s: MixedSettings, context: RunContext = QUIET): FitResult {
  const n = series.n;
  if (n < MIXED_MIN_POINTS) throw new KnotwiseError('too-few-points', `the mixed trend needs at least ${MIXED_MIN_POINTS} distinct x values; got ${n}.`);
  const sc = trendScaling(series, 1);
  const probs: MixedProblems = { x: sc.xs, w: sc.ws };
  const full: MixedSolveSettings = { ...FULL, ...(s.tolerance !== undefined ? { tolerance: s.tolerance } : {}), ...(s.maxIterations !== undefined ? { maxCycles: s.maxIterations } : {}) };
  const warnings: Warning[] = [...series.warnings];
  let fit: MixedFit;
  let lam1: number;
  let width: number;
  let criterion: Criterion;
  let widths: MixedModel['widths'];
  let dataDriven = false;
  let stoppingNote = '';
  if (s.width !== undefined && !(s.width > 0)) throw new KnotwiseError('bad-option', `width must be a positive number of units of x; got ${showNumber(s.width)}.`);
  if (s.penalty !== undefined) {
    if (!(s.penalty > 0)) throw new KnotwiseError('bad-option', `penalty must be > 0 for the mixed trend; got ${showNumber(s.penalty)}.`);
    width = s.width ?? MIXED_DEFAULT_WIDTH * sc.h;
    lam1 = toScaled1(s.penalty, sc);
    context.step(0.1, 'fitting kinks and bends');
    fit = solveMixed(probs, sc.ys, lam1, lam1 * ratioOf(width, sc), full);
    criterion = { name: 'fixed', value: NaN };
  } else if (s.df !== undefined) {
    width = s.width ?? MIXED_DEFAULT_WIDTH * sc.h;
    const r = solveMixedForDf(probs, sc, ratioOf(width, sc), s.df, s.searchPoints ?? 12, full, context);
    fit = r.fit; lam1 = r.lambda;
    criterion = { name: 'df', value: mixedDf(fit), curve: r.curve, atEdge: false };
    stoppingNote = `; lambda1 by bisection on log(lambda1) for df ${showNumber(s.df)} (df moves in whole steps)`;
    if (mixedDf(fit) !== s.df) warnings.push(warning('target-clamped', `df moves in whole steps (kinks + bend knots + 4); ${showNumber(s.df)} was met as closely as possible: ${mixedDf(fit)}.`));
  } else {
    dataDriven = true;
    const rule = s.rule ?? 'cv';
    const K = Math.max(2, Math.min(s.folds ?? 5, Math.floor(n / 3)));
    const G = s.searchPoints ?? 10;
    const list = s.width !== undefined ? [s.width] : mixedWidths(n).map((v) => v * sc.h);
    const plan = foldPlan(series.y, K, s.noise); // once: every width and penalty shares the folds
    const paths: WidthPath[] = [];
    list.forEach((wd, i) => {
      paths.push(context.part(i / list.length, (i + 1) / list.length, () => widthPath(series, sc, probs, wd, G, K, plan, full, context)));
    });
    // every (width, penalty) point, ordered from most to fewest df (then larger penalty): later is simpler
    const all: { p: number; j: number; point: CriterionPoint }[] = [];
    paths.forEach((pa, p) => pa.fits.forEach((f, j) => all.push({ p, j, point: { penalty: toData1(pa.grid[j], sc), score: pa.cv[j], se: pa.se[j], df: mixedDf(f) } })));
    all.sort((u, v) => v.point.df - u.point.df || u.point.penalty - v.point.penalty);
    const pick = all[choosePenalty(all.map((a) => a.point), rule === 'cv-simpler' ? 'simpler' : 'minimum')];
    const chosen = paths[pick.p];
    width = chosen.width;
    lam1 = chosen.grid[pick.j];
    context.step(1, 'exact fit at the chosen penalties');
    fit = solveMixed(probs, sc.ys, lam1, lam1 * chosen.ratio, full, { admm: chosen.fits[pick.j].admm });
    widths = paths.map((pa) => {
      let b = 0;
      for (let j = 1; j < pa.cv.length; j++) if (pa.cv[j] < pa.cv[b]) b = j;
      return { width: pa.width, penalty: toData1(pa.grid[b], sc), df: mixedDf(pa.fits[b]), cv: pa.cv[b], se: pa.se[b] };
    });
    // the chosen width's curve, in increasing penalty
    const curve: CriterionPoint[] = [];
    for (let j = chosen.grid.length - 1; j >= 0; j--) {
      curve.push({ penalty: toData1(chosen.grid[j], sc), score: chosen.cv[j], se: chosen.se[j], df: mixedDf(chosen.fits[j]), knots: chosen.fits[j].kinkRows.length + chosen.fits[j].bendRows.length, converged: chosen.fits[j].status.converged });
    }
    const atEdge = pick.j === 0 || pick.j === chosen.grid.length - 1;
    criterion = { name: 'cv', value: pick.point.score, curve, atEdge };
    if (atEdge) warnings.push(edgeWarning('cross-validation', pick.j === chosen.grid.length - 1 ? 'rough' : 'smooth', toData1(lam1, sc), 'a cubic polynomial'));
    const tried = paths.map((pa) => pa.grid.length);
    const perWidth = Math.min(...tried) === Math.max(...tried) ? `${G}` : `${Math.min(...tried)} to ${Math.max(...tried)}`;
    warnings.push(warning('note', `Both penalties chosen by ${K}-fold cross-validation over ${list.length} widths (${list.map((v) => showNumber(Number(v.toPrecision(3)))).join(', ')} in units of x) x ${perWidth} penalties: width ${showNumber(Number(width.toPrecision(3)))} (features narrower than this are drawn as kinks, wider ones as smooth bends).`));
    stoppingNote = `; penalties from a grid of ${list.length} widths x ${perWidth} penalties by ${rule}`;
  }
  return assemble(series, sc, fit, lam1, width, criterion, warnings, dataDriven, s, widths, stoppingNote, !context.comparing);
}

/** The full-data path at one width and its cross-validation on the shared folds. Unchecked. */
function widthPath(series: Series, sc: TrendScaling, probs: MixedProblems, width: number, G: number, K: number, plan: NoiseDependence, full: MixedSolveSettings, context: RunContext): WidthPath {
  const n = series.n;
  const ratio = ratioOf(width, sc);
  const exactTop = pathTop(sc.xs, sc.ys, sc.ws, ratio);
  const top = exactTop > 0 ? exactTop : 1;
  const lambdas: number[] = [];
  const fits: MixedFit[] = [];
  let start: MixedStart = {};
  let interiorFrom = Infinity;
  // the path goes on below MIXED_PATH_RATIO at the same spacing while its last fit has fewer than
  // MIXED_PATH_DF_SHARE n degrees of freedom (at most G more points)
  for (let j = 0; ; j++) {
    if (j >= G && !(j < 2 * G && mixedDf(fits[j - 1]) < MIXED_PATH_DF_SHARE * n)) break;
    context.step(Math.min(j / G, 1) / (K + 1), 'fitting kinks and bends along the penalty path');
    const lambda = top * Math.pow(MIXED_PATH_RATIO, j / (G - 1));
    lambdas.push(lambda);
    let f = solveMixed(probs, sc.ys, lambda, lambda * ratio, PATH, start);
    // a fit with no knots at all below the top is not the optimum, whatever the ADMM's residual test
    // said: its step sizes can sit at their cap of 1e5 there, where that test is loose (measured on a
    // 156-point series: the four points after the top stopped after one step each with the cubic)
    // (below the top one of the two duals of the cubic's residual is outside its box; when y is itself a
    // cubic, the top is 0 and the cubic is the solution everywhere)
    if (j > 0 && exactTop > 0 && f.kinkRows.length === 0 && f.bendRows.length === 0 && f.status.converged) {
      f = { ...f, status: { ...f.status, converged: false } };
    }
    fits.push(f);
    if (interiorFrom === Infinity && f.interior) interiorFrom = j;
    // where the interior point stalls, the next point's exact block steps warm-start their order-1 solves from this
    // point's kinks (the active-set rounds of order 1 settle fast from nearby knots; measured on the 730-point bench
    // series, 5 to 7% less time for the whole cross-validation, the same choices). Warm-starting the order-3 solves
    // from this point's bends too was slower on 500-point kinked-then-smooth series (0.48 to 0.50 s against 0.75 to
    // 0.82 s): from displaced knots their active-set rounds take longer than a cold solve
    start = { admm: f.admm, kinkFit: f.kinkFit };
  }
  const grid = Float64Array.from(lambdas);
  const foldSettings = (j: number) => (j >= interiorFrom - 1 ? FOLD : FOLD_ADMM);
  let swAll = 0;
  for (let i = 0; i < n; i++) swAll += sc.ws[i];
  const predict = (tr: Int32Array, te: Int32Array, pens: Float64Array): Float64Array[] => {
    const { xt, yt, wt, xh, swt } = foldData(sc.xs, sc.ys, sc.ws, tr, te);
    const sub: MixedProblems = { x: xt, w: wt };
    let st: MixedStart = {};
    return Array.from(pens, (l, j) => {
      const f = solveMixed(sub, yt, l * (swt / swAll), l * ratio * (swt / swAll), foldSettings(j), st);
      st = { admm: f.admm };
      const pa = interpolateTrend(xt, f.kinks, 1, xh).value, pc = interpolateTrend(xt, f.bends, 3, xh).value;
      return Float64Array.from(pa, (v, i) => sc.y0 + sc.c * (v + pc[i]));
    });
  };
  const cv = context.part(1 / (K + 1), 1, () => crossValidate(series.y, series.w, K, grid, predict, context, 'cross-validation of kinks and bends', plan));
  return { width, ratio, grid, fits, cv: cv.score, se: cv.se };
}

/** Halvings of the bracket around the last crossing of the df target in {@link solveMixedForDf}. */
const DF_BISECTIONS = 16;

/**
 * lambda1 (scaled) whose df is closest to the target at a fixed ratio, the smallest such of equal df: a
 * path, then bisection on log(lambda1) of the last crossing above the target. Unchecked.
 */
function solveMixedForDf(probs: MixedProblems, sc: TrendScaling, ratio: number, target: number, G: number, full: MixedSolveSettings, context: RunContext): { fit: MixedFit; lambda: number; curve: CriterionPoint[] } {
  const top = pathTop(sc.xs, sc.ys, sc.ws, ratio) || 1;
  const lo = top * MIXED_PATH_RATIO * 1e-2;
  const seen: { lambda: number; fit: MixedFit }[] = [];
  const at = (l: number, start: MixedStart): MixedFit => { const f = solveMixed(probs, sc.ys, l, l * ratio, PATH, start); seen.push({ lambda: l, fit: f }); return f; };
  // coarse path from the top down until the df passes above the target. The df of a lasso is not
  // monotone in its penalty: the target can be met at several penalties, and fits of equal df can differ
  // much (on a 500-point kinked-then-smooth series at a width of 16 spacings, df 12 at lambda1 = 3.6e3 and,
  // as order-3 trend filtering, at a penalty 6 times smaller, errors 5.2e-2 and 3.6e-3). Of fits with the
  // target df the one at the smallest penalty is kept: the least shrunk, with the smallest residual sum of
  // squares (which never falls as the penalty grows). So the search brackets the last crossing above the
  // target, not the first
  let hiL = top, loL = lo;
  let prev: MixedFit | undefined;
  for (let j = 0; j < G; j++) {
    context.step(j / (G + DF_BISECTIONS), 'looking for the penalty with the target df');
    const l = top * Math.pow(lo / top, j / (G - 1));
    prev = at(l, prev ? { admm: prev.admm } : {});
    if (mixedDf(prev) > target) { loL = l; break; }
    hiL = l;
  }
  // bisection of [loL, hiL] on log(lambda1): df above the target at loL, at most the target at hiL
  let a = Math.log(loL), b = Math.log(hiL);
  let above = prev;
  for (let it = 0; it < DF_BISECTIONS && b - a > 1e-6; it++) {
    context.step((G + it) / (G + DF_BISECTIONS), 'looking for the penalty with the target df');
    const mid = 0.5 * (a + b);
    const f = at(Math.exp(mid), { admm: above?.admm });
    if (mixedDf(f) > target) { a = mid; above = f; } else b = mid;
  }
  // closer to the target; of equal distance the smaller penalty
  const closer = (q: { lambda: number; fit: MixedFit }, p: { lambda: number; fit: MixedFit }): boolean => {
    const dq = Math.abs(mixedDf(q.fit) - target), dp = Math.abs(mixedDf(p.fit) - target);
    return dq < dp || (dq === dp && q.lambda < p.lambda);
  };
  let best = seen[0];
  for (const q of seen) if (closer(q, best)) best = q;
  const curve = seen.slice().sort((p, q) => p.lambda - q.lambda).map((q) => ({ penalty: toData1(q.lambda, sc), score: mixedDf(q.fit), df: mixedDf(q.fit), converged: q.fit.status.converged }));
  // the exact fits can count a few more or fewer knots than the ADMM's path: a short bisection on the exact fits
  // (at most 4 doublings or halvings to bracket the target, then 8 halvings of the bracket), keeping the closest
  const exact = (l: number, st: MixedStart) => { const f = solveMixed(probs, sc.ys, l, l * ratio, full, st); return { lambda: l, fit: f }; };
  let cur = exact(best.lambda, { admm: best.fit.admm });
  let closest = cur;
  const better = (q: typeof cur) => { if (closer(q, closest)) closest = q; };
  if (mixedDf(cur.fit) !== target) {
    const up = mixedDf(cur.fit) > target; // df falls as lambda grows
    let other = cur;
    for (let j = 0; j < 4; j++) {
      context.step(0.9, 'matching the target df on exact fits');
      other = exact(other.lambda * (up ? 2 : 0.5), { admm: other.fit.admm });
      better(other);
      if (up ? mixedDf(other.fit) <= target : mixedDf(other.fit) >= target) break;
    }
    let lo = Math.log(Math.min(cur.lambda, other.lambda)), hi = Math.log(Math.max(cur.lambda, other.lambda));
    for (let it = 0; it < 8 && mixedDf(closest.fit) !== target; it++) {
      const mid = exact(Math.exp(0.5 * (lo + hi)), { admm: closest.fit.admm });
      better(mid);
      if (mixedDf(mid.fit) > target) lo = Math.log(mid.lambda); else hi = Math.log(mid.lambda);
    }
  }
  return { fit: closest.fit, lambda: closest.lambda, curve };
}

function assemble(series: Series, sc: TrendScaling, fit: MixedFit, lam1: number, width: number, criterion: Criterion, warnings: Warning[], dataDriven: boolean, s: MixedSettings,
  widths: MixedModel['widths'], stoppingNote: string, withBends: boolean): FitResult {
  const n = series.n;
  const { x } = series;
  const kinks = Float64Array.from(fit.kinks, (v) => sc.y0 + sc.c * v);
  const bends = Float64Array.from(fit.bends, (v) => sc.c * v);
  const fitted = Float64Array.from(kinks, (v, i) => v + bends[i]);
  // kinks in the data's units: slope change c (D' a')_r / h at point r + 1
  const d2 = kinkChanges(sc.xs, fit.kinks, fit.kinkRows);
  const kx = knotPositions(x, 1, fit.kinkRows);
  const knots: Knot[] = fit.kinkRows.map((r, j) => ({ x: kx[j], index: r + 1, row: series.firstRow[r + 1], change: (sc.c * d2[j]) / sc.h }));
  const df = mixedDf(fit);
  let rss = 0;
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) { resid[i] = series.y[i] - fitted[i]; rss += series.w[i] * resid[i] * resid[i]; }
  const sigma = n > df ? Math.sqrt(rss / (n - df)) : NaN;
  const status: SolverStatus = { ...fit.status, stoppingRule: fit.status.stoppingRule + stoppingNote };
  if (!status.converged) {
    if (!(status.achieved <= 1e-2)) {
      throw new KnotwiseError('numerical', `the mixed trend did not converge on these ${n} points (the kink component still moved by ${showNumber(status.achieved)} sd of y in the last of ${status.iterations} steps, asked ${showNumber(status.tolerance)}), so no reliable fit exists to return. Try a larger penalty, a fixed width, or trend filtering of one order.`);
    }
    warnings.push(warning('not-converged', `The mixed-trend solver stopped after ${status.iterations} steps with the kink component still moving by ${showNumber(status.achieved)} sd of y (asked ${showNumber(status.tolerance)}); fitted values are close to, but not exactly, the optimum. Increase max-iterations.`));
  }
  warnings.push(...fitWarnings(n, df, resid, dataDriven, series.y, criterion.name, s.folds ?? 5, s.noise));
  warnings.push(boundaryWarning());
  const bendPenalty = toData1(lam1, sc) * (width / 4) ** 2;
  const model: MixedModel = { x, kinks, bends, bendPenalty, width, bendKnots: fit.bendRows.length, bendRows: fit.bendRows.slice(), widths };
  return {
    method: 'mixed',
    options: { method: 'mixed', ...(s.penalty !== undefined ? { penalty: s.penalty } : {}), ...(s.df !== undefined ? { df: s.df } : {}), ...(dataDriven ? { select: 'cv' as const, oneSE: s.rule === 'cv-simpler', folds: s.folds ?? 5 } : {}) },
    x, fitted, penalty: toData1(lam1, sc), df, sigma, criterion, knots, bends: withBends ? mixedKnotBends(series, knots, model) : undefined, warnings, solver: status, model,
  };
}

/**
 * The kinks as an analyst reads them ({@link knotBends}): neighbouring kinks merged, each sized on the
 * unpenalised refit of the straight pieces to the series less its smooth bends. Unchecked.
 */
export function mixedKnotBends(series: Series, knots: Knot[], model: MixedModel): ReturnType<typeof knotBends> {
  return knots.length ? knotBends({ ...series, y: Float64Array.from(series.y, (v, i) => v - model.bends[i]) }, 1, knots) : [];
}

/** (D(x, 2) a)_r at the given rows (scaled units). Unchecked. */
function kinkChanges(x: Float64Array, a: Float64Array, rows: number[]): Float64Array {
  return Float64Array.from(rows, (r) => {
    const s1 = (a[r + 1] - a[r]) / (x[r + 1] - x[r]), s2 = (a[r + 2] - a[r + 1]) / (x[r + 2] - x[r + 1]);
    return s2 - s1;
  });
}

/**
 * Evaluates a mixed fit at new x: the order-1 interpolant of the kink component plus the
 * order-3 (falling factorial) interpolant of the smooth bends ({@link interpolateTrend}).
 * Values beyond the data continue the end pieces and are flagged; they are not a forecast.
 *
 * @example
 * ```ts
 * evaluateMixed(fitMixed(series, {}), Float64Array.of(2.5)).value;
 * ```
 */
export function evaluateMixed(result: FitResult, at: Float64Array): Evaluation {
  const m = result.model as MixedModel | undefined;
  if (!m || !ArrayBuffer.isView(m.kinks) || !ArrayBuffer.isView(m.bends)) throw new KnotwiseError('bad-option', 'this result does not come from the mixed trend; evaluate it with its own method.');
  const a = interpolateTrend(m.x, m.kinks, 1, at);
  const c = interpolateTrend(m.x, m.bends, 3, at).value;
  return { x: Float64Array.from(at), value: Float64Array.from(a.value, (v, i) => v + c[i]), extrapolated: a.extrapolated };
}

/**
 * Longest series on which the penalties are chosen from the data (cross-validation or a df target). With the
 * ADMM alone the cross-validated choice took from 1 s to 40 s at 200 to 500 points on a loaded 2-core machine
 * (npm run bench -- --only=mixed), 1.0 to 1.3 s of CPU time at 1,000 points and 4.5 to 5.1 s on the 256-point
 * Blocks and Doppler series; with the interior point, the exact steps where it stalls and the longer paths
 * 0.17 to 0.26 s at 200 points, 0.53 to 1.7 s at 500 and 2.9 to 4.1 s at 1,000 (seeded kinked-then-smooth series,
 * the first run in a process included), so longer series are refused at once; a given penalty has no limit.
 */
export const MIXED_DATA_DRIVEN_LIMIT = 1000;

/** The declared analysis 'mixed'. */
export const mixedAnalysis: AnalysisDefinition = {
  name: 'mixed',
  family: 'smoother',
  label: 'Straight pieces with kinks plus smooth bends (for series kinked in one stretch and smooth in another)',
  summary: 'sum of two L1 trend-filtering components, order 1 (kinks) and order 3 (smooth bends), both penalties by cross-validation (Tibshirani 2014; Kim, Koh, Boyd & Gorinevsky 2009)',
  options: [
    ...PENALTY_OPTIONS({ rules: ['cv', 'cv-simpler'], defaultRule: 'cv', folds: 5, searchPoints: 10 }).map((o) => (o.name === 'penalty'
      ? { ...o, help: 'a fixed penalty on kinks (lambda1, units of y times units of x) instead of a rule; the penalty on bends is lambda1 (width / 4)^2' }
      : o.name === 'searchPoints' ? { ...o, max: 60, help: 'number of penalties tried per width (default 10)' } : o)),
    { name: 'width', kind: 'number', above: 0, help: 'widest feature drawn as a kink rather than a smooth bend, in units of x (default: chosen by cross-validation among 4, 8, 16 and 32 spacings of x, those up to a quarter of the points; 12 spacings with a penalty or df)' },
    SEASON_OPTION,
    { name: 'tolerance', kind: 'number', above: 0, max: 0.001, help: 'largest change of the kinks in a final solver step, relative to the sd of y (default 1e-5)' },
    { name: 'maxIterations', kind: 'integer', min: 1, max: 100000, help: 'limit of the exact block steps that finish the fit (default 1000)' },
  ],
  ties: 'merge',
  minPoints: () => MIXED_MIN_POINTS,
  // beyond its own limit for penalties chosen from the data the automatic choice leaves it out, saying so
  autoVariants: [{ label: 'straight pieces with kinks plus smooth bends (mixed trend)', options: {}, simplicity: 4, maxPoints: MIXED_DATA_DRIVEN_LIMIT, cost: 8 }],
  run(series: Series, o: ResolvedOptions, context: RunContext) {
    if (o.penalty === undefined && series.n > MIXED_DATA_DRIVEN_LIMIT) {
      throw new KnotwiseError('bad-data', `the mixed trend chooses its penalties from the data on at most ${MIXED_DATA_DRIVEN_LIMIT.toLocaleString('en-US')} points; this series has ${series.n.toLocaleString('en-US')}, which would take minutes. Give a penalty (penalty=...) and a width, or use a shorter range of rows.`);
    }
    const smooth = fitMixed(series, {
      penalty: o.penalty as number | undefined,
      df: o.df as number | undefined,
      width: o.width as number | undefined,
      rule: o.rule as MixedSettings['rule'],
      folds: o.folds as number | undefined,
      noise: o.noise as NoiseAssumption | undefined,
      searchPoints: o.searchPoints as number | undefined,
      tolerance: o.tolerance as number | undefined,
      maxIterations: o.maxIterations as number | undefined,
    }, context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => evaluateMixed(result.smooth!, x),
};
