/**
 * Worksheet functions of the changepoint family (namespace KNOTWISE). They
 * share one computation when called on the same range, model and settings.
 */
import { AnalysisResult, SegmentSummary, toRows } from '../engine';
import { cellNumber, required, shapeLike } from './cells';
import { guardedAsync } from './excelErrors';
import { analyseCells } from './request';

const blank = cellNumber;

/** The segment summaries each model is about, as columns of the breaks table. */
function summaryFields(model: string): (keyof SegmentSummary)[] {
  switch (model) {
    case 'counts': return ['rate'];
    case 'slope': return ['slope'];
    case 'volatility': return ['mean', 'sd'];
    case 'distribution': return ['median'];
    default: return ['mean'];
  }
}

/**
 * The changepoints of a series: where its level, volatility, rate or slope changes.
 * @customfunction BREAKS
 * @param y Values: one column (or one row). Blank, text, TRUE/FALSE and error cells are left out (SUMMARY lists them).
 * @param [x] Positions of the values (dates, times, numbers), same size as y. Omitted: 1, 2, 3, ...
 * @param [model] What changes: "level" (default), "volatility" (level and volatility), "counts" (rate of counts), "distribution" (any change in distribution) or "slope" (a continuous broken line). KNOTWISE.OPTIONS(model) lists its settings.
 * @param [settings] Settings as text, e.g. "mbic", "penalty=20" or "shortest-segment=4"; a number alone is the cost of each change (larger = fewer breaks).
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns A table with header x, row, change, then the segment summaries before and after (mean, sd, rate or slope as the model is about): one line per break; row counts from the first cell of y.
 * @cancelable
 */
export async function breaks(y: any[][], x?: any[][], model?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await analyseCells(y, { x, method: model, settings, weights }, 'changepoints', 'level', invocation);
    const fields = summaryFields(result.analysis);
    const head = ['x', 'row', 'change', ...fields.flatMap((f) => [`${f} before`, `${f} after`])];
    return [head, ...result.breaks!.breaks.map((b) => [b.x, b.row + 1, blank(b.change), ...fields.flatMap((f) => [blank(b.before[f] as number), blank(b.after[f] as number)])])];
  });
}

/**
 * The segmented fit, one value per input row: the step function (or broken line for "slope").
 * @customfunction SEGMENTS
 * @param y Values: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [model] "level" (default), "volatility", "counts", "distribution" or "slope".
 * @param [settings] Settings as text, e.g. "mbic" or "penalty=20; shortest-segment=4".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns One value per row of y, in the rows' original order; rows that were not numbers stay empty.
 * @cancelable
 */
export async function segments(y: any[][], x?: any[][], model?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result, orientation } = await analyseCells(y, { x, method: model, settings, weights }, 'changepoints', 'level', invocation);
    return shapeLike(toRows(result.series, result.fitted, '' as const).map((v) => (typeof v === 'number' ? cellNumber(v) : v)), orientation);
  });
}

function scanTable(result: AnalysisResult): any[][] {
  const rows = (result.breaks!.crops ?? []).map((c) => [blank(c.penaltyLow), blank(c.penaltyHigh), c.changes, blank(c.cost)]);
  return [['penalty from', 'penalty to', 'changes', 'cost'], ...rows];
}

/**
 * Every optimal segmentation for penalties between low and high (CROPS): number of changes against cost, to pick the elbow.
 * @customfunction BREAKSCAN
 * @param y Values: one column (or one row).
 * @param low Smallest penalty.
 * @param high Largest penalty.
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [model] "level" (default), "volatility", "counts", "distribution" or "slope".
 * @param [settings] Settings as text, e.g. "shortest-segment=4".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns A table with header penalty from, penalty to, changes, cost: one line per segmentation, in increasing penalty.
 * @cancelable
 */
export async function breakScan(y: any[][], low: any, high: any, x?: any[][], model?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const range = [required(low, 'low (the smallest penalty of the scan)'), required(high, 'high (the largest penalty of the scan)')];
    const { result } = await analyseCells(y, { x, method: model, settings, weights, extra: { penaltyRange: range } }, 'changepoints', 'level', invocation);
    return scanTable(result);
  });
}

/**
 * Old name of BREAKSCAN, kept for workbooks written with it: every optimal segmentation for penalties between low and high.
 * @customfunction BREAKPATH
 * @param y Values: one column (or one row).
 * @param low Smallest penalty.
 * @param high Largest penalty.
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [model] "level" (default), "volatility", "counts", "distribution" or "slope".
 * @param [settings] Settings as text, e.g. "shortest-segment=4".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns The same table as BREAKSCAN.
 * @cancelable
 */
export async function breakPath(y: any[][], low: any, high: any, x?: any[][], model?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return breakScan(y, low, high, x, model, settings, weights, invocation);
}
