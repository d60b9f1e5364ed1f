/**
 * The one entry the fronts call: raw cells (or a clean series) and options in,
 * a {@link FitResult} out.
 */
import './methods';
import { getMethod } from './registry';
import { Cell, prepareSeries, Series } from './series';
import type { Evaluation, FitOptions, FitResult } from './types';

/** A fit together with the series it was made from (the fronts need `rowOf`). */
export interface SeriesFit {
  series: Series;
  result: FitResult;
}

/**
 * Fits a clean series with the method named in `options.method` (default 'spline').
 * @throws {@link KnotwiseError} for unknown methods and invalid options
 */
export function fit(series: Series, options: FitOptions = {}): FitResult {
  return getMethod(options.method ?? 'spline').fit(series, options);
}

/**
 * Intake and fit in one step: y, optional x and weights as raw cells.
 *
 * @example
 * ```ts
 * const { series, result } = fitCells([3, 5, 4, 6, 8], null, null, { method: 'spline', df: 3 });
 * ```
 */
export function fitCells(y: readonly Cell[], x: readonly Cell[] | null | undefined, w: readonly Cell[] | null | undefined, options: FitOptions = {}): SeriesFit {
  const method = getMethod(options.method ?? 'spline');
  const series = prepareSeries(y, x, w, { minPoints: method.minPoints(options), method: method.name });
  return { series, result: method.fit(series, options) };
}

/** Evaluates a fit at new x with its method's rule beyond the data. */
export function evaluate(result: FitResult, xNew: ArrayLike<number>): Evaluation {
  return getMethod(result.method).evaluate(result, Float64Array.from(xNew));
}
