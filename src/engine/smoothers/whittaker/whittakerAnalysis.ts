/**
 * Whittaker-Henderson graduation (order 2: the Hodrick-Prescott filter) as a
 * declared analysis: order, a penalty rule, a fixed penalty, a df target or a
 * data-frequency preset, and the one-sided (past-only) variant. Registered in
 * `analyses.ts`. Kernels: {@link whittakerFit}, {@link whittakerGcv},
 * {@link whittakerOneSided}, {@link hodrickPrescottLambda}.
 */
import { KnotwiseError, showNumber } from '../../errors';
import type { Series } from '../../series';
import type { CriterionPoint, FitOptions, FitResult, NoiseAssumption } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { PENALTY_OPTIONS } from '../../analysis/penaltyOptions';
import { QUIET, RunContext } from '../../analysis/runContext';
import { searchLogPenalty, PenaltyScore } from '../../select/searchLogPenalty';
import { solveForDf } from '../../select/solveForDf';
import { crossValidate } from '../../select/crossValidate';
import { foldPlan } from '../../select/noiseDependence';
import { choosePenalty, edgeWarning } from '../../select/choosePenalty';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { whittakerFit } from './whittakerFit';
import { whittakerGcv } from './whittakerGcv';
import { whittakerOneSided } from './whittakerOneSided';
import { hodrickPrescottLambda, type DataFrequency } from './hodrickPrescottLambda';
import { checkWhittakerLambda, scaledLambda, whittakerInput } from './whittakerInput';
import { whittakerSolve } from './whittakerSolve';
import { interpolateFit } from './interpolateFit';

/** Settings of {@link fitWhittaker} (resolved options). */
export interface WhittakerSettings {
  order: number;
  penalty?: number;
  df?: number;
  frequency?: DataFrequency;
  period?: number;
  rule?: 'gcv' | 'cv' | 'cv-simpler';
  folds?: number;
  /** What cross-validation assumes of the noise (default 'correlated'). */
  noise?: NoiseAssumption;
  searchPoints?: number;
  pastOnly?: boolean;
}

/**
 * Fits Whittaker-Henderson graduation to a clean series, with the penalty from a value,
 * a frequency preset (order 2), a df target, GCV or K-fold cross-validation (the shared
 * folds of {@link crossValidate}; a held-out point is predicted by the fit in which only the
 * training points carry weight, the others being filled in by the penalty). Searches run over lambda on the internal scale
 * (x in mean spacings, weights of mean 1) from 1e-3 to min(1e12, (n/2)^(2 order)).
 * With `pastOnly` the fitted values are the one-sided trend ({@link whittakerOneSided});
 * df, sigma and the penalty choice then refer to the two-sided fit at the same lambda.
 *
 * @example
 * ```ts
 * fitWhittaker(series, { order: 2, frequency: 'quarterly' }).fitted;
 * ```
 */
export function fitWhittaker(series: Series, s: WhittakerSettings, context: RunContext = QUIET): FitResult {
  const n = series.n, d = s.order;
  if (n <= d) throw new KnotwiseError('too-few-points', `Whittaker graduation of order ${d} needs at least ${d + 1} distinct x values; got ${n}.`);
  const inp = whittakerInput(series.x, series.y, series.w, d);
  const unit = Math.pow(inp.h, 2 * (d - 1)) * inp.wScale; // lambda = unit * lambda on the internal scale
  const lo = 1e-3 * unit, hi = Math.min(1e12, Math.pow(n / 2, 2 * d)) * unit;
  const warnings: Warning[] = [...series.warnings];
  let lambda: number;
  let criterion: FitResult['criterion'];
  let iterations = 1, converged = true, achieved = 0, tolerance = 0;
  let stoppingRule = 'direct banded Cholesky solve at the given penalty';
  const gcv = whittakerGcv(series.x, series.y, series.w, d);
  if (s.penalty !== undefined) {
    lambda = s.penalty;
    if (!(lambda > 0)) throw new KnotwiseError('bad-option', `penalty must be > 0 for Whittaker graduation; got ${showNumber(lambda)}.`);
    criterion = { name: 'fixed', value: NaN };
  } else if (s.frequency !== undefined) {
    if (d !== 2) throw new KnotwiseError('bad-option', `the frequency presets are Hodrick-Prescott penalties for order 2; got order ${d}. Give a penalty or a rule instead.`);
    lambda = hodrickPrescottLambda(s.frequency, s.period ?? 1);
    criterion = { name: 'fixed', value: NaN };
  } else if (s.df !== undefined) {
    let target = s.df;
    const dfAt = (l: number) => gcv(l).df;
    const dfMax = dfAt(lo), dfMin = dfAt(hi);
    if (target > dfMax || target < dfMin) {
      const c = Math.min(dfMax, Math.max(dfMin, target));
      warnings.push(warning('target-clamped', `df ${showNumber(target)} is outside what order-${d} graduation reaches on ${n} points (${showNumber(Number(dfMin.toFixed(3)))} to ${showNumber(Number(dfMax.toFixed(3)))}); used ${showNumber(Number(c.toFixed(3)))}.`));
      target = c;
    }
    tolerance = 1e-8;
    const r = solveForDf(dfAt, target, lo, hi, tolerance);
    lambda = r.penalty; iterations = r.iterations; converged = r.converged;
    achieved = Math.abs(r.df - target) / Math.max(1, target);
    stoppingRule = 'root of df(lambda) = target on log(lambda): |df - target| <= tolerance * max(1, target)';
    criterion = { name: 'df', value: r.df };
  } else {
    const rule = s.rule ?? 'gcv';
    const grid = s.searchPoints ?? 25;
    let evaluations = 0;
    const expected = grid + 20;
    let score: (l: number) => PenaltyScore;
    if (rule === 'gcv') {
      score = (l) => { context.step(Math.min(0.95, evaluations++ / expected), 'trying penalties (GCV)'); const g = gcv(l); return { score: g.score, df: g.df }; };
    } else {
      const k = Math.max(2, Math.min(s.folds ?? 10, n - 2));
      const predict = (train: Int32Array, held: Int32Array, pens: Float64Array): Float64Array[] => {
        // only training points carry weight: held-out points, and any neighbours the
        // shared folds leave out of training (correlated noise), are filled in by the penalty
        const w = new Float64Array(n);
        for (let t = 0; t < train.length; t++) w[train[t]] = series.w[train[t]];
        // the fit alone: no leverages or backward error, which the held-out error does not read
        const foldInput = whittakerInput(series.x, series.y, w, d);
        return Array.from(pens, (l) => {
          const f = whittakerSolve(foldInput, scaledLambda(foldInput, checkWhittakerLambda(l)), false, undefined, false).fitted;
          return Float64Array.from(held, (i) => f[i]);
        });
      };
      const plan = foldPlan(series.y, k, s.noise); // once: the folds are the same for every penalty tried
      score = (l) => {
        context.step(Math.min(0.95, evaluations++ / expected), 'trying penalties (cross-validation)');
        const cv = crossValidate(series.y, series.w, k, Float64Array.of(l), predict, undefined, undefined, plan);
        return { score: cv.score[0], se: cv.se[0], df: gcv(l).df };
      };
    }
    tolerance = 1e-4;
    const r = searchLogPenalty(score, lo, hi, grid, tolerance);
    lambda = r.penalty; iterations = r.iterations; converged = r.converged; achieved = r.bracket;
    stoppingRule = `grid of ${grid} log-spaced penalties, then Brent's method until the bracket is below ${tolerance} in log10(lambda)`;
    let value = r.score;
    if (rule === 'cv-simpler') { const p = r.curve[choosePenalty(r.curve, 'simpler')]; lambda = p.penalty; value = p.score; }
    const curve: CriterionPoint[] = r.curve;
    criterion = { name: rule === 'gcv' ? 'gcv' : 'cv', value, curve, atEdge: r.atEdge };
    if (r.atEdge) warnings.push(edgeWarning(rule === 'gcv' ? 'GCV' : 'cross-validation', lambda <= lo * 1.0001 ? 'rough' : 'smooth', lambda, d === 1 ? 'a constant' : `a polynomial of degree ${d - 1}`));
  }
  const fit = whittakerFit(series.x, series.y, series.w, lambda, d);
  let fitted = fit.fitted;
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) resid[i] = series.y[i] - fitted[i];
  const sigma = n > fit.df + 1e-9 ? Math.sqrt(fit.rss / (n - fit.df)) : NaN;
  const se = new Float64Array(n);
  for (let i = 0; i < n; i++) se[i] = series.w[i] > 0 ? sigma * Math.sqrt(Math.max(0, fit.leverage[i]) / series.w[i]) : NaN;
  warnings.push(...fitWarnings(n, fit.df, resid, s.penalty === undefined && s.df === undefined && s.frequency === undefined));
  if (s.pastOnly) {
    fitted = whittakerOneSided(series.x, series.y, series.w, lambda, d).trend;
    warnings.push(warning('note', 'Each trend value uses only data up to its own row (one-sided, computed by a Kalman filter): values are not revised as data arrive, but they lag turning points. df, sigma and the penalty choice refer to the two-sided trend at the same penalty.'));
  } else warnings.push(boundaryWarning());
  const options: FitOptions = { method: 'whittaker', order: d, ...(s.penalty !== undefined ? { penalty: s.penalty } : {}), ...(s.df !== undefined ? { df: s.df } : {}) };
  return {
    method: 'whittaker', options, x: series.x, fitted, penalty: lambda, df: fit.df, sigma, criterion, knots: [],
    ...(s.pastOnly ? {} : { se, leverage: fit.leverage }), warnings,
    solver: { converged: converged && fit.status.converged, iterations, tolerance, achieved, stoppingRule: `${stoppingRule}; final solve: ${fit.status.stoppingRule} (${showNumber(fit.status.achieved)})` },
    model: { x: series.x, fitted },
  };
}

/** The declared analysis 'whittaker'. */
export const whittakerAnalysis: AnalysisDefinition = {
  name: 'whittaker',
  family: 'smoother',
  label: 'Smooth trend that penalises changes in slope (Whittaker; Hodrick-Prescott at order 2)',
  summary: 'Whittaker-Henderson graduation: penalised least squares on differences of order 1-6, on uneven x by divided differences; order 2 is the Hodrick-Prescott filter (Whittaker 1923; Hodrick & Prescott 1997)',
  options: [
    { name: 'order', kind: 'integer', min: 1, max: 6, default: 2, help: 'order of the differences penalised: 1 level changes, 2 slope changes (Hodrick-Prescott, default), 3 or more smoother bends' },
    ...PENALTY_OPTIONS({ rules: ['gcv', 'cv', 'cv-simpler'], defaultRule: 'gcv', folds: 10, searchPoints: 25 }),
    {
      name: 'frequency', kind: 'choice', choices: ['annual', 'quarterly', 'monthly'], group: 'penalty',
      choiceHelp: { annual: 'lambda 6.25 (Ravn & Uhlig 2002)', quarterly: 'lambda 1600 (Hodrick & Prescott 1997)', monthly: 'lambda 129600 (Ravn & Uhlig 2002)' },
      help: 'the customary Hodrick-Prescott penalty for data of this frequency (order 2 only; x counted in periods unless period is given)',
    },
    { name: 'period', kind: 'number', above: 0, onlyWith: { option: 'frequency', values: ['annual', 'quarterly', 'monthly'] }, help: 'length of one period in the units of x, for the frequency presets (default 1: x counts periods)' },
    { name: 'pastOnly', kind: 'switch', default: false, implied: true, help: 'each value uses only data up to its own row (one-sided trend for backtests, no look-ahead; computed by a Kalman filter)' },
  ],
  ties: 'merge',
  autoVariants: [{ label: 'a smooth trend penalising changes in slope (Whittaker / Hodrick-Prescott)', options: { order: 2 }, simplicity: 1 }],
  minPoints: (o: ResolvedOptions) => (o.order as number) + 1,
  run(series: Series, o: ResolvedOptions, context: RunContext) {
    const smooth = fitWhittaker(series, {
      order: o.order as number,
      penalty: o.penalty as number | undefined,
      df: o.df as number | undefined,
      frequency: o.frequency as DataFrequency | undefined,
      period: o.period as number | undefined,
      rule: o.rule as WhittakerSettings['rule'],
      folds: o.folds as number | undefined,
      noise: o.noise as NoiseAssumption | undefined,
      searchPoints: o.searchPoints as number | undefined,
      pastOnly: o.pastOnly as boolean | undefined,
    }, context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => {
    const m = result.smooth!.model as { x: Float64Array; fitted: Float64Array };
    return interpolateFit(m.x, m.fitted, x);
  },
};
