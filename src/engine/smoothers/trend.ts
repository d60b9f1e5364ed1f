/**
 * L1 trend filtering: locally adaptive piecewise polynomial trends with
 * knots chosen by the data.
 *
 *   minimise over b:  1/2 sum_i w_i (y_i - b_i)^2 + lambda ||D(x, k+1) b||_1
 *
 * with D(x, k+1) the divided-difference operator of order k + 1 for unequally
 * spaced x ({@link differenceOperator}); (D b)_r is the jump in the k-th
 * derivative of the fit's interpolant at its r-th candidate knot, so the
 * penalty is lambda times the total variation of the k-th derivative.
 * k = 0: total-variation denoising (piecewise constant); k = 1: piecewise
 * linear; k = 2, 3: piecewise quadratic / cubic.
 * References: R. J. Tibshirani, "Adaptive piecewise polynomial estimation via
 * trend filtering", Ann. Statist. 42 (2014) 285-323; S.-J. Kim, K. Koh, S. Boyd
 * and D. Gorinevsky, "l1 trend filtering", SIAM Review 51 (2009) 339-360;
 * R. J. Tibshirani and J. Taylor, "Degrees of freedom in lasso problems",
 * Ann. Statist. 40 (2012) (df = knots + k + 1).
 *
 * Units of lambda: the problem as stated with x, y and w in their own units,
 * so lambda is in (units of y) x (units of x)^k x (units of weight). Internally
 * x is mapped to unit mean spacing, y to mean 0 and sd 1, w to mean 1, and the
 * penalty converted back ({@link toDataPenalty}): lambda = lambda' m c h^k.
 *
 * Solvers: k = 0 exact dynamic programming ({@link totalVariationDenoise});
 * k >= 1 dual interior point ({@link trendDualInteriorPoint}) plus exact
 * active-set refinement ({@link polishTrend}); for k = 1 where the interior
 * point stalls (long series), the ADMM of A. Ramdas and R. J. Tibshirani
 * (J. Comput. Graph. Statist. 25, 2016; {@link trendAdmm}), started from the
 * interior point's iterate, finds the knots for the refinement; status and
 * stopping rule returned.
 * `tolerance` (default 1e-8) is the relative duality gap; ||b - b*||_W <= sqrt(2 gap).
 *
 * Long series: the dual interior point loses accuracy on long stretches
 * without knots (its Newton matrix has condition number of order L^(2k+2)), so
 * it mainly proposes knots; the refinement's restricted solves run in a banded
 * discrete B-spline basis (trend/restrictedSplineFit.ts), well conditioned at any n,
 * and make the answer exact, or the active-set method started from the
 * polynomial fit (no knots) does when the interior point's knots are too far off. A fit still short of the tolerance
 * reports the gap reached and carries a 'not-converged' warning; one far from it
 * (gap above 1e-3) is refused with an error.
 * A trend describes the past; its end values are revised as data arrive and
 * it is not a forecast (every result carries the 'boundary' note).
 */
import { QUIET, RunContext } from './../analysis/runContext';
import type { AnalysisDefinition } from '../analysis/analysisDefinition';
import type { ResolvedOptions } from '../analysis/optionDeclaration';
import { PENALTY_OPTIONS, SEASON_OPTION, fitOptionsOf } from '../analysis/penaltyOptions';
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { type Criterion, type CriterionPoint, type Evaluation, type FitOptions, type FitResult, type Knot, type SolverStatus, NOISE_ASSUMPTIONS, type NoiseAssumption } from '../types';
import { Warning, warning } from '../warnings';
import { checkChoice, checkInteger, checkPenalty, checkPositive } from '../options';
import { boundaryWarning, fitWarnings } from '../diagnostics/commonWarnings';
import { choosePenalty, edgeWarning } from '../select/choosePenalty';
import { knotBends } from '../diagnostics/knotBends';
import { differenceOperator } from '../linalg/difference';
import { trendScaling, toScaledPenalty, toDataPenalty, TrendScaling } from './trend/trendScaling';
import { solveTrend, trendFit, TrendFit, TrendProblem } from './trend/solveTrend';
import { trendPath, TrendPath, relaxFit, knotPositions } from './trend/trendPath';
import { interpolateTrend } from './trend/interpolateTrend';
import { evaluateRegressionSpline, RegressionSpline } from './trend/regressionSplineRefit';
import { trendLambdaMax } from './trend/trendLambdaMax';
import { maxAbs } from '../linalg/maxAbs';

/** State kept for evaluation at new x (the data's units). */
export interface TrendModel {
  /** Clean x. */
  x: Float64Array;
  /** The L1 (unrelaxed) fit at x. */
  l1: Float64Array;
  /** Order k. */
  order: number;
  /** Relaxation in [0, 1]. */
  relaxed: number;
  /** The relaxed refit, when relaxed > 0. */
  refit?: RegressionSpline;
}

/** Options of trend filtering as resolved (defaults filled in). */
export interface TrendSettings {
  order: number;
  relaxed: number;
  gridSize: number;
  folds: number;
  tolerance: number;
  maxIterations: number;
  oneSE: boolean;
  select: 'cv' | 'sure' | 'bic';
  /** What cross-validation assumes of the noise. */
  noise: NoiseAssumption;
}

/** Default polynomial order (piecewise linear trends). */
export const TREND_DEFAULT_ORDER = 1;

/**
 * Validates trend-filtering options and fills in defaults: order 1, relaxed 0,
 * gridSize 30, folds 5, tolerance 1e-8 (relative duality gap), maxIterations 200,
 * select 'cv', oneSE false.
 * @throws {@link KnotwiseError} `bad-option` naming the offending value
 */
export function trendSettings(options: FitOptions): TrendSettings {
  const order = options.order === undefined ? TREND_DEFAULT_ORDER : checkInteger(options.order, 'order', 0, 3);
  let relaxed = 0;
  if (options.relaxed !== undefined) {
    const r = options.relaxed;
    if (typeof r !== 'number' || !(r >= 0 && r <= 1)) throw new KnotwiseError('bad-option', `relaxed must be a number from 0 to 1; got ${typeof r === 'number' ? showNumber(r) : String(r)}.`);
    relaxed = r;
  }
  const gridSize = options.gridSize === undefined ? 30 : checkInteger(options.gridSize, 'gridSize', 3, 500);
  const folds = options.folds === undefined ? 5 : checkInteger(options.folds, 'folds', 2, 50);
  let tolerance = 1e-8;
  if (options.tolerance !== undefined) {
    tolerance = checkPositive(options.tolerance, 'tolerance');
    if (tolerance >= 1) throw new KnotwiseError('bad-option', `tolerance must be below 1 (a relative duality gap); got ${showNumber(tolerance)}.`);
  }
  const maxIterations = options.maxIterations === undefined ? 200 : checkInteger(options.maxIterations, 'maxIterations', 1, 100000);
  if (options.oneSE !== undefined && typeof options.oneSE !== 'boolean') throw new KnotwiseError('bad-option', `oneSE must be TRUE or FALSE; got ${String(options.oneSE)}.`);
  const select = options.select === undefined ? 'cv' : checkChoice(options.select, 'select', ['cv', 'sure', 'bic'] as const);
  const noise = options.noise === undefined ? 'correlated' : checkChoice(options.noise, 'noise', NOISE_ASSUMPTIONS);
  return { order, relaxed, gridSize, folds, tolerance, maxIterations, oneSE: !!options.oneSE, select, noise };
}

/**
 * The criterion table of trend filtering: the path over the penalty grid with
 * cross-validation (when select is 'cv' or omitted), SURE and BIC at every
 * penalty, in increasing penalty. For worksheets that return the table.
 *
 * @param series - clean series
 * @param options - as for {@link fitTrend} (order, relaxed, gridSize, folds, tolerance, maxIterations, select)
 * @example
 * ```ts
 * const path = trendCriterionPath(prepareSeries(y, x), { order: 1 });
 * path.points.map((p) => [p.penalty, p.cv, p.df]);
 * ```
 */
export function trendCriterionPath(series: Series, options: FitOptions = {}): TrendPath {
  const s = trendSettings(options);
  checkSize(series, s.order);
  const useCv = s.select === 'cv' && cvPossible(series.n, s.folds, s.order);
  return trendPath(series, { order: s.order, gridSize: s.gridSize, folds: useCv ? s.folds : 0, relaxed: s.relaxed, tolerance: s.tolerance, maxIterations: s.maxIterations, noise: s.noise });
}

/**
 * lambda_max of trend filtering in the data's units: the smallest penalty at
 * which the fit is the weighted least-squares polynomial of degree k (no knots).
 * O(n k). Useful to state a penalty as a fraction of it.
 *
 * @param series - clean series
 * @param options - `order` (0..3, default 1)
 * @example
 * ```ts
 * const lam = 1e-3 * trendPenaltyMax(series, { order: 1 });
 * ```
 */
export function trendPenaltyMax(series: Series, options: FitOptions = {}): number {
  const s = trendSettings(options);
  checkSize(series, s.order);
  const sc = trendScaling(series, s.order);
  return toDataPenalty(trendLambdaMax(sc.xs, sc.ys, sc.ws, s.order), sc);
}

function checkSize(series: Series, k: number): void {
  if (series.n < k + 2) throw new KnotwiseError('too-few-points', `trend filtering of order ${k} needs at least ${k + 2} distinct x values; got ${series.n}.`);
}

/** Cross-validation needs every training set to keep order + 2 points and every fold a held-out point. */
function cvPossible(n: number, folds: number, k: number): boolean {
  return n - 2 >= folds && n - Math.ceil((n - 2) / folds) >= k + 2 && n >= 2 * folds;
}

/**
 * Fits L1 trend filtering to a clean series.
 *
 * Penalty: `options.penalty` (lambda in the data's units, see the module note),
 * else `options.df` (the grid penalty whose df = knots + k + 1 is closest,
 * refined by bisection on log lambda; the grid is extended downwards when the
 * target lies beyond it), else `options.select`: 'cv' (default;
 * K-fold, `folds` default 5, `oneSE` for the largest penalty within one
 * standard error of the minimum), 'sure' (Mallows Cp with the robust noise sd
 * of differenceSigma, weighted first differences), or 'bic'. Grid: `gridSize` (default 30)
 * penalties log-spaced from lambda_max (the smallest giving the polynomial fit)
 * down to 1e-5 lambda_max (k = 0, 1), 1e-7 (k = 2) or 1e-9 (k = 3).
 *
 * Knots: rows r of D(x, k+1) with (D b)_r non-zero (see {@link solveTrend} for
 * the tolerance); reported at point r + k (k >= 1, where the k-th derivative
 * jumps) or r + 1 (k = 0, the first point at the new level), with `change` the
 * jump in the k-th derivative of the L1 fit in the data's units (level jump for
 * k = 0, slope change for k = 1).
 *
 * `relaxed` in [0, 1]: fitted = relaxed * refit + (1 - relaxed) * L1 fit, the
 * refit being the unpenalised weighted regression spline of degree k on the
 * knots ({@link regressionSplineRefit}).
 *
 * sigma = sqrt(RSS_w / (n - df)) (NaN when n <= df).
 *
 * @param series - clean series (at least order + 2 points)
 * @param options - order (0..3, default 1), penalty, df, select, folds, oneSE, relaxed, gridSize, tolerance, maxIterations
 * @throws {@link KnotwiseError} `bad-option`, `too-few-points`
 * @example
 * ```ts
 * const r = fitTrend(prepareSeries(y, x), { order: 1, select: 'cv' });
 * r.knots.map((k) => k.x);
 * ```
 */
export function fitTrend(series: Series, options: FitOptions = {}, context: RunContext = QUIET): FitResult {
  const s = trendSettings(options);
  const k = s.order;
  checkSize(series, k);
  const n = series.n;
  const warnings: Warning[] = [...series.warnings];
  // the scaled problem: built here for a given penalty, else taken from the path (with what its solves cached)
  let sc: TrendScaling;
  let lamScaled: number;
  let criterion: Criterion;
  let fit: TrendFit;
  let dataDriven = false;
  if (options.penalty !== undefined) {
    const lam = checkPenalty(options.penalty, 'penalty');
    sc = trendScaling(series, k);
    const prob: TrendProblem = { x: sc.xs, y: sc.ys, w: sc.ws, k };
    lamScaled = toScaledPenalty(lam, sc);
    fit = lamScaled > 0 ? solveTrend(prob, lamScaled, { tolerance: s.tolerance, maxIterations: s.maxIterations }) : interpolatingFit(prob);
    criterion = { name: 'fixed', value: NaN };
  } else if (options.df !== undefined) {
    const target = checkPositive(options.df, 'df');
    const path = trendPath(series, { order: k, gridSize: s.gridSize, folds: 0, relaxed: 0, tolerance: s.tolerance, maxIterations: s.maxIterations, context });
    sc = path.scaling;
    const r = searchDf(path.problem, path, target, s);
    fit = r.fit;
    lamScaled = r.lambda;
    criterion = { name: 'df', value: fit.knotRows.length + k + 1, curve: curveOf(path, 'df'), atEdge: false };
    if (r.clamped) warnings.push(warning('target-clamped', `df ${showNumber(target)} is outside what trend filtering of order ${k} reaches on these data (${k + 1} to about ${showNumber(r.maxDf)}); the closest attainable, ${fit.knotRows.length + k + 1}, was used.`));
    else if (fit.knotRows.length + k + 1 !== target) warnings.push(warning('target-clamped', `df moves in whole steps (knots + ${k + 1}); ${showNumber(target)} was met as closely as possible: ${fit.knotRows.length + k + 1}.`));
  } else {
    dataDriven = true;
    let rule = s.select;
    if (rule === 'cv' && !cvPossible(n, s.folds, k)) {
      warnings.push(warning('note', `${n} points are too few for ${s.folds}-fold cross-validation at order ${k}; the penalty was chosen by SURE instead.`));
      rule = 'sure';
    }
    // as a candidate of the automatic choice on a long series (which reports only the chosen penalty),
    // every other grid penalty and then the skipped ones beside the lowest score (fillNearBest of trendPath)
    const fillNearBest = context.fillNearBest && rule === 'cv' && !s.oneSE;
    const path = trendPath(series, { order: k, gridSize: s.gridSize, folds: rule === 'cv' ? s.folds : 0, relaxed: s.relaxed, tolerance: s.tolerance, maxIterations: s.maxIterations, noise: s.noise, context, fillNearBest });
    const pts = path.points;
    const curve = curveOf(path, rule);
    const chosen = choosePenalty(curve, rule === 'cv' && s.oneSE ? 'simpler' : 'minimum');
    const atEdge = chosen === 0 || chosen === pts.length - 1;
    criterion = { name: rule, value: curve[chosen].score, curve, atEdge };
    if (atEdge) {
      const ruleName = rule === 'cv' ? 'cross-validation' : rule.toUpperCase();
      warnings.push(edgeWarning(ruleName, chosen === 0 ? 'rough' : 'smooth', pts[chosen].penalty, `a polynomial of degree ${k}`));
    }
    sc = path.scaling;
    lamScaled = path.scaledGrid[pts.length - 1 - chosen];
    fit = solveTrend(path.problem, lamScaled, { tolerance: s.tolerance, maxIterations: s.maxIterations, seed: pts[chosen].seed });
  }
  return assemble(series, s, sc, fit, lamScaled, criterion, warnings, dataDriven, options, !context.comparing);
}

function interpolatingFit(prob: TrendProblem): TrendFit {
  const { x, y, k } = prob;
  const n = x.length;
  const db = differenceOperator(x, k + 1, y);
  const mx = maxAbs(db);
  const knotRows: number[] = [];
  for (let r = 0; r < db.length; r++) if (Math.abs(db[r]) > 1e-12 * mx) knotRows.push(r);
  return trendFit(Float64Array.from(y), new Float64Array(n - k - 1), 0, knotRows, { converged: true, iterations: 0, tolerance: 0, achieved: 0, stoppingRule: 'penalty 0: the fit interpolates the data' });
}

function curveOf(path: TrendPath, rule: string): CriterionPoint[] {
  return path.points.map((p) => ({
    penalty: p.penalty,
    score: rule === 'cv' ? p.cv : rule === 'sure' ? p.sure : rule === 'bic' ? p.bic : p.df,
    df: p.df,
    ...(rule === 'cv' ? { se: p.cvSe } : {}),
    knots: p.knots,
    converged: p.status.converged,
  }));
}

/** Grid penalty with df closest to the target, refined by bisection on log lambda between grid neighbours. */
function searchDf(prob: TrendProblem, path: TrendPath, target: number, s: TrendSettings): { fit: TrendFit; lambda: number; clamped: boolean; maxDf: number } {
  const grid = path.scaledGrid; // decreasing
  const G = grid.length;
  const dfs = path.points.map((p) => p.df).reverse(); // aligned with grid (decreasing penalty)
  const k = prob.k;
  const maxDf = Math.max(...dfs);
  let best = 0;
  for (let j = 1; j < G; j++) if (Math.abs(dfs[j] - target) < Math.abs(dfs[best] - target)) best = j;
  let lam = grid[best];
  let fit = solveTrend(prob, lam, { tolerance: s.tolerance, maxIterations: s.maxIterations, seed: path.points[G - 1 - best].seed });
  let maxDfReached = maxDf;
  let loGrid = grid[G - 1];
  let loFit: TrendFit | undefined;
  // extend the grid downwards (two decades at a time, to 1e-8 of its low end) when the target lies beyond it
  for (let ext = 0; ext < 4 && target > maxDfReached; ext++) {
    loGrid /= 100;
    loFit = solveTrend(prob, loGrid, { tolerance: s.tolerance, maxIterations: s.maxIterations, warm: loFit });
    maxDfReached = Math.max(maxDfReached, loFit.knotRows.length + k + 1);
  }
  const clamped = target < k + 1 || target > maxDfReached;
  if (!clamped && fit.knotRows.length + k + 1 !== target) {
    // bracket: df increases as lambda decreases
    let hiLam = grid[0], loLam = loFit && loFit.knotRows.length + k + 1 >= target ? loGrid : grid[G - 1];
    for (let j = 0; j < G; j++) { if (dfs[j] <= target) hiLam = grid[j]; }
    for (let j = G - 1; j >= 0; j--) { if (dfs[j] >= target) loLam = grid[j]; }
    let a = Math.log(loLam), b = Math.log(hiLam);
    let bestFit = fit, bestLam = lam;
    for (let it = 0; it < 30 && b - a > 1e-9; it++) {
      const mid = 0.5 * (a + b);
      const f = solveTrend(prob, Math.exp(mid), { tolerance: s.tolerance, maxIterations: s.maxIterations, warm: bestFit });
      const d = f.knotRows.length + k + 1;
      if (Math.abs(d - target) < Math.abs(bestFit.knotRows.length + k + 1 - target)) { bestFit = f; bestLam = Math.exp(mid); }
      if (d === target) { bestFit = f; bestLam = Math.exp(mid); break; }
      if (d > target) a = mid; else b = mid;
    }
    fit = bestFit;
    lam = bestLam;
  }
  return { fit, lambda: lam, clamped, maxDf: maxDfReached };
}

function assemble(series: Series, s: TrendSettings, sc: TrendScaling, fit: TrendFit, lamScaled: number, criterion: Criterion, warnings: Warning[], dataDriven: boolean, options: FitOptions, withBends: boolean): FitResult {
  const k = s.order;
  const n = series.n;
  const { x } = series;
  // L1 fit in the data's units
  const l1 = new Float64Array(n);
  for (let i = 0; i < n; i++) l1[i] = sc.y0 + sc.c * fit.b[i];
  let fitted: Float64Array = l1;
  let refit: RegressionSpline | undefined;
  if (s.relaxed > 0) {
    const r = relaxFit(x, series.y, series.w, k, { ...fit, b: l1 }, s.relaxed);
    fitted = r.b;
    refit = r.refit!.spline;
  }
  // knots, change in the data's units: c * (D' b')_r / h^k; (D' b') from the refinement's
  // coefficients when it made the fit (differencing b loses about n^(k+1) eps of its scale)
  let dbs = fit.knotDifferences;
  if (!dbs) {
    const d = differenceOperator(sc.xs, k + 1, fit.b);
    dbs = Float64Array.from(fit.knotRows, (r) => d[r]);
  }
  const kx = knotPositions(x, k, fit.knotRows);
  const off = k === 0 ? 1 : k;
  const knots: Knot[] = fit.knotRows.map((r, j) => ({ x: kx[j], index: r + off, row: series.firstRow[r + off], change: (sc.c * dbs[j]) / Math.pow(sc.h, k) }));
  const df = fit.knotRows.length + k + 1;
  let rss = 0;
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) { resid[i] = series.y[i] - fitted[i]; rss += series.w[i] * resid[i] * resid[i]; }
  const sigma = n > df ? Math.sqrt(rss / (n - df)) : NaN;
  const status: SolverStatus = fit.status;
  if (!status.converged) {
    // A fit far from the optimum is not a result with a caveat but no result: refuse it.
    if (!(status.achieved <= 1e-3)) {
      throw new KnotwiseError('numerical', `trend filtering of order ${k} did not converge on these ${n} points (relative duality gap ${showNumber(status.achieved)} after ${status.iterations} iterations, asked ${showNumber(status.tolerance)}), so no reliable fit exists to return. Try a larger penalty (fewer knots), a lower order, a shorter range of rows, or the spline.`);
    }
    warnings.push(warning('not-converged', `The trend solver stopped after ${status.iterations} iterations with relative duality gap ${showNumber(status.achieved)} (asked ${showNumber(status.tolerance)}); fitted values are close to, but not exactly, the optimum (||fit - optimum||_W <= sqrt(2 gap)). Increase maxIterations or use a smaller penalty.`));
  }
  warnings.push(...fitWarnings(n, df, resid, dataDriven, series.y, criterion.name, s.folds, s.noise));
  warnings.push(boundaryWarning());
  const model: TrendModel = { x, l1, order: k, relaxed: s.relaxed, refit };
  return {
    method: 'trend',
    options: { ...options, method: 'trend', order: k, relaxed: s.relaxed, gridSize: s.gridSize, folds: s.folds, tolerance: s.tolerance, maxIterations: s.maxIterations, ...(options.penalty === undefined && options.df === undefined ? { select: criterion.name as 'cv' | 'sure' | 'bic', oneSE: s.oneSE } : {}) },
    x, fitted, penalty: toDataPenalty(lamScaled, sc), df, sigma, criterion, knots, bends: withBends ? knotBends(series, k, knots) : undefined, warnings, solver: status, model,
  };
}

/**
 * Evaluates a trend fit at new x: the falling factorial interpolant of the L1
 * fit ({@link interpolateTrend}: the degree-k piecewise polynomial through
 * neighbouring fitted values, changing form only at knots), mixed with the
 * relaxed refit when relaxed > 0. Beyond the data the end pieces continue as
 * polynomials of degree k; such values are flagged as extrapolated, and a
 * trend continued past the data is not a forecast.
 *
 * @param result - a result of {@link fitTrend}
 * @param at - positions in the data's x units
 * @example
 * ```ts
 * evaluateTrend(r, Float64Array.of(2.5, 10)).value;
 * ```
 */
export function evaluateTrend(result: FitResult, at: Float64Array): Evaluation {
  const m = result.model as TrendModel | undefined;
  if (!m || !ArrayBuffer.isView(m.l1)) throw new KnotwiseError('bad-option', 'this result does not come from trend filtering; evaluate it with its own method.');
  const { value, extrapolated } = interpolateTrend(m.x, m.l1, m.order, at);
  if (m.relaxed > 0 && m.refit) {
    const r = evaluateRegressionSpline(m.refit, at);
    for (let i = 0; i < value.length; i++) value[i] = m.relaxed * r[i] + (1 - m.relaxed) * value[i];
  }
  return { x: Float64Array.from(at), value, extrapolated };
}

/**
 * Longest series on which trend filtering chooses its penalty from the data,
 * by order: cross-validation, and the rules that need only the penalty path
 * (SURE, BIC, a df target). Beyond them the choice would take minutes (about
 * a minute at the limits on a 2-core machine; measured by `npm run bench`),
 * so it is refused at once with what to do instead; a given penalty has no
 * limit (order 1 and 3 fit a million points in seconds).
 */
export const TREND_DATA_DRIVEN_LIMITS: readonly { cv: number; path: number }[] = [
  { cv: 500000, path: 1000000 },
  { cv: 100000, path: 300000 },
  { cv: 30000, path: 100000 },
  { cv: 5000, path: 30000 },
];

function checkTrendWork(n: number, o: ResolvedOptions): void {
  if (o.penalty !== undefined) return;
  const k = o.order as number;
  const lim = TREND_DATA_DRIVEN_LIMITS[k];
  const rule = o.df !== undefined ? 'df' : (o.rule as string);
  const cv = rule === 'cv' || rule === 'cv-simpler';
  const limit = cv ? lim.cv : lim.path;
  if (n <= limit) return;
  const how = cv ? 'by cross-validation' : rule === 'df' ? 'for a df target' : `by ${rule.toUpperCase()}`;
  const alt = cv ? `the rule sure or bic (up to ${lim.path.toLocaleString('en-US')} points), ` : '';
  throw new KnotwiseError('bad-data', `trend filtering of order ${k} chooses its penalty ${how} on at most ${limit.toLocaleString('en-US')} points; this series has ${n.toLocaleString('en-US')}, which would take minutes. Give a penalty (penalty=...), use ${alt}${k > 1 ? 'a lower order, ' : ''}or a shorter range of rows.`);
}

/**
 * Longest series on which the automatic choice includes trend filtering, by order. Orders 0 and 1
 * are included on every series it compares (their cross-validation grows about linearly: 0.3 and
 * 0.8 s at 20,000 points, 1.0 and 3.0 s at 100,000, with the automatic choice's 15 penalties).
 * Order 2's cross-validation grows faster (0.36 s at 5,000 points and 0.77 to 0.86 s of the 2.0 s
 * the whole choice took at 10,000 in the last bench run), and order 3's own limit for
 * cross-validation is 5,000 ({@link TREND_DATA_DRIVEN_LIMITS}); 2-core machine,
 * `npm run bench -- --only=smoothers`.
 */
export const TREND_AUTO_MAX_POINTS: readonly number[] = [Infinity, Infinity, 10000, TREND_DATA_DRIVEN_LIMITS[3].cv];

/**
 * Trend filtering as a declared analysis: order, penalty rule (or a fixed
 * penalty, or a df target), folds, refit, grid, solver tolerance and
 * iteration limit. Registered in `analyses.ts`.
 */
export const trendAnalysis: AnalysisDefinition = {
  name: 'trend',
  family: 'smoother',
  label: 'Pieces joined at knots the data choose (trend filtering)',
  summary: 'L1 trend filtering: piecewise constant, linear, quadratic or cubic trend with knots chosen by the data (Kim, Koh, Boyd & Gorinevsky 2009; Tibshirani 2014)',
  options: [
    {
      name: 'order', kind: 'integer', min: 0, max: 3, default: TREND_DEFAULT_ORDER,
      help: 'shape of the pieces: 0 level shifts, 1 straight pieces with kinks (default), 2 or 3 smooth bends',
    },
    ...PENALTY_OPTIONS({ rules: ['cv', 'cv-simpler', 'sure', 'bic'], defaultRule: 'cv', folds: 5, searchPoints: 30 }),
    SEASON_OPTION,
    {
      name: 'refit', kind: 'number', min: 0, max: 1, default: 0, implied: 1, oldNames: ['relaxed'],
      help: 'refit the pieces between the knots without shrinking their jumps: 0 plain fit (default), 1 full refit, between a mix (relaxed trend filtering)',
    },
    { name: 'tolerance', kind: 'number', above: 0, max: 0.01, help: 'relative duality gap the solver must reach (default 1e-8)' },
    { name: 'maxIterations', kind: 'integer', min: 1, max: 100000, help: 'iteration limit of the solver (default 200)' },
  ],
  ties: 'merge',
  minPoints: (o: ResolvedOptions) => (o.order as number) + 2,
  autoVariants: [
    { label: 'level shifts (trend filtering, order 0)', options: { order: 0 }, simplicity: 0, cost: 0.5 },
    { label: 'straight pieces with kinks (trend filtering, order 1)', options: { order: 1 }, simplicity: 1 },
    { label: 'smooth bends (trend filtering, order 2)', options: { order: 2 }, simplicity: 2, maxPoints: TREND_AUTO_MAX_POINTS[2], cost: 6 },
    { label: 'smooth bends (trend filtering, order 3)', options: { order: 3 }, simplicity: 3, maxPoints: TREND_AUTO_MAX_POINTS[3], cost: 10 },
  ],
  run(series: Series, options: ResolvedOptions, context: RunContext) {
    checkTrendWork(series.n, options);
    const smooth = fitTrend(series, fitOptionsOf(options), context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => evaluateTrend(result.smooth!, x),
};

