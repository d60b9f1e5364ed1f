/**
 * Data intake shared by every method: raw worksheet-like values in, a clean
 * series plus a record of what was done out.
 *
 * Lenient with data, strict with shapes: cells that are not finite numbers are
 * dropped pairwise (the row leaves y, x and weights together) and reported with
 * their row positions; they are never coerced. Text that looks like a number is
 * dropped too, with its own note, because a number stored as text usually means
 * an import went wrong and the analyst should know.
 */
import { KnotwiseError, showNumber } from './errors';
import { Warning, warning, listRows } from './warnings';
import { numberFromText } from './numberText';

/** An error cell as the fronts pass it on (Excel's #N/A, #DIV/0! ...). */
export interface CellError {
  error: string;
}

/** One raw cell: what a worksheet range or a CSV field can hold. */
export type Cell = number | string | boolean | null | undefined | CellError;

/** Why a row was left out. */
export type DropReason = 'blank' | 'text' | 'numeric-text' | 'boolean' | 'error' | 'non-finite' | 'zero-weight';

/** A row left out of the fit, 0-based within the input range. */
export interface DroppedRow {
  row: number;
  column: 'y' | 'x' | 'weights';
  reason: DropReason;
  /** The offending value as text, for messages. */
  value: string;
}

/** What to do with rows that share an x value. */
export type TiePolicy = 'merge' | 'keep';

/** Options of {@link prepareSeries}. */
export interface SeriesOptions {
  /** `'merge'` (default): rows with equal x become one point, weights added and y weight-averaged. `'keep'`: ties stay as separate points in input order (segmentation methods). */
  ties?: TiePolicy;
  /** Fewest distinct usable points the caller's method needs (default 2). */
  minPoints?: number;
  /** Name of the method, for messages. */
  method?: string;
}

/** A clean series: sorted by x, finite, positive weights. */
export interface Series {
  /** Distinct x values in increasing order (or non-decreasing with `ties: 'keep'`). */
  x: Float64Array;
  /** y at each point (weighted mean of merged rows). */
  y: Float64Array;
  /** Weight of each point (sum of merged rows' weights). */
  w: Float64Array;
  /** Number of clean points. */
  n: number;
  /** Number of input rows. */
  nRows: number;
  /** Number of input rows used (before merging). */
  nUsed: number;
  /** For each input row: index of its clean point, or -1 when the row was dropped. */
  rowOf: Int32Array;
  /** For each clean point: the first input row (0-based) that formed it. */
  firstRow: Int32Array;
  /** Rows left out, with reasons. */
  dropped: DroppedRow[];
  /** Rows absorbed into another row's point by tie merging. */
  tiesMerged: number;
  /**
   * Weighted scatter of y within merged tie groups, sum_g sum_{i in g} w_i (y_i - ybar_g)^2
   * (0 without ties): what the merged points no longer show, which criteria on the
   * original observations (GCV) add back. Accumulated by West's weighted update (1979).
   */
  withinTies: number;
  /** Whether usable rows were already in increasing x order. */
  inputSorted: boolean;
  /** Whether x came from the input (false: x = 1..nRows, the row positions). */
  xGiven: boolean;
  /** Whether weights came from the input. */
  weighted: boolean;
  /** Notes about the intake, for the result's warnings. */
  warnings: Warning[];
}

/**
 * Flattens a single row or single column of cells. A 2-D block with more than
 * one row and more than one column is refused, since it is ambiguous which way
 * the series runs.
 */
export function toColumn(values: readonly Cell[] | readonly (readonly Cell[])[], name: string): Cell[] {
  if (values.length === 0) return [];
  if (!Array.isArray(values[0])) return (values as readonly Cell[]).slice();
  const rows = values as readonly (readonly Cell[])[];
  const nr = rows.length;
  const nc = rows[0].length;
  for (let i = 1; i < nr; i++) {
    if (rows[i].length !== nc) throw new KnotwiseError('shape-mismatch', `${name} has rows of different lengths (${nc} and ${rows[i].length}).`);
  }
  if (nc === 1) return rows.map((r) => r[0]);
  if (nr === 1) return rows[0].slice();
  throw new KnotwiseError('shape-mismatch', `${name} must be a single column or a single row; got ${nr} rows by ${nc} columns.`);
}

function classify(v: Cell): { ok: true; value: number } | { ok: false; reason: DropReason; text: string } {
  if (typeof v === 'number') {
    return Number.isFinite(v) ? { ok: true, value: v } : { ok: false, reason: 'non-finite', text: showNumber(v) };
  }
  if (v === null || v === undefined) return { ok: false, reason: 'blank', text: '' };
  if (typeof v === 'string') {
    if (v.trim() === '') return { ok: false, reason: 'blank', text: '' };
    const t = v.trim();
    if (numberFromText(t) !== undefined) return { ok: false, reason: 'numeric-text', text: t };
    return { ok: false, reason: 'text', text: t.length > 20 ? t.slice(0, 20) + '...' : t };
  }
  if (typeof v === 'boolean') return { ok: false, reason: 'boolean', text: v ? 'TRUE' : 'FALSE' };
  if (typeof v === 'object' && v !== null && 'error' in v) return { ok: false, reason: 'error', text: String(v.error) };
  return { ok: false, reason: 'text', text: String(v) };
}

const REASON_TEXT: Record<DropReason, string> = {
  blank: 'blank',
  text: 'text',
  'numeric-text': 'a number stored as text (convert it to a number to use it)',
  boolean: 'TRUE/FALSE',
  error: 'an error value',
  'non-finite': 'not finite',
  'zero-weight': 'weight 0',
};

/** Largest |y| accepted: squared errors of larger values overflow the doubles (1e150^2 * n stays below 1.8e308). */
export const Y_LIMIT = 1e150;
/** Largest |x| accepted: penalties carry powers of x up to the fourth (lambda of the spline is in units of x^3). */
export const X_LIMIT = 1e75;
/** Largest ratio of the largest weight to the smallest: beyond it the light rows carry no information next to the heavy ones. */
export const WEIGHT_RATIO_LIMIT = 1e15;

/**
 * Refuses magnitudes whose squares or powers leave the double range, so that
 * every result is the same fit scaled (fit(c y) = c fit(y)) for every value
 * accepted, or a clear refusal that says what to do.
 */
function checkMagnitudes(x: number[], y: number[], w: number[], rows: number[], xGiven: boolean, wGiven: boolean): void {
  const at = (arr: number[], pick: (a: number, b: number) => boolean) => { let j = 0; for (let i = 1; i < arr.length; i++) if (pick(Math.abs(arr[i]), Math.abs(arr[j]))) j = i; return j; };
  if (y.length === 0) return;
  const big = at(y, (a, b) => a > b);
  if (Math.abs(y[big]) > Y_LIMIT) {
    throw new KnotwiseError('bad-data', `y in row ${rows[big] + 1} is ${showNumber(y[big])}: values beyond ${showNumber(Y_LIMIT)} in size cannot be analysed without overflow. Divide the column by a power of ten (e.g. 1e150) and scale the results back, or remove the value if it is an error.`);
  }
  if (Math.abs(y[big]) > 0 && Math.abs(y[big]) < 1 / Y_LIMIT) {
    throw new KnotwiseError('bad-data', `the largest y is ${showNumber(y[big])} (row ${rows[big] + 1}): values all below ${showNumber(1 / Y_LIMIT)} in size underflow in squared errors. Multiply the column by a power of ten (e.g. 1e150) and scale the results back.`);
  }
  if (xGiven) {
    const bx = at(x, (a, b) => a > b);
    if (Math.abs(x[bx]) > X_LIMIT) throw new KnotwiseError('bad-data', `x in row ${rows[bx] + 1} is ${showNumber(x[bx])}: positions beyond ${showNumber(X_LIMIT)} in size overflow the penalties' units. Subtract an origin or divide x by a power of ten.`);
    let lo = Infinity, hi = -Infinity;
    for (const v of x) { if (v < lo) lo = v; if (v > hi) hi = v; }
    if (hi > lo && hi - lo < 1 / X_LIMIT) throw new KnotwiseError('bad-data', `x spans only ${showNumber(hi - lo)}: positions this close underflow the penalties' units. Multiply x by a power of ten.`);
  }
  if (wGiven) {
    const hw = at(w, (a, b) => a > b), lw = at(w, (a, b) => a < b);
    if (w[hw] / w[lw] > WEIGHT_RATIO_LIMIT) {
      throw new KnotwiseError('bad-data', `weights range from ${showNumber(w[lw])} (row ${rows[lw] + 1}) to ${showNumber(w[hw])} (row ${rows[hw] + 1}), a ratio above ${showNumber(WEIGHT_RATIO_LIMIT)}: the lightest rows carry no information next to the heaviest. Give those rows weight 0 (they are then left out) or weights within a ratio of ${showNumber(WEIGHT_RATIO_LIMIT)}.`);
    }
  }
}

/**
 * Turns raw y, optional x and optional weights into a clean {@link Series}.
 *
 * - x omitted: x = 1..nRows (row positions, so a dropped row keeps its gap).
 * - Any row whose y, x or weight cell is not a finite number is dropped from all three and reported.
 * - A row with weight 0 is dropped with its own reason; a negative weight is an error.
 * - Usable rows are sorted by x (stable); `rowOf` maps every input row back to its point.
 * - Rows with exactly equal x are merged (`ties: 'merge'`): weights add, y is the weighted mean.
 * - Magnitudes the doubles cannot carry through squares and penalties are refused with a
 *   message saying how to rescale: |y| above 1e150 (or all below 1e-150), |x| above 1e75,
 *   x spanning less than 1e-75, weights spread by more than a factor 1e15.
 *
 * @param yCells - the series values, one per row
 * @param xCells - the positions (same length as y), or omitted
 * @param wCells - positive weights (same length as y), or omitted for all 1
 * @throws {@link KnotwiseError} `shape-mismatch`, `negative-weight`, `constant-x`, `too-few-points`, `bad-data` (magnitudes out of range)
 * @example
 * ```ts
 * const s = prepareSeries([3, '', 5, 4], [1, 2, 3, 3]);
 * // s.x = [1, 3], s.y = [3, 4.5], s.w = [1, 2]; row 2 dropped (blank), one tie merged
 * ```
 */
export function prepareSeries(yCells: readonly Cell[], xCells?: readonly Cell[] | null, wCells?: readonly Cell[] | null, options: SeriesOptions = {}): Series {
  const nRows = yCells.length;
  const ties = options.ties ?? 'merge';
  const minPoints = options.minPoints ?? 2;
  const method = options.method ? ` for ${options.method}` : '';
  if (xCells && xCells.length !== nRows) {
    throw new KnotwiseError('shape-mismatch', `x has ${xCells.length} rows but y has ${nRows}; give x and y the same number of rows.`);
  }
  if (wCells && wCells.length !== nRows) {
    throw new KnotwiseError('shape-mismatch', `weights have ${wCells.length} rows but y has ${nRows}; give weights and y the same number of rows.`);
  }
  const dropped: DroppedRow[] = [];
  const ux: number[] = [];
  const uy: number[] = [];
  const uw: number[] = [];
  const urow: number[] = [];
  for (let r = 0; r < nRows; r++) {
    const cy = classify(yCells[r]);
    if (!cy.ok) { dropped.push({ row: r, column: 'y', reason: cy.reason, value: cy.text }); continue; }
    let xv = r + 1;
    if (xCells) {
      const cx = classify(xCells[r]);
      if (!cx.ok) { dropped.push({ row: r, column: 'x', reason: cx.reason, value: cx.text }); continue; }
      xv = cx.value;
    }
    let wv = 1;
    if (wCells) {
      const cw = classify(wCells[r]);
      if (!cw.ok) { dropped.push({ row: r, column: 'weights', reason: cw.reason, value: cw.text }); continue; }
      wv = cw.value;
      if (wv < 0) throw new KnotwiseError('negative-weight', `weight in row ${r + 1} is ${showNumber(wv)}; weights must be zero or positive.`);
      if (wv === 0) { dropped.push({ row: r, column: 'weights', reason: 'zero-weight', value: '0' }); continue; }
    }
    ux.push(xv); uy.push(cy.value); uw.push(wv); urow.push(r);
  }
  const nUsed = ux.length;
  checkMagnitudes(ux, uy, uw, urow, !!xCells, !!wCells);
  let inputSorted = true;
  for (let i = 1; i < nUsed; i++) if (ux[i] < ux[i - 1]) { inputSorted = false; break; }
  const order = Array.from({ length: nUsed }, (_, i) => i);
  if (!inputSorted) order.sort((a, b) => ux[a] - ux[b] || a - b);

  const rowOf = new Int32Array(nRows).fill(-1);
  const px: number[] = [];
  const py: number[] = [];
  const pw: number[] = [];
  const pfirst: number[] = [];
  let tiesMerged = 0;
  let withinTies = 0;
  const tieRows: number[] = [];
  for (const i of order) {
    const k = px.length - 1;
    if (ties === 'merge' && k >= 0 && px[k] === ux[i]) {
      const wn = pw[k] + uw[i];
      const delta = uy[i] - py[k];
      withinTies += ((pw[k] * uw[i]) / wn) * delta * delta;
      py[k] += (uw[i] / wn) * delta;
      pw[k] = wn;
      if (urow[i] < pfirst[k]) pfirst[k] = urow[i];
      rowOf[urow[i]] = k;
      tiesMerged++;
      tieRows.push(urow[i]);
    } else {
      px.push(ux[i]); py.push(uy[i]); pw.push(uw[i]); pfirst.push(urow[i]);
      rowOf[urow[i]] = px.length - 1;
    }
  }
  const n = px.length;
  if (nUsed >= 2 && px[0] === px[n - 1] && xCells) {
    throw new KnotwiseError('constant-x', `all ${nUsed} usable x values equal ${showNumber(px[0])}; x must vary to fit a curve in x.`);
  }
  if (n < minPoints) {
    const extra = dropped.length ? ` (${dropped.length} of ${nRows} rows were not usable numbers)` : '';
    const distinct = tiesMerged ? ' distinct-x' : '';
    throw new KnotwiseError('too-few-points', `need at least ${minPoints}${distinct} usable points${method}; got ${n}${extra}.`);
  }

  const warnings: Warning[] = [];
  if (dropped.length) {
    const byReason = new Map<DropReason, number[]>();
    for (const d of dropped) { const a = byReason.get(d.reason) ?? []; a.push(d.row); byReason.set(d.reason, a); }
    const parts = [...byReason.entries()].map(([reason, rows]) => `${rows.length} ${REASON_TEXT[reason]} (row ${listRows(rows)})`);
    warnings.push(warning('dropped-cells', `${dropped.length} of ${nRows} rows left out: ${parts.join('; ')}. Their output cells are left empty.`, dropped.map((d) => d.row)));
  }
  if (!inputSorted) warnings.push(warning('unsorted-x', 'x was not in increasing order; the data were sorted for fitting and every output is returned in the original row order.'));
  if (tiesMerged) warnings.push(warning('ties-merged', `${tiesMerged} rows share an x value with an earlier row and were merged into one weighted point (weights added, y averaged): row ${listRows(tieRows)}.`, tieRows));

  return {
    x: Float64Array.from(px), y: Float64Array.from(py), w: Float64Array.from(pw), n,
    nRows, nUsed, rowOf, firstRow: Int32Array.from(pfirst), dropped, tiesMerged, withinTies, inputSorted,
    xGiven: !!xCells, weighted: !!wCells, warnings,
  };
}

/**
 * Builds a clean series straight from numbers (no intake checks beyond shape).
 * For engine callers that already hold sorted, distinct, finite data. Unchecked.
 */
export function seriesFromArrays(x: ArrayLike<number>, y: ArrayLike<number>, w?: ArrayLike<number>): Series {
  const n = y.length;
  const rowOf = new Int32Array(n);
  for (let i = 0; i < n; i++) rowOf[i] = i;
  return {
    x: Float64Array.from(x), y: Float64Array.from(y), w: w ? Float64Array.from(w) : new Float64Array(n).fill(1), n,
    nRows: n, nUsed: n, rowOf, firstRow: Int32Array.from(rowOf), dropped: [], tiesMerged: 0, withinTies: 0, inputSorted: true,
    xGiven: true, weighted: !!w, warnings: [],
  };
}

/** Maps per-point values back to input rows; dropped rows get `fill`. */
export function toRows<T>(series: Series, perPoint: ArrayLike<number>, fill: T): (number | T)[] {
  const out: (number | T)[] = new Array(series.nRows);
  for (let r = 0; r < series.nRows; r++) {
    const k = series.rowOf[r];
    out[r] = k >= 0 ? perPoint[k] : fill;
  }
  return out;
}
