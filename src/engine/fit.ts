/**
 * Conveniences over {@link runAnalysis} for engine callers that think in a
 * smoother's fit: raw cells and the smoothers' {@link FitOptions} in, the
 * {@link FitResult} and its series out; and evaluation of such a fit at new x.
 */
import { runAnalysis } from './analysis/runAnalysis';
import { findAnalysis } from './analysis/analysisRegistry';
import { KnotwiseError } from './errors';
import type { Cell, Series } from './series';
import type { Evaluation, FitOptions, FitResult } from './types';

/** A fit together with the series it was made from (the fronts need `rowOf`). */
export interface SeriesFit {
  series: Series;
  result: FitResult;
}

/**
 * Intake and fit in one step: y, optional x and weights as raw cells; the
 * options as {@link FitOptions} (method, select with oneSE, relaxed and
 * gridSize are translated to the declared names).
 *
 * @example
 * ```ts
 * const { series, result } = fitCells([3, 5, 4, 6, 8], null, null, { method: 'spline', df: 3 });
 * ```
 */
export function fitCells(y: readonly Cell[], x: readonly Cell[] | null | undefined, w: readonly Cell[] | null | undefined, options: FitOptions = {}): SeriesFit {
  const { method = 'spline', oneSE, select, relaxed, gridSize, ...rest } = options;
  const o: Record<string, unknown> = { ...rest };
  if (select !== undefined) o.rule = oneSE && String(select).toLowerCase() === 'cv' ? 'cv-simpler' : select;
  else if (oneSE) o.rule = 'cv-simpler';
  if (relaxed !== undefined) o.refit = relaxed;
  if (gridSize !== undefined) o.searchPoints = gridSize;
  const r = runAnalysis({ analysis: method, family: 'smoother', y, x, w, options: o });
  return { series: r.series, result: r.smooth! };
}

/** Evaluates a smoother's fit at new x with its method's rule beyond the data; values outside the data are flagged. */
export function evaluate(result: FitResult, xNew: ArrayLike<number>): Evaluation {
  const { def } = findAnalysis(result.method, 'smoother');
  if (!def.evaluate) throw new KnotwiseError('bad-option', `"${def.name}" gives no curve to evaluate at new x.`);
  return def.evaluate({ fitted: result.fitted, warnings: result.warnings, solver: result.solver, smooth: result }, Float64Array.from(xNew));
}
