/**
 * Worksheet functions of the changepoint family (namespace KNOTWISE). They
 * share one cached segmentation when called on the same range and options.
 */
import { BreaksOptions } from '../engine/breaks/types';
import { SeriesBreaks, toRows } from '../engine';
import { Matrix, Orientation, cellNumber, optionalNumber, optionalText, readInputs, shapeLike } from './cells';
import { CancelableCall, cancelableCompute, guardedAsync } from './async';

async function segment(y: Matrix, x: unknown, model: unknown, penalty: unknown, minSegment: unknown, weights: unknown, crops?: [unknown, unknown], invocation?: CancelableCall): Promise<SeriesBreaks & { orientation: Orientation }> {
  const d = readInputs(y, x, weights);
  const options = { model: (optionalText(model) ?? 'mean').trim().toLowerCase() } as BreaksOptions;
  const p = optionalNumber(penalty);
  if (p !== undefined) options.penalty = (typeof p === 'string' ? (p as string).trim().toLowerCase() : p) as BreaksOptions['penalty'];
  const m = optionalNumber(minSegment);
  if (m !== undefined) options.minSegment = m;
  if (crops) options.crops = [optionalNumber(crops[0]) as number, optionalNumber(crops[1]) as number];
  const out = await cancelableCompute(invocation, { analysis: 'breaks', y: d.y, x: d.x, w: d.w, options: options as unknown as Record<string, unknown> });
  if (out.kind !== 'breaks') throw new Error(`expected a segmentation, got ${out.kind}.`);
  return { series: out.series, result: out.result, orientation: d.orientation };
}

const blank = (v: number) => (Number.isFinite(v) ? v : '');

/**
 * The changepoints of a series: where its level, volatility, rate or slope changes.
 * @customfunction BREAKS
 * @param y Values: one column (or one row). Blank, text, TRUE/FALSE and error cells are left out.
 * @param [x] Positions of the values (dates, times, numbers), same size as y. Omitted: 1, 2, 3, ...
 * @param [model] What changes: "mean" (default), "meanvar" (level and volatility), "poisson" (rate of counts), "distribution" (any change in distribution) or "slope" (a continuous broken line).
 * @param [penalty] Cost of each change: "bic" (default), "mbic", or a number (larger = fewer breaks).
 * @param [minSegment] Fewest points in a segment.
 * @param [weights] Positive weights, same size as y.
 * @returns A table with header x, row, change, mean before, mean after (rate, sd or slope for those models): one line per break; row is the position within the y range.
 */
export async function breaks(y: any[][], x?: any[][], model?: string, penalty?: any, minSegment?: number, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await segment(y, x, model, penalty, minSegment, weights, undefined, invocation);
    const field = result.model === 'poisson' ? 'rate' : result.model === 'slope' ? 'slope' : result.model === 'meanvar' ? 'sd' : result.model === 'distribution' ? 'median' : 'mean';
    const head = ['x', 'row', 'change', `${field} before`, `${field} after`];
    return [head, ...result.breaks.map((b) => [b.x, b.row + 1, blank(b.change), blank(b.before[field]), blank(b.after[field])])];
  });
}

/**
 * The segmented fit, one value per input row: the step function (or broken line for "slope").
 * @customfunction SEGMENTS
 * @param y Values: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [model] "mean" (default), "meanvar", "poisson", "distribution" or "slope".
 * @param [penalty] "bic" (default), "mbic", or a number.
 * @param [minSegment] Fewest points in a segment.
 * @param [weights] Positive weights, same size as y.
 * @returns One value per row of y, in the rows' original order; dropped rows stay empty.
 */
export async function segments(y: any[][], x?: any[][], model?: string, penalty?: any, minSegment?: number, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { series, result, orientation } = await segment(y, x, model, penalty, minSegment, weights, undefined, invocation);
    return shapeLike(toRows(series, result.fitted, '' as const).map((v) => (typeof v === 'number' ? cellNumber(v) : v)), orientation);
  });
}

/**
 * Every optimal segmentation for penalties between low and high (CROPS): number of changes against cost, to pick the elbow.
 * @customfunction BREAKPATH
 * @param y Values: one column (or one row).
 * @param low Smallest penalty.
 * @param high Largest penalty.
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [model] "mean" (default), "meanvar", "poisson", "distribution" or "slope".
 * @param [minSegment] Fewest points in a segment.
 * @param [weights] Positive weights, same size as y.
 * @returns A table with header penalty from, penalty to, changes, cost: one line per segmentation, in increasing penalty.
 */
export async function breakPath(y: any[][], low: number, high: number, x?: any[][], model?: string, minSegment?: number, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await segment(y, x, model, undefined, minSegment, weights, [low, high], invocation);
    const rows = (result.crops ?? []).map((c) => [blank(c.penaltyLow), blank(c.penaltyHigh), c.changes, blank(c.cost)]);
    return [['penalty from', 'penalty to', 'changes', 'cost'], ...rows];
  });
}
