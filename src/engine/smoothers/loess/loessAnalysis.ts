/**
 * LOESS / LOWESS as a declared analysis: degree, span (given, or chosen by AICc or
 * GCV), robustness passes and the interpolation distance. Registered in
 * `analyses.ts`. Kernels: {@link loessFit}, {@link loessSelectSpan}.
 */
import { showNumber } from '../../errors';
import type { Series } from '../../series';
import type { FitResult } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { QUIET, RunContext } from '../../analysis/runContext';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { loessFit, type LoessFit } from './loessFit';
import { loessSelectSpan } from './loessSelectSpan';
import { interpolateFit } from '../whittaker/interpolateFit';

/** Settings of {@link fitLoess}. */
export interface LoessSettings {
  degree: 0 | 1 | 2;
  span?: number;
  rule?: 'aicc' | 'gcv';
  robustness?: number;
  interpolateWithin?: number;
}

/**
 * Fits LOESS to a clean series (ties merged into weighted points): a given span, or the
 * span minimising AICc (default) or GCV over {@link loessSelectSpan}'s grid. The reported
 * penalty is the span; df is the exact trace of the smoother matrix.
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
  } else {
    context.step(0.1, `trying spans (${s.rule === 'gcv' ? 'GCV' : 'AICc'})`);
    const sel = loessSelectSpan(series.x, series.y, series.w, { ...common, criterion: s.rule ?? 'aicc' });
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
    knots: [], leverage: fit.leverage, warnings, solver: fit.status, model: { x: series.x, fitted: fit.fitted },
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
      name: 'rule', kind: 'choice', choices: ['aicc', 'gcv'], default: 'aicc', group: 'penalty',
      choiceHelp: { aicc: 'corrected Akaike criterion (Hurvich, Simonoff & Tsai 1998)', gcv: 'generalised cross-validation (Craven & Wahba 1979)' },
      help: 'how to choose the span when none is given: aicc (default) or gcv',
    },
    { name: 'robustness', kind: 'integer', min: 0, max: 20, default: 0, implied: 3, help: 'passes that down-weight outliers (bisquare weights; 3 as in LOWESS); 0 for none (default)' },
    { name: 'interpolateWithin', kind: 'number', min: 0, help: 'x distance within which fitted values are interpolated between exact local fits (default: none up to 1000 points, else min(0.01, span / 20) of the x range)' },
  ],
  ties: 'merge',
  minPoints: (o: ResolvedOptions) => (o.degree as number) + 2,
  run(series: Series, o: ResolvedOptions, context: RunContext) {
    const smooth = fitLoess(series, {
      degree: o.degree as 0 | 1 | 2,
      span: o.span as number | undefined,
      rule: o.rule as 'aicc' | 'gcv' | undefined,
      robustness: o.robustness as number | undefined,
      interpolateWithin: o.interpolateWithin as number | undefined,
    }, context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => {
    const m = result.smooth!.model as { x: Float64Array; fitted: Float64Array };
    return interpolateFit(m.x, m.fitted, x);
  },
};
