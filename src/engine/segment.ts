/**
 * Intake and changepoint segmentation in one step, for the fronts.
 */
import { Cell, prepareSeries, Series } from './series';
import { findBreaks } from './breaks/findBreaks';
import type { BreaksOptions, BreaksResult } from './breaks/types';

/** A segmentation together with the series it was made from. */
export interface SeriesBreaks {
  series: Series;
  result: BreaksResult;
}

/**
 * Raw cells in, breaks out. Ties in x are kept as separate points in input
 * order (a changepoint is never placed between equal x).
 *
 * @example
 * ```ts
 * const { result } = breaksFromCells(flowCells, yearCells, null, { model: 'mean', penalty: 'bic' });
 * ```
 */
export function breaksFromCells(y: readonly Cell[], x: readonly Cell[] | null | undefined, w: readonly Cell[] | null | undefined, options: BreaksOptions): SeriesBreaks {
  const series = prepareSeries(y, x, w, { ties: 'keep', minPoints: 2, method: 'changepoints' });
  return { series, result: findBreaks(series, options) };
}
