/**
 * The trend-filtering solution path over a log-spaced penalty grid, with
 * cross-validation, SURE (Mallows Cp) and BIC scores at every penalty: what the
 * method uses to choose lambda and what a worksheet returns as the criterion table.
 */
import type { Series } from '../../series';
import type { SolverStatus, NoiseAssumption } from '../../types';
import { trendScaling, toDataPenalty, toDataValues, TrendScaling } from './trendScaling';
import { solveTrend, polynomialOf, seedOf, KnotSeed, TrendFit, TrendProblem } from './solveTrend';
import { interpolateTrend } from './interpolateTrend';
import { regressionSplineRefit, evaluateRegressionSpline } from './regressionSplineRefit';
import { differenceSigma } from '../../robustSigma';
import { crossValidate } from '../../select/crossValidate';
import type { RunContext } from '../../analysis/runContext';
import { foldData } from '../../select/foldData';
import { foldPlan } from '../../select/noiseDependence';

/** Settings of {@link trendPath} (already validated). */
export interface TrendPathSettings {
  /** Order k, 0..3. */
  order: number;
  /** Number of penalties on the grid (>= 2). */
  gridSize: number;
  /** Cross-validation folds; 0 = no cross-validation. */
  folds: number;
  /** Relaxation in [0, 1]. */
  relaxed: number;
  tolerance: number;
  maxIterations: number;
  /** Smallest grid penalty as a fraction of lambda_max (default {@link defaultGridRatio}). */
  ratio?: number;
  /** Progress and cancellation, checked at every penalty of the path and of each fold. */
  context?: RunContext;
  /** What cross-validation assumes of the noise (default 'correlated': {@link foldPlan}). */
  noise?: NoiseAssumption;
  /** False: fold fits never switch to the interior point ({@link PROBE_WORK}); default true. */
  foldInteriorPoint?: boolean;
  /** Relative duality gap of the fold fits (at least `tolerance`); default {@link CV_TOLERANCE}. */
  foldTolerance?: number;
  /**
   * With cross-validation: solve and score every other grid penalty first (both ends included), then
   * only the skipped ones on either side of the lowest score, each warm-started from its larger
   * neighbour's fits (full data and every fold). On a score curve with one minimum this finds the
   * same lowest grid score as the whole grid, but a curve that dips at a skipped penalty between two
   * higher ones is missed there; the path then holds the penalties solved (about half). The automatic
   * choice's trend-filtering candidates use it on long series (they report only their chosen penalty).
   * Measured at 5,000 points (15 penalties, 5 folds; the automatic choice's bench shapes; warm, in one
   * process): 8 to 20% less time for order 2, 7 to 11% for order 3, the same minimum. Default false.
   */
  fillNearBest?: boolean;
}

/** One penalty of the path, in the data's units. */
export interface TrendPathPoint {
  /** lambda in the data's units (see {@link fitTrend}). */
  penalty: number;
  /** Degrees of freedom: knots + k + 1. */
  df: number;
  knots: number;
  /** Weighted residual sum of squares sum w (y - fit)^2 of the full-data fit. */
  rss: number;
  /** Mean over folds of the held-out weighted mean squared error (units of y squared); NaN without cross-validation. */
  cv: number;
  /** Standard error of `cv`: sd of the fold errors / sqrt(K). */
  cvSe: number;
  /** SURE / Mallows Cp: (rss + 2 sigma^2 df) / n. */
  sure: number;
  /** n log(rss / n) + df log n. */
  bic: number;
  status: SolverStatus;
  /** Knots and signs of the full-data fit: rebuilds it exactly ({@link solveTrend}'s seed) without solving again. */
  seed: KnotSeed;
}

/** Result of {@link trendPath}. */
export interface TrendPath {
  /** Points in increasing penalty. */
  points: TrendPathPoint[];
  /** lambda_max in the data's units: at and above it the fit is the weighted polynomial of degree k. */
  lambdaMax: number;
  /** Robust noise sd used by SURE ({@link differenceSigma} of first differences, weighted). */
  sigmaNoise: number;
  /** Internal: scaled grid, decreasing, the scaling, and the full-data problem with what its solves cached (operator, polynomial fit). */
  scaledGrid: Float64Array;
  scaling: TrendScaling;
  problem: TrendProblem;
  /** Index into `scaledGrid` from which fold fits started with the interior point ({@link PROBE_WORK}); absent when they never did. */
  foldInteriorFrom?: number;
}

/**
 * Smallest grid penalty relative to lambda_max: 1e-5 for k = 0, 1; 1e-7 for
 * k = 2; 1e-9 for k = 3. lambda_max grows like n^(k+1) while the penalties
 * that matter shrink accordingly, so higher orders need a wider range to reach
 * fits with many knots.
 */
export function defaultGridRatio(k: number): number {
  return Math.pow(10, -(5 + 2 * Math.max(0, k - 1)));
}

/**
 * Cross-validation fits stop at a relative duality gap of at least this: they only feed
 * predictions of held-out points. The objective is strongly convex in b, so a fit whose gap
 * is g P (P of order n sigma^2 / 2) lies within ||b - b*||_W <= sqrt(2 g P) of the optimum:
 * its fitted values move by at most about sqrt(g) sigma = 0.03 sigma in RMS, which moves a
 * held-out mean squared error by about 0.1% of sigma^2 through the square of that change, plus a
 * cross term with the prediction error that averages out over the held-out points. Measured
 * against fold fits at 1e-5 (same folds and grid, 5 folds; seeded series of the benchmarks): every
 * score within 5 standard errors of its curve's minimum moved by at most 0.044 of its standard
 * error, every minimum stayed at the same df, and the largest moves (up to 0.15 there, 0.24 on the
 * tests' 2,000-point series) were at the polynomial end of the path, dozens of standard errors
 * above the minimum, on the two 5,000-point shapes of the automatic choice's bench (orders 2 and
 * 3, 15 penalties) and the trend-cv bench series at 1e4 points (orders 1 to 3, 30 penalties); the
 * cross-validation took 0.65 to 0.87 of the time (warm runs in one process). 1e-5 was used until
 * this release; the full-data path is still solved to the method's tolerance (1e-8). Measured again
 * against 1e-5 on 24 curves (orders 1 to 3; the bench series at 2,000 and 1e4 points, two seeds each,
 * and the two 5,000-point shapes with white and AR(1) noise; 5 x 30): every score within 5 standard
 * errors of its minimum moved by at most 0.029 of its standard error; two order-2 minima moved to
 * the next grid penalty, whose score under 1e-5 was within 0.01 of a standard error of the minimum
 * (a tie). Looser targets were measured on the same curves and not taken: 3e-3 moved scores near the
 * minimum by up to 0.081 standard errors and 6 minima, 1e-2 by up to 0.22 and 10 minima (the folds
 * then took 0.8 and 0.65 of the time at 1e4, order 3).
 */
export const CV_TOLERANCE = 1e-3;

/**
 * Fold fits of orders 2 and 3 switch to the dual interior point (cold start, no refinement) from the
 * grid penalty at which it first converged in the first fold. Measured (folds x penalties of 5-fold
 * cross-validation on seeded series: kinked, shifted, Doppler and AR(1) noise; n = 500 to 1e4; orders
 * 2 and 3): at a relative gap of {@link CV_TOLERANCE} the interior point stalls at the largest
 * penalties (few knots: its Newton systems are ill-conditioned) and converges in 8 to 15 iterations
 * at every penalty below some point of the grid, in every fold alike, where the warm-started
 * active-set method of {@link solveTrend} needs 30 to 50 restricted solves of about the same cost
 * (it reshuffles many knots per round from the full-data fit's knots). The first fold finds that
 * point by probing: at a penalty whose previous fold fit took at least {@link PROBE_WORK} restricted
 * solves, when the last probe failed at least {@link PROBE_SPACING} penalties before or came within
 * {@link PROBE_NEAR} times the tolerance. A fold fit whose interior point still stalls falls back to
 * the active-set method, so the switch changes the cost, never the answer's tolerance. Measured
 * against the active-set method alone (bench `trend-cv-fold-switch`, 5 x 30 or 5 x 15, medians of 3
 * in one process, two runs): 0.32 to 0.59 of the time on 1,000 to 2,000 points, 0.71 to 0.99 at 5,000,
 * 0.85 to 1.03 at 1e4 (order 2 gains nothing there: the interior point converges only at the last
 * penalties); the scores moved by at most 0.005 of their standard error and every minimum stayed at
 * the same df. Order 1 is left out: its restricted solves are written out for hat functions and
 * cheap, and with the switch its cross-validation took 3.8 times as long.
 */
export const PROBE_WORK = 10;

/**
 * Order 2's fold fits switch to the interior point ({@link PROBE_WORK}) only on series shorter than
 * this. Once the restricted solves of the active-set method got cheaper (one pass for the dual, the
 * normal equations by stretches, no refinement steps in fold fits), measured in one process, warm,
 * medians of 3 to 5, switch against no switch: 0.55 and 0.78 of the time at 2,000 points (the
 * bench's AR(1) series and the `trend-cv` series), 1.05 at 3,000, 1.02 and 1.17 at 5,000, 1.17 and
 * 1.23 at 1e4. Order 3 gains from the switch at every length measured (0.39 to 0.81).
 */
export const ORDER2_SWITCH_BELOW = 3000;

/**
 * Orders whose fold fits start the monotone refinement of {@link solveTrend} straight from the
 * full-data guess (`refineGuessDirectly`), without the primal-dual active-set rounds, when the fold
 * fits switch to the interior point at the penalties with many knots ({@link PROBE_WORK}). Order 3's
 * rounds from a fold's guess at the penalties with few knots rarely settle: the primal-dual update
 * moves every knot whose sign broke to the peak of a broad violation of the dual, so the knots wander
 * by hundreds of rows and the refinement then starts from a worse set than the guess. Measured on
 * the `trend-cv` series (5 x 30; warm, medians of 3 in one process, alternating runs): the fold fits
 * took 0.62 to 0.67 s instead of 0.79 to 0.94 s at 1e4 and 0.35 to 0.36 s instead of 0.40 to 0.42 s
 * at 5,000, with the same minima (six seeded curves at 2,000 to 1e4 points: scores within 5 standard
 * errors of their minimum moved by at most 0.046 of their standard error). Without the switch
 * (relaxed fits, or `foldInteriorPoint` false) the rounds stay: with the penalties with many knots
 * left to the active-set methods, starting from the guess took 1.3 to 1.5 times as long (order 3,
 * relaxed 0.5, 2,000 and 5,000 points). Orders 1 and 2 keep the rounds: without them their fold fits
 * took 1.5 to 1.7 times as long at 1e4 (their rounds settle from the guess).
 */
export const FOLD_GUESS_REFINED_DIRECTLY = [false, false, false, true];

/** Penalties between two probes of the interior point in the first fold (see {@link PROBE_WORK}). */
export const PROBE_SPACING = 3;

/** A failed probe this close to the tolerance (as a factor) is tried again at the next penalty. */
export const PROBE_NEAR = 100;

/** Mixes a fit with its relaxed refit on the fit's knots (in place on b). Unchecked. */
export function relaxFit(x: Float64Array, y: Float64Array, w: Float64Array, k: number, fit: TrendFit, relaxed: number): { b: Float64Array; refit?: ReturnType<typeof regressionSplineRefit> } {
  if (!(relaxed > 0)) return { b: fit.b };
  const kx = knotPositions(x, k, fit.knotRows);
  const refit = regressionSplineRefit(x, y, w, k, kx);
  const b = new Float64Array(x.length);
  for (let i = 0; i < b.length; i++) b[i] = relaxed * refit.fitted[i] + (1 - relaxed) * fit.b[i];
  return { b, refit };
}

/**
 * The training position of each point of a fold: below[i] = the number of training points (sorted
 * rows `tr`) with index <= i, minus 1 ({@link foldGuess}'s input). One pass over the n points, in a
 * function of its own so that the first call's compiler works on a small body. Unchecked.
 */
export function trainingPositions(tr: Int32Array, n: number): Int32Array {
  const below = new Int32Array(n);
  for (let i = 0, t = -1, a = 0; i < n; i++) { if (a < tr.length && tr[a] === i) { t++; a++; } below[i] = t; }
  return below;
}

/**
 * The full-data fit's knots mapped to a fold's training points (knot row r sits at point r + k;
 * its training row is the last training point at or before it, minus k), duplicates dropped:
 * the start of the fold's active-set method at the same penalty. Unchecked.
 */
export function foldGuess(seed: KnotSeed, below: Int32Array, k: number, nt: number): KnotSeed {
  const rows: number[] = [], signs: number[] = [];
  const off = k === 0 ? 1 : k;
  const mt = nt - k - 1;
  for (let j = 0; j < seed.rows.length; j++) {
    const r = below[seed.rows[j] + off] - off;
    if (r < 0 || r >= mt || (rows.length && rows[rows.length - 1] >= r)) continue;
    rows.push(r);
    signs.push(seed.signs[j]);
  }
  return { rows, signs };
}

/** x position of each knot row: point r + k for k >= 1, point r + 1 (first point of the new level) for k = 0. Unchecked. */
export function knotPositions(x: Float64Array, k: number, rows: ArrayLike<number>): Float64Array {
  const out = new Float64Array(rows.length);
  const off = k === 0 ? 1 : k;
  for (let i = 0; i < rows.length; i++) out[i] = x[rows[i] + off];
  return out;
}

/**
 * Computes the path. Grid: `gridSize` penalties log-spaced from lambda_max down
 * to ratio * lambda_max ({@link defaultGridRatio}), solved from the largest down with warm
 * starts. Cross-validation (R. J. Tibshirani, Ann. Statist. 42 (2014),
 * section 6): interior point i is held out in fold (i - 1) mod K, the ends never
 * ({@link foldOf}); each training fit uses lambda * (training weight / total
 * weight), so the balance of fit and penalty per point matches the full fit;
 * training fits stop at relative gap max(tolerance, foldTolerance) ({@link CV_TOLERANCE} by default)
 * without refinement (they start from the
 * full-data fit's knots at the same penalty, mapped to the training points; for orders 2 and 3,
 * from the penalty where the first fold found it converging, with the dual interior point instead:
 * {@link PROBE_WORK});
 * held-out points are predicted by the fit's interpolant ({@link interpolateTrend},
 * mixed with the relaxed refit when relaxed > 0). With `fillNearBest`, only every other grid
 * penalty and then the skipped ones beside the lowest score are solved and scored.
 *
 * @param series - clean series (n >= order + 2)
 * @param s - settings
 * Unchecked: the caller validates the settings.
 */
export function trendPath(series: Series, s: TrendPathSettings): TrendPath {
  const k = s.order;
  const sc = trendScaling(series, k);
  const n = series.n;
  const prob: TrendProblem = { x: sc.xs, y: sc.ys, w: sc.ws, k };
  let lmax = polynomialOf(prob).lambdaMax;
  if (!(lmax > 0)) lmax = 1;
  const G = s.gridSize;
  const ratio = s.ratio ?? defaultGridRatio(k);
  const grid = new Float64Array(G);
  for (let j = 0; j < G; j++) grid[j] = lmax * Math.pow(ratio, j / (G - 1));
  const sigmaNoise = differenceSigma(series.y, 1, series.w);
  const cross = s.folds >= 2;
  // grid indices solved: all, or every other one first (both ends) when filling near the best score
  const twoStage = cross && !!s.fillNearBest && G >= 5;
  const first: number[] = [];
  for (let j = 0; j < G; j++) if (!twoStage || j % 2 === 0 || j === G - 1) first.push(j);
  const stages = 1 + (cross ? s.folds : 0);
  const byIndex: (TrendPathPoint | undefined)[] = new Array(G);
  const fits: (TrendFit | undefined)[] = new Array(G);
  // one full-data fit at grid index j, warm-started from the solved fit at the nearest larger penalty
  const solvePoint = (j: number, frac: number): void => {
    s.context?.step(frac, 'solving along the penalty path');
    let warm: TrendFit | undefined;
    for (let i = j - 1; i >= 0 && !warm; i--) warm = fits[i];
    const fit = solveTrend(prob, grid[j], { tolerance: s.tolerance, maxIterations: s.maxIterations, warm });
    // only the two-stage search starts from fits other than the last one
    if (!twoStage) fits.fill(undefined);
    fits[j] = fit;
    const { b } = relaxFit(sc.xs, sc.ys, sc.ws, k, fit, s.relaxed);
    const rss = scaledRss(series.w, sc.c, sc.ys, b, n);
    const df = fit.knotRows.length + k + 1;
    byIndex[j] = {
      penalty: toDataPenalty(grid[j], sc), df, knots: fit.knotRows.length, rss, cv: NaN, cvSe: NaN,
      sure: (rss + 2 * sigmaNoise * sigmaNoise * df) / n,
      // BIC with the noise variance known (estimated robustly, as for SURE): RSS / sigma^2 + df log n. The form
      // n log(RSS / n) + df log n has no floor as the fit approaches interpolation (RSS -> 0) and chose it on short series.
      bic: rss / (sigmaNoise > 0 ? sigmaNoise * sigmaNoise : Number.MIN_VALUE) + df * Math.log(n),
      status: fit.status,
      seed: seedOf(fit),
    };
  };
  for (let a = 0; a < first.length; a++) solvePoint(first[a], a / first.length / stages);
  // grid index from which fold fits start with the interior point (found in the first fold: PROBE_WORK)
  let foldFrom = Infinity;
  if (cross) {
    const K = s.folds;
    let swAll = 0;
    for (let i = 0; i < n; i++) swAll += sc.ws[i];
    let foldCalls = 0;
    // whether the fold fits may switch to the interior point ({@link PROBE_WORK})
    const switchable = (k === 3 || (k === 2 && n < ORDER2_SWITCH_BELOW)) && !(s.relaxed > 0) && s.foldInteriorPoint !== false;
    const refineGuessDirectly = switchable && FOLD_GUESS_REFINED_DIRECTLY[k];
    // grid indices of the penalties being scored, and each fold's fits by grid index (keyed by its first held-out point)
    let scoring: number[] = first;
    const foldFits = new Map<number, (TrendFit | undefined)[]>();
    // one fold: the warm-started path on its training points, predicted at the held-out x
    const predict = (tr: Int32Array, te: Int32Array, pens: Float64Array): Float64Array[] => {
      const probing = foldCalls++ === 0 && switchable;
      let lastFail = -Infinity, failGap = Infinity;
      const { xt, yt, wt, xh, swt } = foldData(sc.xs, sc.ys, sc.ws, tr, te);
      const sub: TrendProblem = { x: xt, y: yt, w: wt, k };
      let kept = foldFits.get(te[0]);
      if (!kept) foldFits.set(te[0], kept = new Array(G));
      const out: Float64Array[] = [];
      const below = trainingPositions(tr, n);
      for (let q = 0; q < pens.length; q++) {
        const j = scoring[q];
        let wf: TrendFit | undefined;
        for (let i = j - 1; i >= 0 && !wf; i--) wf = kept[i];
        const work = wf ? wf.status.iterations : 0;
        // the full-data fit at this penalty (the folds are scored on the path's own grid)
        const guess = foldGuess(byIndex[j]!.seed, below, k, tr.length);
        const tol = Math.max(s.tolerance, s.foldTolerance ?? CV_TOLERANCE);
        const interiorFirst = j >= foldFrom || (probing && work >= PROBE_WORK && (j - lastFail >= PROBE_SPACING || failGap <= PROBE_NEAR * tol));
        const fit = solveTrend(sub, pens[q] * (swt / swAll), { tolerance: tol, maxIterations: s.maxIterations, warm: wf, refine: false, guess, interiorFirst, refineGuessDirectly });
        if (fit.interior) {
          if (fit.interior.converged) { if (probing) foldFrom = Math.min(foldFrom, j); }
          else { lastFail = j; failGap = fit.interior.achieved; }
        }
        if (!twoStage) kept.fill(undefined);
        kept[j] = fit;
        const pred = interpolateTrend(xt, fit.b, k, xh).value;
        if (s.relaxed > 0) {
          const { refit } = relaxFit(xt, yt, wt, k, fit, s.relaxed);
          const pr = evaluateRegressionSpline(refit!.spline, xh);
          for (let i = 0; i < pred.length; i++) pred[i] = s.relaxed * pr[i] + (1 - s.relaxed) * pred[i];
        }
        // back to the units of y, as every method's cross-validation reports
        toDataValues(pred, sc);
        out.push(pred);
      }
      return out;
    };
    const plan = foldPlan(series.y, K, s.noise);
    const score = (idx: number[], from: number, to: number): void => {
      scoring = idx;
      const pens = Float64Array.from(idx, (j) => grid[j]);
      const run = () => crossValidate(series.y, series.w, K, pens, predict, s.context, undefined, plan);
      const cv = s.context ? s.context.part(from, to, run) : run();
      for (let q = 0; q < idx.length; q++) { byIndex[idx[q]]!.cv = cv.score[q]; byIndex[idx[q]]!.cvSe = cv.se[q]; }
    };
    score(first, 1 / stages, twoStage ? 0.9 : 1);
    if (twoStage) {
      let best = first[0];
      for (const j of first) if (byIndex[j]!.cv < byIndex[best]!.cv) best = j;
      const fill = [best - 1, best + 1].filter((j) => j > 0 && j < G && !byIndex[j]);
      for (let a = 0; a < fill.length; a++) solvePoint(fill[a], 0.9 + 0.02 * a);
      if (fill.length) score(fill, 0.94, 1);
    }
  }
  const solved: number[] = [];
  for (let j = 0; j < G; j++) if (byIndex[j]) solved.push(j);
  const pts = solved.map((j) => byIndex[j]!);
  pts.reverse();
  const from = solved.indexOf(foldFrom);
  return { points: pts, lambdaMax: toDataPenalty(lmax, sc), sigmaNoise, scaledGrid: Float64Array.from(solved, (j) => grid[j]), scaling: sc, problem: prob, ...(from >= 0 ? { foldInteriorFrom: from } : {}) };
}

/**
 * sum w_i (c (ys_i - b_i))^2 over the first n points: the residual sum of squares on the data's scale
 * (ys and b on the solver's scale, 1 / c of the data's). A function of its own so that the path's
 * loop over its points has no long loop in it (DEVELOPERS.md, "Long loops and the first call"). Unchecked.
 */
function scaledRss(w: Float64Array, c: number, ys: Float64Array, b: Float64Array, n: number): number {
  let rss = 0;
  for (let i = 0; i < n; i++) rss += w[i] * (c * (ys[i] - b[i])) ** 2;
  return rss;
}
