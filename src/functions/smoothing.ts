/**
 * Worksheet functions of the smoothing family (namespace KNOTWISE). Each takes
 * y first, x optional, then the method and its settings, and shares one
 * computation with the others called on the same range and settings. They
 * return promises: Excel shows #BUSY! while the engine works off Excel's thread,
 * and cancels the call when an input changes.
 */
import { AnalysisResult, DEFAULT_SMOOTHER, KnotwiseError, evaluateAnalysis, toRows } from '../engine';
import { Matrix, cellNumber, omitted, optionalText, readColumn, scalar, shapeLike } from './cells';
import { guardedAsync } from './excelErrors';
import { analyseCells } from './request';

const smoothOf = (r: AnalysisResult) => r.smooth!;

/**
 * Smoothed values of a series, one per input row (rows that were not numbers stay empty).
 * @customfunction SMOOTH
 * @param y Values to smooth: one column (or one row). Blank, text, TRUE/FALSE and error cells are left out and reported by SUMMARY.
 * @param [x] Positions of the values (dates, times, any numbers), same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "auto" (default: every method compared by cross-validation, the best kept; SUMMARY says why), "spline" (a smooth curve), "trend" (pieces joined at knots the data choose), "mixed", "whittaker" (Hodrick-Prescott and relatives), "loess" or "wavelet". KNOTWISE.OPTIONS() lists them, KNOTWISE.OPTIONS(method) each one's settings.
 * @param [settings] Settings as text, e.g. "order=2; cv; folds=10", "df=8" or "penalty=500"; a number alone is the penalty.
 * @param [weights] Positive weights, same size as y (e.g. the number of orders behind each value).
 * @param [output] "fitted" (default), "se" (pointwise standard error), "residual" or "leverage".
 * @param invocation Excel's handle to cancel the call.
 * @returns One value per row of y, in the rows' original order.
 * @cancelable
 */
export async function smooth(y: any[][], x?: any[][], method?: string, settings?: any, weights?: any[][], output?: string, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const what = (optionalText(output) ?? 'fitted').trim().toLowerCase();
    if (!['fitted', 'se', 'residual', 'leverage'].includes(what)) throw new KnotwiseError('bad-option', `output must be "fitted", "se", "residual" or "leverage"; got "${what}".`);
    const { result, orientation } = await analyseCells(y, { x, method, settings, weights }, 'smoother', DEFAULT_SMOOTHER, invocation);
    const fit = smoothOf(result);
    let perPoint: ArrayLike<number> = fit.fitted;
    if (what === 'residual') perPoint = Float64Array.from(result.series.y, (v, i) => v - fit.fitted[i]);
    else if (what === 'se' || what === 'leverage') {
      const v = what === 'se' ? fit.se : fit.leverage;
      if (!v) throw new KnotwiseError('bad-option', `output "${what}" is not available for method "${result.analysis}": it is not a linear smoother.`);
      perPoint = v;
    }
    return shapeLike(toRows(result.series, perPoint, '' as const).map((v) => (typeof v === 'number' ? cellNumber(v) : v)), orientation);
  });
}

/**
 * The penalty lambda chosen for a series, or the whole criterion table behind the choice.
 * @customfunction PENALTY
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "auto" (default: the method the automatic choice keeps), "spline", "trend" or any smoothing method of KNOTWISE.OPTIONS().
 * @param [settings] Settings as text, e.g. "cv; folds=10" or "order=1; sure".
 * @param [weights] Positive weights, same size as y.
 * @param [table] TRUE: the table penalty, score, df, se, knots, converged for every penalty tried (with a header row).
 * @param invocation Excel's handle to cancel the call.
 * @returns The chosen lambda, or the criterion table.
 * @cancelable
 */
export async function penalty(y: any[][], x?: any[][], method?: string, settings?: any, weights?: any[][], table?: any, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await analyseCells(y, { x, method, settings, weights }, 'smoother', DEFAULT_SMOOTHER, invocation);
    const fit = smoothOf(result);
    const t = scalar(table);
    const wantTable = t === true || (typeof t === 'string' && t.trim().toUpperCase() === 'TRUE') || t === 1;
    if (!omitted(t) && !wantTable && !(t === false || t === 0 || (typeof t === 'string' && t.trim().toUpperCase() === 'FALSE'))) {
      throw new KnotwiseError('bad-option', `table must be TRUE or FALSE; got ${JSON.stringify(t)}.`);
    }
    if (!wantTable) return [[cellNumber(fit.penalty)]];
    const head = ['penalty', `score (${fit.criterion.name})`, 'df', 'se', 'knots', 'converged'];
    const pts = fit.criterion.curve ?? [{ penalty: fit.penalty, score: fit.criterion.value, df: fit.df }];
    return [head, ...pts.map((p) => [cellNumber(p.penalty), cellNumber(p.score), cellNumber(p.df), p.se === undefined ? '' : cellNumber(p.se), p.knots === undefined ? '' : p.knots, p.converged === undefined ? '' : p.converged])];
  });
}

/**
 * A two-column summary of a fit or a segmentation: method, penalty, df, points used and dropped, every warning, and what to read with care (ends get revised, a break is not its cause).
 * @customfunction SUMMARY
 * @param y Values: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] A smoothing method ("auto", the default, "spline", "trend", ...) or a changepoint model ("level", "volatility", "counts", "distribution", "slope").
 * @param [settings] Settings as text, e.g. "order=1; cv" or "mbic; shortest-segment=4".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns Label and value pairs, then one row per warning.
 * @cancelable
 */
export async function summary(y: any[][], x?: any[][], method?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await analyseCells(y, { x, method, settings, weights }, undefined, DEFAULT_SMOOTHER, invocation);
    const s = result.series;
    const order = (o: { order?: unknown }) => (o.order !== undefined ? ` (order ${o.order})` : '');
    // the automatic choice names what it kept
    const kept = result.smooth && result.smooth.method !== result.analysis ? `: ${result.smooth.method}${order(result.smooth.options)}` : '';
    const rows: any[][] = [['method', result.analysis + order(result.options) + kept]];
    if (result.smooth) {
      const f = result.smooth;
      rows.push(['lambda', cellNumber(f.penalty)], ['df', cellNumber(f.df)], ['sigma', cellNumber(f.sigma)], ['criterion', f.criterion.name], ['criterion value', cellNumber(f.criterion.value)], ['knots', f.knots.length]);
    } else if (result.breaks) {
      const b = result.breaks;
      rows.push(['penalty', `${b.penalty.rule} ${b.penalty.value}`], ['breaks', b.breaks.length], ['segments', b.segments.length]);
    }
    if (result.comparison) rows.push(['why this method', result.comparison.reason]);
    rows.push(['n used', s.nUsed], ['n dropped', s.dropped.length], ['ties merged', s.tiesMerged], ['converged', result.solver.converged], ['warnings', result.warnings.length]);
    result.warnings.forEach((w, i) => rows.push([`warning ${i + 1} (${w.code})`, w.message]));
    result.caveats.forEach((w) => rows.push([`read with care (${w.code})`, w.message]));
    return rows;
  });
}

/**
 * The knots of a fit: where the fitted curve changes form. Neighbouring knots of one bend are merged and each bend's change is measured on the unshrunk refit, ranked by size; "all" lists every knot of the fit.
 * @customfunction KNOTS
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "trend" (default here) or "spline" (which has no data-chosen knots).
 * @param [settings] Settings as text, e.g. "order=1" (slope changes, default), "order=0" (jumps), "df=12" or "cv; folds=10".
 * @param [weights] Positive weights, same size as y.
 * @param [detail] "bends" (default: merged, sized on the refit, ranked) or "all" (every knot of the fit with its shrunk change).
 * @param invocation Excel's handle to cancel the call.
 * @returns A table with a header row: x, row, change, from, to, knots merged, rank (or x, row, change for "all"); row counts from the first cell of y (1 = first cell).
 * @cancelable
 */
export async function knots(y: any[][], x?: any[][], method?: string, settings?: any, weights?: any[][], detail?: string, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const what = (optionalText(detail) ?? 'bends').trim().toLowerCase();
    if (what !== 'bends' && what !== 'all') throw new KnotwiseError('bad-option', `detail must be "bends" or "all"; got "${what}".`);
    const { result } = await analyseCells(y, { x, method, settings, weights }, 'smoother', 'trend', invocation);
    const fit = smoothOf(result);
    if (what === 'all' || !fit.bends) return [['x', 'row', 'change'], ...fit.knots.map((k) => [k.x, k.row + 1, cellNumber(k.change)])];
    return [['x', 'row', 'change', 'from', 'to', 'knots merged', 'rank'], ...fit.bends.map((b) => [b.x, b.row + 1, cellNumber(Number.isFinite(b.change) ? b.change : b.shrunkChange), b.xFrom, b.xTo, b.knots, b.rank])];
  });
}

/**
 * The fitted curve at new positions, each flagged when it lies outside the data (an extrapolation, not a forecast).
 * @customfunction EVALUATE
 * @param y Values to smooth: one column (or one row).
 * @param at Positions where the fitted curve is wanted: one column or row.
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [method] "auto" (default: the method the automatic choice keeps), "spline", "trend" or any smoothing method of KNOTWISE.OPTIONS().
 * @param [settings] Settings as text, e.g. "order=1; cv".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns Two columns per position: the value, and TRUE where it is extrapolated beyond the data.
 * @cancelable
 */
export async function evaluateAt(y: any[][], at: any[][], x?: any[][], method?: string, settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const cells = readColumn(at as Matrix, 'at').cells;
    const { result } = await analyseCells(y, { x, method, settings, weights }, 'smoother', DEFAULT_SMOOTHER, invocation);
    const ok: number[] = [];
    const where: number[] = [];
    cells.forEach((c, i) => { if (typeof c === 'number' && Number.isFinite(c)) { ok.push(c); where.push(i); } });
    const ev = evaluateAnalysis(result, ok);
    const out: any[][] = cells.map(() => ['', '']);
    where.forEach((i, k) => { out[i] = [cellNumber(ev.value[k]), ev.extrapolated[k] === 1]; });
    return out;
  });
}

/**
 * Every smoothing method and order compared on the series by cross-validation on the same held-out points: the table behind the automatic choice, the chosen one marked, and why.
 * @customfunction COMPARE
 * @param y Values to smooth: one column (or one row).
 * @param [x] Positions of the values, same size as y. Omitted: 1, 2, 3, ...
 * @param [settings] Settings of the automatic choice, e.g. "cv" (the lowest error outright) or "folds=10".
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns A header row (method, df, CV error, se, milliseconds, chosen), one row per method, then a row with the reason for the choice.
 * @cancelable
 */
export async function compare(y: any[][], x?: any[][], settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await analyseCells(y, { x, method: 'auto', settings, weights }, 'smoother', 'auto', invocation);
    const c = result.comparison;
    if (!c) throw new KnotwiseError('bad-data', result.uncompared ?? 'no methods were compared.');
    const rows = c.rows.map((r, i) => [r.label, cellNumber(r.df), cellNumber(r.cv), cellNumber(r.se), r.milliseconds, i === c.chosen ? 'chosen' : r.skipped ? `not compared: ${r.skipped}` : '']);
    return [['method', 'df', 'CV error', 'se', 'milliseconds', 'chosen'], ...rows, [c.reason, '', '', '', '', '']];
  });
}
