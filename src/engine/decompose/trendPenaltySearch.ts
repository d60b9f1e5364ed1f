/**
 * The trend penalty search of the adaptive decomposition: K-fold cross-validation of trend filtering
 * (R. J. Tibshirani, "Adaptive piecewise polynomial estimation via trend filtering", Ann. Statist. 42
 * (2014) 285-323, section 6) on the deseasonalised series, scored penalty by penalty down a log-spaced
 * grid from lambda_max, and stopped once the score has risen at {@link SEARCH_RISES} successive grid
 * penalties past its smallest value so far.
 *
 * The scores are those of the trend's own path (trendPath.ts) at the same penalties: the same folds
 * ({@link crossValidate}, block folds when the noise looks correlated), the same fold penalties
 * (lambda scaled by the fold's share of the weight), warm starts along each fold's path and the
 * full-data fit's knots as each fold's first guess, the same solver tolerance. Only the order differs:
 * the path solves every penalty of each fold in turn, this search every fold of each penalty, so that
 * it can stop. Grid penalties below the stop are not solved; the smallest penalties (many knots) cost
 * most, so on curves with their minimum well inside the grid this saves much of the search. A curve
 * that falls again after two rises would be missed: the trend's criterion curves on the invented
 * daily, weekly and monthly series of the tests and benchmark fall to one minimum and rise after it.
 * Works in the trend's scaled units. Unchecked.
 */
import type { Series } from '../series';
import type { CriterionPoint, NoiseAssumption } from '../types';
import { trendScaling, toDataPenalty, toDataValues, TrendScaling } from '../smoothers/trend/trendScaling';
import { solveTrend, polynomialOf, seedOf, KnotSeed, TrendFit, TrendProblem } from '../smoothers/trend/solveTrend';
import { interpolateTrend } from '../smoothers/trend/interpolateTrend';
import { CV_TOLERANCE, foldGuess, trainingPositions } from '../smoothers/trend/trendPath';
import { crossValidate } from '../select/crossValidate';
import { foldPlan } from '../select/noiseDependence';
import { choosePenalty } from '../select/choosePenalty';
import type { RunContext } from '../analysis/runContext';

/** Successive rises of the cross-validation score past its minimum after which the search stops. */
export const SEARCH_RISES = 2;

/** Settings of {@link trendPenaltySearch}. */
export interface TrendPenaltySearchSettings {
  order: number;
  /** Grid penalties from lambda_max down to `ratio` lambda_max. */
  gridSize: number;
  ratio: number;
  folds: number;
  /** One-standard-error rule (the largest penalty within one standard error of the minimum). */
  oneSE: boolean;
  /** Relative duality gap of the full-data solves (the folds use at least the trend path's CV_TOLERANCE). */
  tolerance: number;
  maxIterations: number;
  /** What cross-validation assumes of the noise (default 'correlated': {@link foldPlan}). */
  noise?: NoiseAssumption;
  /** Whether to stop early (false: every grid penalty, as the trend's path). */
  stopEarly?: boolean;
  context?: RunContext;
}

/** Result of {@link trendPenaltySearch}. */
export interface TrendPenaltySearch {
  /** Chosen lambda in the data's units. */
  penalty: number;
  /** The full-data fit at the chosen penalty, in the data's units. */
  fitted: Float64Array;
  /** Its knots as difference-operator rows of the searched series, and their signs. */
  knots: KnotSeed;
  /** The scored penalties, in increasing penalty (as a criterion curve). */
  curve: CriterionPoint[];
  /** Index of the chosen point in `curve`. */
  chosen: number;
  /** Grid penalties scored, and in the grid. */
  scored: number;
  gridSize: number;
  scaling: TrendScaling;
}

/** One fold's training problem and where its path has got to. */
interface FoldState {
  prob: TrendProblem;
  xh: Float64Array;
  below: Int32Array;
  share: number;
  last?: TrendFit;
}

/**
 * Cross-validated trend penalty of a clean series (see the module note): lambda in the data's units
 * (as fitTrend's), the fit there, and the scored curve. Unchecked: n large enough for `folds`-fold
 * cross-validation at this order.
 *
 * @example
 * ```ts
 * const r = trendPenaltySearch(series, { order: 1, gridSize: 16, ratio: 1e-5, folds: 5, oneSE: false, tolerance: 1e-8, maxIterations: 200 });
 * r.penalty; r.curve[r.chosen].score; r.scored;   // scored <= gridSize
 * ```
 */
export function trendPenaltySearch(series: Series, s: TrendPenaltySearchSettings): TrendPenaltySearch {
  const k = s.order;
  const n = series.n;
  const sc = trendScaling(series, k);
  const prob: TrendProblem = { x: sc.xs, y: sc.ys, w: sc.ws, k };
  let lmax = polynomialOf(prob).lambdaMax;
  if (!(lmax > 0)) lmax = 1;
  const G = s.gridSize;
  const grid = new Float64Array(G);
  for (let j = 0; j < G; j++) grid[j] = lmax * Math.pow(s.ratio, j / (G - 1));
  const K = s.folds;
  let swAll = 0;
  for (let i = 0; i < n; i++) swAll += sc.ws[i];
  const plan = foldPlan(series.y, K, s.noise);
  const folds = new Map<number, FoldState>();
  const foldOf = (tr: Int32Array, te: Int32Array): FoldState => {
    let f = folds.get(te[0]);
    if (f) return f;
    const below = trainingPositions(tr, n);
    let swt = 0;
    for (const i of tr) swt += sc.ws[i];
    f = {
      prob: { x: Float64Array.from(tr, (i) => sc.xs[i]), y: Float64Array.from(tr, (i) => sc.ys[i]), w: Float64Array.from(tr, (i) => sc.ws[i]), k },
      xh: Float64Array.from(te, (i) => sc.xs[i]), below, share: swt / swAll,
    };
    folds.set(te[0], f);
    return f;
  };
  const fits: TrendFit[] = [];
  const score: number[] = [], se: number[] = [];
  let warm: TrendFit | undefined;
  let best = 0, rises = 0;
  for (let j = 0; j < G; j++) {
    s.context?.step(j / G, 'choosing the trend penalty');
    const fit = solveTrend(prob, grid[j], { tolerance: s.tolerance, maxIterations: s.maxIterations, warm });
    warm = fit;
    fits.push(fit);
    const seed = seedOf(fit);
    const cv = crossValidate(series.y, series.w, K, Float64Array.of(grid[j]), (tr, te) => {
      const f = foldOf(tr, te);
      const ff = solveTrend(f.prob, grid[j] * f.share, { tolerance: Math.max(s.tolerance, CV_TOLERANCE), maxIterations: s.maxIterations, warm: f.last, refine: false, guess: foldGuess(seed, f.below, k, f.prob.x.length) });
      f.last = ff;
      const pred = interpolateTrend(f.prob.x, ff.b, k, f.xh).value;
      toDataValues(pred, sc);
      return [pred];
    }, undefined, undefined, plan);
    score.push(cv.score[0]);
    se.push(cv.se[0]);
    if (score[j] < score[best]) { best = j; rises = 0; } else if (j > best && score[j] > score[j - 1]) rises++;
    else rises = 0;
    if (s.stopEarly !== false && rises >= SEARCH_RISES) break;
  }
  const m = fits.length;
  // the curve in increasing penalty
  const curve: CriterionPoint[] = [];
  for (let j = m - 1; j >= 0; j--) {
    curve.push({ penalty: toDataPenalty(grid[j], sc), score: score[j], se: se[j], df: fits[j].knotRows.length + k + 1, knots: fits[j].knotRows.length, converged: fits[j].status.converged });
  }
  const chosen = choosePenalty(curve, s.oneSE ? 'simpler' : 'minimum');
  const fit = fits[m - 1 - chosen];
  return {
    penalty: curve[chosen].penalty, fitted: Float64Array.from(fit.b, (v) => sc.y0 + sc.c * v), knots: seedOf(fit), curve, chosen, scored: m, gridSize: G, scaling: sc,
  };
}
