/**
 * LOESS / LOWESS as a declared analysis: degree, span (given, or chosen by AICc or
 * GCV), robustness passes and the interpolation distance. Registered in
 * `analyses.ts`. Kernels: {@link loessFit}, {@link loessSelectSpan}.
 */
import { showNumber } from '../../errors';
import type { Series } from '../../series';
import type { FitResult, NoiseAssumption } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import { RULE_HELP, noiseOption } from '../../analysis/penaltyOptions';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { QUIET, RunContext } from '../../analysis/runContext';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { loessFit, type LoessFit } from './loessFit';
import { LOESS_SEARCH_POINTS, loessSelectSpan, spanGrid } from './loessSelectSpan';
import { loessPredict } from './loessPredict';
import { crossValidate } from '../../select/crossValidate';
import { foldPlan } from '../../select/noiseDependence';
import { interpolateFit } from '../whittaker/interpolateFit';
import { choosePenalty } from '../../select/choosePenalty';
import type { CriterionPoint } from '../../types';

/** Settings of {@link fitLoess}. */
export interface LoessSettings {
  degree: 0 | 1 | 2;
  span?: number;
  rule?: 'aicc' | 'gcv' | 'cv' | 'cv-simpler';
  folds?: number;
  /** Spans tried when the span is chosen (log-spaced up to 1; default {@link LOESS_SEARCH_POINTS}). */
  searchPoints?: number;
  /** What cross-validation assumes of the noise (default 'correlated'). */
  noise?: NoiseAssumption;
  robustness?: number;
  interpolateWithin?: number;
}

/**
 * Fits LOESS to a clean series (ties merged into weighted points): a given span, or the
 * span minimising AICc (default) or GCV over {@link loessSelectSpan}'s grid, or K-fold
 * cross-validation on the shared folds ({@link crossValidate}) over the same grid, where each
 * held-out point is predicted by {@link loessPredict} from a fit to the other folds ('cv-simpler':
 * the largest span within one standard error of the best). The reported penalty is the span;
 * df is the exact trace of the smoother matrix.
 *
 * @example
 * ```ts
 * fitLoess(series, { degree: 1, robustness: 3 }).fitted;
 * ```
 */
export function fitLoess(series: Series, s: LoessSettings, context: RunContext = QUIET): FitResult {
  const n = series.n;
  const warnings: Warning[] = [...series.warnings];
  let fit: LoessFit, span: number;
  let criterion: FitResult['criterion'];
  const common = { degree: s.degree, robustnessIterations: s.robustness ?? 0, ...(s.interpolateWithin !== undefined ? { delta: s.interpolateWithin } : {}) };
  if (s.span !== undefined) {
    span = s.span;
    fit = loessFit(series.x, series.y, series.w, { span, ...common });
    criterion = { name: 'fixed', value: NaN };
  } else if (s.rule === 'cv' || s.rule === 'cv-simpler') {
    const k = Math.max(2, Math.min(s.folds ?? 10, n - 2));
    // the grid of loessSelectSpan, kept to spans the training folds can use
    const lo = Math.min(1, Math.max((2 * s.degree + 4) / (n - Math.ceil(n / k)), 1e-3));
    const spans = Float64Array.from(spanGrid(lo, s.searchPoints ?? LOESS_SEARCH_POINTS));
    const predict = (train: Int32Array, held: Int32Array, pens: Float64Array): Float64Array[] => {
      const tx = Float64Array.from(train, (i) => series.x[i]), ty = Float64Array.from(train, (i) => series.y[i]), tw = Float64Array.from(train, (i) => series.w[i]);
      const hx = Float64Array.from(held, (i) => series.x[i]);
      return Array.from(pens, (sp) => {
        const f = loessFit(tx, ty, tw, { span: sp, ...common });
        // when the training fit is itself interpolated between anchor points (long series), its curve is the
        // straight line between neighbouring training points, exactly; held-out points (never the first or last)
        // lie between training points, so they are predicted on that curve, as the fit would be evaluated
        if (f.anchors < tx.length) return interpolateFit(tx, f.fitted, hx).value;
        return loessPredict(tx, ty, tw, f.robustnessWeights, sp, s.degree, hx);
      });
    };
    const cv = crossValidate(series.y, series.w, k, spans, predict, context, 'cross-validation of spans', foldPlan(series.y, k, s.noise));
    const curve: CriterionPoint[] = [];
    for (let j = 0; j < spans.length; j++) {
      const f = loessFit(series.x, series.y, series.w, { span: spans[j], ...common });
      curve.push({ penalty: spans[j], score: cv.score[j], se: cv.se[j], df: f.df });
    }
    const best = choosePenalty(curve, s.rule === 'cv-simpler' ? 'simpler' : 'minimum');
    span = spans[best];
    fit = loessFit(series.x, series.y, series.w, { span, ...common });
    const atEdge = choosePenalty(curve, 'minimum') === 0 || choosePenalty(curve, 'minimum') === curve.length - 1;
    criterion = { name: 'cv', value: curve[best].score, curve, atEdge };
    if (atEdge) warnings.push(warning('penalty-at-edge', `The cross-validation choice is at an end of the spans tried (${showNumber(span)}): a span outside ${showNumber(spans[0])} to 1 might predict better, or the data show no local structure.`));
  } else {
    context.step(0.1, `trying spans (${s.rule === 'gcv' ? 'GCV' : 'AICc'})`);
    const sel = loessSelectSpan(series.x, series.y, series.w, { ...common, criterion: s.rule === 'gcv' ? 'gcv' : 'aicc', count: s.searchPoints });
    span = sel.span; fit = sel.fit;
    criterion = { name: sel.criterion, value: sel.criterion === 'aicc' ? fit.aicc : fit.gcv, curve: sel.table.map((r) => ({ penalty: r.span, score: r.score, df: r.df })), atEdge: sel.atEdge };
    if (sel.atEdge) {
      warnings.push(warning('penalty-at-edge', span === sel.table[0].span
        ? `The ${sel.criterion === 'aicc' ? 'AICc' : 'GCV'} choice is the smallest span tried (${showNumber(span)}): the fit may follow noise. Consider a larger span.`
        : `The ${sel.criterion === 'aicc' ? 'AICc' : 'GCV'} choice is the largest span (1): the data show no structure beyond ${s.degree === 2 ? 'a parabola' : s.degree === 1 ? 'a straight line' : 'a constant'} locally.`));
    }
  }
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) resid[i] = series.y[i] - fit.fitted[i];
  const sigma = n > fit.df + 1e-9 ? Math.sqrt(fit.rss / (n - fit.df)) : NaN;
  warnings.push(...fitWarnings(n, fit.df, resid, s.span === undefined));
  if (fit.anchors < n) warnings.push(warning('note', `Local fits were computed at ${fit.anchors} of ${n} points (at least ${showNumber(fit.delta)} apart in x); values between them are interpolated along straight lines.`));
  warnings.push(boundaryWarning());
  return {
    method: 'loess', options: { method: 'loess' }, x: series.x, fitted: fit.fitted, penalty: span, df: fit.df, sigma, criterion,
    knots: [], leverage: fit.leverage, warnings, solver: fit.status,
    model: { x: series.x, y: series.y, w: series.w, rw: fit.robustnessWeights, span, degree: s.degree },
  };
}

/** The declared analysis 'loess'. */
export const loessAnalysis: AnalysisDefinition = {
  name: 'loess',
  family: 'smoother',
  label: 'Local curve: a weighted straight line or parabola fitted around each point (LOESS)',
  summary: 'LOESS / LOWESS: locally weighted polynomial regression with tricube weights and optional bisquare robustness passes; span by AICc or GCV (Cleveland 1979; Cleveland & Devlin 1988; Hurvich, Simonoff & Tsai 1998)',
  options: [
    { name: 'degree', kind: 'integer', min: 0, max: 2, default: 1, help: 'shape fitted around each point: 1 a straight line (default, as LOWESS), 2 a parabola, 0 a weighted mean' },
    { name: 'span', kind: 'number', above: 0, max: 1, group: 'penalty', help: 'fraction of the points used around each point (0 to 1); larger is smoother' },
    {
      name: 'rule', kind: 'choice', choices: ['aicc', 'gcv', 'cv', 'cv-simpler'], default: 'aicc', group: 'penalty',
      choiceHelp: { aicc: 'corrected Akaike criterion (Hurvich, Simonoff & Tsai 1998)', gcv: RULE_HELP.gcv, cv: RULE_HELP.cv, 'cv-simpler': RULE_HELP['cv-simpler'] },
      help: 'how to choose the span when none is given: aicc (default), gcv, cv or cv-simpler',
    },
    { name: 'folds', kind: 'integer', min: 2, max: 50, onlyWith: { option: 'rule', values: ['cv', 'cv-simpler'] }, help: 'number of cross-validation folds (default 10, fewer on short series)' },
    { name: 'searchPoints', kind: 'integer', min: 5, max: 400, default: LOESS_SEARCH_POINTS, help: `number of spans tried when the span is chosen, log-spaced up to 1 (default ${LOESS_SEARCH_POINTS})` },
    noiseOption('rule', ['cv', 'cv-simpler']),
    { name: 'robustness', kind: 'integer', min: 0, max: 20, default: 0, implied: 3, help: 'passes that down-weight outliers (bisquare weights; 3 as in LOWESS); 0 for none (default)' },
    { name: 'interpolateWithin', kind: 'number', min: 0, help: 'x distance within which fitted values are interpolated between exact local fits (default: none up to 1000 points, else min(0.01, span / 20) of the x range)' },
  ],
  ties: 'merge',
  autoVariants: [
    { label: 'a local straight-line curve (LOESS, degree 1)', options: { degree: 1 }, simplicity: 1, cost: 2 },
    { label: 'a local parabola curve (LOESS, degree 2)', options: { degree: 2 }, simplicity: 2, cost: 2 },
  ],
  minPoints: (o: ResolvedOptions) => (o.degree as number) + 2,
  run(series: Series, o: ResolvedOptions, context: RunContext) {
    const smooth = fitLoess(series, {
      degree: o.degree as 0 | 1 | 2,
      span: o.span as number | undefined,
      rule: o.rule as LoessSettings['rule'],
      folds: o.folds as number | undefined,
      searchPoints: o.searchPoints as number | undefined,
      noise: o.noise as NoiseAssumption | undefined,
      robustness: o.robustness as number | undefined,
      interpolateWithin: o.interpolateWithin as number | undefined,
    }, context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  // the local fit at each new x (beyond the data: the end polynomial continued, flagged)
  evaluate: (result, x) => {
    const m = result.smooth!.model as { x: Float64Array; y: Float64Array; w: Float64Array; rw: Float64Array; span: number; degree: 0 | 1 | 2 };
    const value = loessPredict(m.x, m.y, m.w, m.rw, m.span, m.degree, x);
    const lo = m.x[0], hi = m.x[m.x.length - 1];
    return { x, value, extrapolated: Uint8Array.from(x, (t) => (t < lo || t > hi ? 1 : 0)) };
  },
};
