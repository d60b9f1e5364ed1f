/**
 * Worksheet functions of the smoothing family (namespace KNOTWISE). Each takes
 * y first, x optional, then the method and its options, and shares one cached
 * fit with the others when called on the same range and options.
 */
import { KnotwiseError, evaluate, toRows } from '../engine';
import { Matrix, cellNumber, omitted, optionalText, readColumn, scalar, shapeLike } from './cells';
import { guardedAsync } from './async';
import { fitFromCells } from './fitArgs';

/**
 * Smoothed values of a series, one per input row (dropped rows stay empty).
 * @customfunction SMOOTH
 * @param y Values to smooth: one column (or one row). Blank, text, TRUE/FALSE and error cells are left out and reported.
 * @param [x] Positions of the values (dates, times, any numbers), same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "spline" (default: natural cubic smoothing spline) or "trend" (L1 trend filtering, knots chosen by the data).
 * @param [order] Trend filtering order: 0 level shifts, 1 kinks (default), 2 or 3 smooth bends.
 * @param [rule] How to choose the penalty: "gcv" (spline default), "cv" (trend default), "cv-1se", "sure" or "bic" (trend); or settings such as "df=8", "penalty=500" or "cv; folds=10".
 * @param [penalty] A fixed penalty lambda instead of a rule (units: see the README).
 * @param [df] A target equivalent degrees of freedom instead of a rule.
 * @param [weights] Positive weights, same size as y (e.g. number of orders behind each value).
 * @param [folds] Number of cross-validation folds for rule "cv".
 * @param [relaxed] Trend filtering only: 0 plain fit (default), 1 unpenalised refit on the knots, or a mix in between.
 * @param [output] "fitted" (default), "se" (pointwise standard error), "residual" or "leverage".
 * @returns One value per row of y, in the rows' original order.
 */
export async function smooth(y: any[][], x?: any[][], method?: string, order?: number, rule?: string, penalty?: number, df?: number, weights?: any[][], folds?: number, relaxed?: number, output?: string, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { series, result, orientation } = await fitFromCells(y, x, { method, order, rule, penalty, df, weights, folds, relaxed }, invocation);
    const what = (optionalText(output) ?? 'fitted').trim().toLowerCase();
    let perPoint: ArrayLike<number>;
    if (what === 'fitted') perPoint = result.fitted;
    else if (what === 'residual') perPoint = Float64Array.from(series.y, (v, i) => v - result.fitted[i]);
    else if (what === 'se' || what === 'leverage') {
      const v = what === 'se' ? result.se : result.leverage;
      if (!v) throw new KnotwiseError('bad-option', `output "${what}" is not available for method "${result.method}": it is not a linear smoother.`);
      perPoint = v;
    } else throw new KnotwiseError('bad-option', `output must be "fitted", "se", "residual" or "leverage"; got "${what}".`);
    const rows = toRows(series, perPoint, '' as const).map((v) => (typeof v === 'number' ? cellNumber(v) : v));
    return shapeLike(rows, orientation);
  });
}

/**
 * The penalty lambda chosen for a series, or the whole criterion curve as a table.
 * @customfunction PENALTY
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "spline" (default) or "trend".
 * @param [order] Trend filtering order 0 to 3 (default 1).
 * @param [rule] "gcv", "cv", "cv-1se", "sure" or "bic"; or settings such as "df=8" or "cv; folds=10".
 * @param [penalty] A fixed penalty (returned as given, with its df in the curve).
 * @param [df] A target equivalent degrees of freedom.
 * @param [weights] Positive weights, same size as y.
 * @param [folds] Number of cross-validation folds for rule "cv".
 * @param [relaxed] Trend filtering only: 0 to 1.
 * @param [curve] TRUE: return the table penalty, score, df, se, knots, converged for every penalty tried (with a header row).
 * @returns The chosen lambda, or the criterion table.
 */
export async function penalty(y: any[][], x?: any[][], method?: string, order?: number, rule?: string, penalty?: number, df?: number, weights?: any[][], folds?: number, relaxed?: number, curve?: boolean, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await fitFromCells(y, x, { method, order, rule, penalty, df, weights, folds, relaxed }, invocation);
    if (scalar(curve) !== true) return [[result.penalty]];
    const head = ['penalty', `score (${result.criterion.name})`, 'df', 'se', 'knots', 'converged'];
    const pts = result.criterion.curve ?? [{ penalty: result.penalty, score: result.criterion.value, df: result.df }];
    return [head, ...pts.map((p) => [cellNumber(p.penalty), cellNumber(p.score), cellNumber(p.df), p.se === undefined ? '' : cellNumber(p.se), p.knots === undefined ? '' : p.knots, p.converged === undefined ? '' : p.converged])];
  });
}

/**
 * A two-column summary of a fit: method, lambda, df, sigma, points used and dropped, ties merged, warnings.
 * @customfunction SUMMARY
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "spline" (default) or "trend".
 * @param [order] Trend filtering order 0 to 3 (default 1).
 * @param [rule] "gcv", "cv", "cv-1se", "sure" or "bic"; or settings such as "df=8" or "cv; folds=10".
 * @param [penalty] A fixed penalty lambda.
 * @param [df] A target equivalent degrees of freedom.
 * @param [weights] Positive weights, same size as y.
 * @param [folds] Number of cross-validation folds for rule "cv".
 * @param [relaxed] Trend filtering only: 0 to 1.
 * @returns Label and value pairs, then one row per warning.
 */
export async function summary(y: any[][], x?: any[][], method?: string, order?: number, rule?: string, penalty?: number, df?: number, weights?: any[][], folds?: number, relaxed?: number, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { series, result } = await fitFromCells(y, x, { method, order, rule, penalty, df, weights, folds, relaxed }, invocation);
    const rows: any[][] = [
      ['method', result.method + (result.options.order !== undefined ? ` (order ${result.options.order})` : '')],
      ['lambda', cellNumber(result.penalty)],
      ['df', cellNumber(result.df)],
      ['sigma', cellNumber(result.sigma)],
      ['criterion', result.criterion.name],
      ['criterion value', cellNumber(result.criterion.value)],
      ['n used', series.nUsed],
      ['n dropped', series.dropped.length],
      ['ties merged', series.tiesMerged],
      ['knots', result.knots.length],
      ['converged', result.solver.converged],
      ['warnings', result.warnings.length],
    ];
    result.warnings.forEach((w, i) => rows.push([`warning ${i + 1} (${w.code})`, w.message]));
    return rows;
  });
}

/**
 * The knots of a fit: where the fitted curve changes form, with the size of the change.
 * @customfunction KNOTS
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "trend" (default here) or "spline" (which has no data-chosen knots).
 * @param [order] Trend filtering order: 0 jumps, 1 slope changes (default), 2 or 3 changes in curvature.
 * @param [rule] "cv" (default), "cv-1se", "sure" or "bic"; or settings such as "df=12" or "cv; folds=10".
 * @param [penalty] A fixed penalty lambda.
 * @param [df] A target equivalent degrees of freedom.
 * @param [weights] Positive weights, same size as y.
 * @param [folds] Number of cross-validation folds for rule "cv".
 * @param [relaxed] 0 plain fit (default) to 1 unpenalised refit on the knots.
 * @returns A table with header x, row, change: one line per knot; row is the position within the y range (1 = first cell).
 */
export async function knots(y: any[][], x?: any[][], method?: string, order?: number, rule?: string, penalty?: number, df?: number, weights?: any[][], folds?: number, relaxed?: number, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const m = omitted(method) ? 'trend' : method;
    const { result } = await fitFromCells(y, x, { method: m, order, rule, penalty, df, weights, folds, relaxed }, invocation);
    return [['x', 'row', 'change'], ...result.knots.map((k) => [k.x, k.row + 1, cellNumber(k.change)])];
  });
}

/**
 * The fitted curve at new positions, each flagged when it lies outside the data (an extrapolation, not a forecast).
 * @customfunction EVALUATE
 * @param y Values to smooth: one column (or one row).
 * @param at Positions where the fitted curve is wanted: one column or row.
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "spline" (default) or "trend".
 * @param [order] Trend filtering order 0 to 3 (default 1).
 * @param [rule] "gcv", "cv", "cv-1se", "sure" or "bic"; or settings such as "df=8" or "cv; folds=10".
 * @param [penalty] A fixed penalty lambda.
 * @param [df] A target equivalent degrees of freedom.
 * @param [weights] Positive weights, same size as y.
 * @param [folds] Number of cross-validation folds for rule "cv".
 * @param [relaxed] Trend filtering only: 0 to 1.
 * @returns Two columns per position: the value, and TRUE where it is extrapolated beyond the data.
 */
export async function evaluateAt(y: any[][], at: any[][], x?: any[][], method?: string, order?: number, rule?: string, penalty?: number, df?: number, weights?: any[][], folds?: number, relaxed?: number, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await fitFromCells(y, x, { method, order, rule, penalty, df, weights, folds, relaxed }, invocation);
    const cells = readColumn(at as Matrix, 'at').cells;
    const ok: number[] = [];
    const where: number[] = [];
    cells.forEach((c, i) => { if (typeof c === 'number' && Number.isFinite(c)) { ok.push(c); where.push(i); } });
    const ev = evaluate(result, ok);
    const out: any[][] = cells.map(() => ['', '']);
    where.forEach((i, k) => { out[i] = [cellNumber(ev.value[k]), ev.extrapolated[k] === 1]; });
    return out;
  });
}
