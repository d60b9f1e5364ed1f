/**
 * The natural cubic smoothing spline, exact and O(n).
 *
 * Minimises  sum_i w_i (y_i - f(x_i))^2 + lambda * integral f''(x)^2 dx  over
 * all twice-differentiable f; the solution is the natural cubic spline with a
 * knot at every distinct x (Reinsch 1967). lambda is in the units of the data
 * as given: (units of y)^2-per-weight times (units of x)^3, so it means the same
 * as SciPy's `make_smoothing_spline(x, y, w, lam)`. (R's `smooth.spline`
 * reports lambda for x rescaled to [0, 1]: lambda = lambda_R * range(x)^3.)
 *
 * Internally x is mapped to [0, 1], weights to mean 1 and y to mean 0, sd 1,
 * so the banded system is well scaled for dates near 45,000 or x in [0, 1e-3].
 *
 * Penalty choice: a given lambda; a target equivalent df = trace of the hat
 * matrix; generalised cross-validation (Craven & Wahba 1979),
 *   GCV(lambda) = [ sum_rows w_r (y_r - f(x_r))^2 / sum_rows w_r ] / (1 - tr S / N)^2 ,
 * over the N original rows (so tied x count as the observations they are, and the
 * scatter within a tie group counts, as in R's smooth.spline; without ties and with
 * unit weights this is n RSS / (n - tr S)^2),
 * with tr S exact from the band of the inverse (Hutchinson & de Hoog 1985);
 * or K-fold cross-validation with deterministic folds ({@link foldOf}).
 *
 * References: C. H. Reinsch, Numer. Math. 10 (1967) 177-183; P. Craven and
 * G. Wahba, Numer. Math. 31 (1979) 377-403; M. F. Hutchinson and F. R. de Hoog,
 * Numer. Math. 47 (1985) 99-106; G. Wahba, "Bayesian confidence intervals for
 * the cross-validated smoothing spline", JRSS B 45 (1983) 133-150 (the
 * pointwise standard error sigma * sqrt(h_ii / w_i)).
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { type CriterionPoint, type Evaluation, type FitOptions, type FitResult, NOISE_ASSUMPTIONS, type NoiseAssumption } from '../types';
import { Warning, warning } from '../warnings';
import { checkChoice, checkInteger, checkPenalty, checkPositive } from '../options';
import { reinschScore, reinschSolve, reinschSystem, ReinschSystem } from './spline/reinsch';
import { evaluateNaturalCubic } from './spline/evaluateNaturalCubic';
import { searchLogPenalty, PenaltyScore } from '../select/searchLogPenalty';
import { solveForDf } from '../select/solveForDf';
import { crossValidate } from '../select/crossValidate';
import { foldPlan } from '../select/noiseDependence';
import { choosePenalty, edgeWarning } from '../select/choosePenalty';
import { boundaryWarning, fitWarnings } from '../diagnostics/commonWarnings';
import { weightedMoments } from '../weightedMoments';
import { QUIET, RunContext } from '../analysis/runContext';
import type { AnalysisDefinition } from '../analysis/analysisDefinition';
import type { ResolvedOptions } from '../analysis/optionDeclaration';
import { PENALTY_OPTIONS, SEASON_OPTION, fitOptionsOf } from '../analysis/penaltyOptions';

/** State kept for evaluation at new x (original units). */
export interface SplineModel {
  x: Float64Array;
  g: Float64Array;
  gamma: Float64Array;
}

interface Scaled {
  t: Float64Array;
  w: Float64Array;
  y: Float64Array;
  x0: number;
  xs: number;
  wm: number;
  ym: number;
  ys: number;
}

function scale(series: Series): Scaled {
  const { x, y, w, n } = series;
  const x0 = x[0];
  const xs = x[n - 1] - x[0];
  const { mean: ym, sd: ys, meanWeight: wm } = weightedMoments(y, w);
  const t = new Float64Array(n), ws = new Float64Array(n), yy = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = (x[i] - x0) / xs;
    ws[i] = w[i] / wm;
    yy[i] = (y[i] - ym) / ys;
  }
  return { t, w: ws, y: yy, x0, xs, wm, ym, ys };
}

/** lambda in the data's units -> lambda in scaled units, and back. */
const toScaled = (lambda: number, s: Scaled): number => lambda / (s.wm * s.xs * s.xs * s.xs);
const fromScaled = (lt: number, s: Scaled): number => lt * s.wm * s.xs * s.xs * s.xs;

/**
 * The range of scaled lambda searched: from nearly interpolating (df close to
 * n) to nearly the straight line (df close to 2). The natural scale of lambda
 * in [0, 1] units is hbar^3 (hbar the smallest spacing) at the rough end and n
 * (sum of weights) at the smooth end (common practice; the equivalent-kernel
 * bandwidth is (lambda / n)^(1/4)).
 */
function searchRange(t: Float64Array): [number, number] {
  const n = t.length;
  let hmin = Infinity;
  for (let i = 1; i < n; i++) hmin = Math.min(hmin, t[i] - t[i - 1]);
  const lo = Math.max(1e-300, Math.pow(hmin, 3) * 1e-3);
  const hi = n * 1e2;
  return [lo, hi];
}

function resolveOptions(options: FitOptions, n: number): FitOptions {
  const out: FitOptions = { method: 'spline' };
  if (options.penalty !== undefined) out.penalty = checkPenalty(options.penalty);
  else if (options.df !== undefined) out.df = checkPositive(options.df, 'df');
  else out.select = options.select === undefined ? 'gcv' : checkChoice(options.select, 'select (for the spline)', ['gcv', 'cv'] as const);
  if (out.select === 'cv') {
    const maxK = Math.max(2, Math.min(50, n - 2));
    out.folds = options.folds === undefined ? Math.min(10, maxK) : checkInteger(options.folds, 'folds', 2, maxK);
    out.oneSE = !!options.oneSE;
    if (options.noise !== undefined) out.noise = checkChoice(options.noise, 'noise', NOISE_ASSUMPTIONS);
  }
  out.gridSize = options.gridSize === undefined ? 25 : checkInteger(options.gridSize, 'gridSize', 5, 400);
  for (const k of ['order', 'relaxed'] as const) {
    if (options[k] !== undefined) throw new KnotwiseError('bad-option', `${k} does not apply to the spline; remove it or choose method "trend".`);
  }
  return out;
}

/**
 * K-fold CV score of the spline at scaled lambda through the shared
 * {@link crossValidate} (the same folds and score as every method), with each
 * fold's banded system built once and reused for every penalty tried.
 * Scores are in scaled units of y (the caller converts).
 */
function cvScorer(s: Scaled, k: number, noise?: NoiseAssumption): (lt: number) => { score: number; se: number } {
  const systems = new Map<number, { sys: ReinschSystem; t: Float64Array }>();
  const plan = foldPlan(s.y, k, noise); // once: the folds are the same for every penalty tried
  const predict = (train: Int32Array, held: Int32Array, pens: Float64Array): Float64Array[] => {
    let f = systems.get(held[0]);
    if (!f) {
      const t = Float64Array.from(train, (i) => s.t[i]);
      f = { sys: reinschSystem(t, Float64Array.from(train, (i) => s.y[i]), Float64Array.from(train, (i) => s.w[i])), t };
      systems.set(held[0], f);
    }
    const { sys, t } = f;
    return Array.from(pens, (lt) => {
      const sol = reinschSolve(sys, lt, false);
      return Float64Array.from(held, (i) => evaluateNaturalCubic(t, sol.g, sol.gamma, s.t[i]));
    });
  };
  return (lt) => {
    const cv = crossValidate(s.y, s.w, k, Float64Array.of(lt), predict, undefined, undefined, plan);
    return { score: cv.score[0], se: cv.se[0] };
  };
}

/**
 * Fits the natural cubic smoothing spline to a clean series.
 *
 * @param series - from {@link prepareSeries}; at least 3 distinct x
 * @param options - `penalty` (lambda >= 0, data units), or `df` (target trace of
 *   the hat matrix, clamped to (2, n] with a warning), or `select` 'gcv'
 *   (default) or 'cv' with `folds` (default 10) and `oneSE`; `gridSize`
 *   (default 25) log-spaced penalties for the search and the criterion curve.
 * @returns fitted values, lambda, df, sigma, pointwise standard errors and the
 *   criterion curve (lambda, score, df), with warnings.
 * @example
 * ```ts
 * const s = prepareSeries(yCells, xCells);
 * const r = fitSpline(s, { select: 'gcv' });
 * r.penalty; r.df; r.fitted;
 * ```
 */
export function fitSpline(series: Series, options: FitOptions = {}, context: RunContext = QUIET): FitResult {
  const n = series.n;
  if (n < 3) throw new KnotwiseError('too-few-points', `the spline needs at least 3 distinct x values; got ${n}.`);
  const opts = resolveOptions(options, n);
  const s = scale(series);
  const sys = reinschSystem(s.t, s.y, s.w);
  const [lo, hi] = searchRange(s.t);
  const warnings: Warning[] = [...series.warnings];
  let lt: number;
  let criterion: FitResult['criterion'];
  let iterations = 1;
  let converged = true;
  let achieved = 0;
  let tolerance = 0;
  let stoppingRule = 'direct block LDL\' solve at the given penalty';
  const dfAt = (l: number): number => reinschScore(sys, l).df;

  if (opts.penalty !== undefined) {
    lt = toScaled(opts.penalty, s);
    criterion = { name: 'fixed', value: NaN };
  } else if (opts.df !== undefined) {
    let target = opts.df;
    const dfMax = dfAt(lo), dfMin = dfAt(hi);
    if (target > dfMax || target < dfMin) {
      const clamped = Math.min(dfMax, Math.max(dfMin, target));
      warnings.push(warning('target-clamped', `df ${showNumber(target)} is outside what the spline can reach with ${n} distinct x (from just above 2 to ${n}); used ${showNumber(Number(clamped.toFixed(3)))}.`));
      target = clamped;
    }
    tolerance = 1e-8;
    const r = solveForDf(dfAt, target, lo, hi, tolerance);
    lt = r.penalty; iterations = r.iterations; converged = r.converged;
    achieved = Math.abs(r.df - target) / Math.max(1, target);
    stoppingRule = 'root of df(lambda) = target on log(lambda): |df - target| <= tolerance * max(1, target)';
    criterion = { name: 'df', value: r.df };
  } else {
    // GCV of the original observations (as R's smooth.spline computes it with ties): the weighted mean squared
    // residual over all N rows used, including the scatter within tie groups, over (1 - df / N)^2. Without ties
    // and with unit weights this is the usual n RSS / (n - df)^2.
    const N = series.nUsed;
    const within = series.withinTies / (s.ys * s.ys * s.wm);
    const gcv = (l: number): PenaltyScore => {
      const sol = reinschScore(sys, l);
      const denom = 1 - sol.df / N;
      return { score: denom > 0 ? ((sol.rss + within) / n) / (denom * denom) : Infinity, df: sol.df };
    };
    let plain: (l: number) => PenaltyScore = gcv;
    if (opts.select === 'cv') {
      const cv = cvScorer(s, opts.folds!, opts.noise);
      plain = (l) => { const c = cv(l); return { score: c.score, se: c.se, df: dfAt(l) }; };
    }
    let evaluations = 0;
    const expected = opts.gridSize! + 20;
    const score = (l: number): PenaltyScore => {
      context.step(Math.min(0.95, evaluations++ / expected), `trying penalties (${opts.select === 'cv' ? 'cross-validation' : 'GCV'})`);
      return plain(l);
    };
    tolerance = 1e-4;
    const r = searchLogPenalty(score, lo, hi, opts.gridSize, tolerance);
    lt = r.penalty;
    iterations = r.iterations; converged = r.converged; achieved = r.bracket;
    stoppingRule = `grid of ${opts.gridSize} log-spaced penalties, then Brent's method until the bracket is below ${tolerance} in log10(lambda)`;
    let value = r.score;
    if (opts.select === 'cv' && opts.oneSE) {
      const pick = r.curve[choosePenalty(r.curve, 'simpler')];
      lt = pick.penalty; value = pick.score;
    }
    // criterion values are on the scaled y; report them in (units of y)^2
    const yv = s.ys * s.ys;
    const curve: CriterionPoint[] = r.curve.map((p) => ({ ...p, penalty: fromScaled(p.penalty, s), score: p.score * yv, ...(p.se !== undefined ? { se: p.se * yv } : {}) }));
    criterion = { name: opts.select!, value: value * yv, curve, atEdge: r.atEdge };
    if (r.atEdge) {
      warnings.push(edgeWarning(opts.select === 'cv' ? 'cross-validation' : 'GCV', lt <= lo * 1.0001 ? 'rough' : 'smooth', fromScaled(lt, s), 'a straight line'));
    }
  }

  const sol = reinschSolve(sys, lt, true);
  const { ys, ym } = s;
  const fitted = new Float64Array(n);
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    fitted[i] = ym + ys * sol.g[i];
    resid[i] = series.y[i] - fitted[i];
  }
  const df = sol.df;
  const rss = sol.rss * ys * ys * s.wm;
  const sigma = n > df + 1e-9 ? Math.sqrt(rss / (n - df)) : NaN;
  const se = new Float64Array(n);
  for (let i = 0; i < n; i++) se[i] = sigma * Math.sqrt(Math.max(0, sol.leverage![i]) / series.w[i]);
  const gx = ys / (s.xs * s.xs);
  const gamma = sol.gamma.map((v) => v * gx);
  warnings.push(...fitWarnings(n, df, resid, opts.penalty === undefined && opts.df === undefined, series.y, opts.select, opts.folds, opts.noise));
  warnings.push(boundaryWarning());
  const model: SplineModel = { x: series.x, g: fitted, gamma };
  return {
    method: 'spline', options: opts, x: series.x, fitted, penalty: fromScaled(lt, s), df, sigma, criterion,
    knots: [], se, leverage: sol.leverage, warnings,
    solver: { converged, iterations, tolerance, achieved, stoppingRule }, model,
  };
}

/** Evaluates a spline fit at new x; beyond the data the natural spline continues as a straight line. */
export function evaluateSpline(result: FitResult, xNew: Float64Array): Evaluation {
  const m = result.model as SplineModel;
  const value = new Float64Array(xNew.length);
  const extrapolated = new Uint8Array(xNew.length);
  const lo = m.x[0], hi = m.x[m.x.length - 1];
  for (let i = 0; i < xNew.length; i++) {
    value[i] = evaluateNaturalCubic(m.x, m.g, m.gamma, xNew[i]);
    extrapolated[i] = xNew[i] < lo || xNew[i] > hi ? 1 : 0;
  }
  return { x: xNew, value, extrapolated };
}

/**
 * The spline as a declared analysis: its options (a penalty rule, a fixed
 * penalty or a df target, folds for cross-validation, the search grid) and
 * its run. The registration line is in `analyses.ts`.
 */
export const splineAnalysis: AnalysisDefinition = {
  name: 'spline',
  family: 'smoother',
  label: 'Smooth curve (smoothing spline)',
  summary: 'natural cubic smoothing spline: a smooth curve with a knot at every x; penalty by GCV, cross-validation, a df target or a value (Reinsch 1967; Craven & Wahba 1979)',
  options: [...PENALTY_OPTIONS({ rules: ['gcv', 'cv', 'cv-simpler'], defaultRule: 'gcv', folds: 10, searchPoints: 25 }), SEASON_OPTION],
  ties: 'merge',
  minPoints: () => 3,
  autoVariants: [{ label: 'a smooth curve (spline)', options: {}, simplicity: 1 }],
  run(series: Series, options: ResolvedOptions, context: RunContext) {
    const smooth = fitSpline(series, fitOptionsOf(options), context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => evaluateSpline(result.smooth!, x),
};

