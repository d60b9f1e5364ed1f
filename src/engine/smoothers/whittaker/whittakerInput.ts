/**
 * Entry checks shared by the Whittaker-Henderson kernels, and the internal
 * scaling they all use.
 */
import { KnotwiseError, showNumber } from '../../errors';
import { differenceRows } from '../../linalg/differenceRows';

/** Highest order of differences accepted. */
export const WHITTAKER_MAX_ORDER = 6;

/** Checked and scaled input: x in units of the mean spacing, weights divided by their mean. */
export interface WhittakerInput {
  n: number;
  order: number;
  x: Float64Array;
  y: Float64Array;
  /** Weights divided by their mean. */
  w: Float64Array;
  /** Mean weight (the scale removed from w). */
  wScale: number;
  /** Mean spacing h = (x_n - x_1) / (n - 1); x is used as (x - x_1) / h internally. */
  h: number;
  /** Rows of D(u, order) for the scaled positions u, (n - order) x (order + 1); built on first use. */
  readonly rows: Float64Array;
  /**
   * Order 2 only: s_r = h / (x_{r+1} - x_r), r = 0..n-2, from which row r of D is
   * (s_r, -(s_r + s_{r+1}), s_{r+1}); null when every s_r is exactly 1 (equal spacing, rows (1, -2, 1))
   * or the order is not 2.
   */
  spacing: Float64Array | null;
}

/**
 * Validates x (finite, strictly increasing), y (finite), w (finite, >= 0; null
 * for all ones; at least `order` positive) and order (1..6, n > order).
 * Throws KnotwiseError with the offending value. With `scale` false, x and w are
 * kept as given (h = 1, wScale = 1).
 */
export function whittakerInput(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, order: number, scale = true): WhittakerInput {
  if (typeof order !== 'number' || !Number.isInteger(order) || order < 1 || order > WHITTAKER_MAX_ORDER) {
    throw new KnotwiseError('bad-option', `order must be a whole number from 1 to ${WHITTAKER_MAX_ORDER}; got ${typeof order === 'number' ? showNumber(order) : String(order)}.`);
  }
  const n = y.length;
  if (x.length !== n) throw new KnotwiseError('shape-mismatch', `x has ${x.length} values but y has ${n}.`);
  if (w && w.length !== n) throw new KnotwiseError('shape-mismatch', `the weights have ${w.length} values but y has ${n}.`);
  if (n <= order) throw new KnotwiseError('too-few-points', `differences of order ${order} need at least ${order + 1} points; got ${n}.`);
  // copies as Float64Array first, so the checks below read one array type (fast at 1e6 points)
  // Float64Array input is read in place (never written); anything else is copied first,
  // so the checks below read one array type (fast at 1e6 points)
  const xs = x instanceof Float64Array ? x : toFloat64(x), ys = y instanceof Float64Array ? y : toFloat64(y);
  const ws = w ? toFloat64(w) : new Float64Array(n).fill(1);
  let positive = 0, wSum = 0;
  for (let i = 0; i < n; i++) {
    const xi = xs[i], yi = ys[i], wi = ws[i];
    if (!Number.isFinite(xi)) throw new KnotwiseError('bad-data', `x at position ${i + 1} is not a finite number: ${showNumber(xi)}.`);
    if (!Number.isFinite(yi)) throw new KnotwiseError('bad-data', `y at position ${i + 1} is not a finite number: ${showNumber(yi)}.`);
    if (!Number.isFinite(wi)) throw new KnotwiseError('bad-data', `the weight at position ${i + 1} is not a finite number: ${showNumber(wi)}.`);
    if (wi < 0) throw new KnotwiseError('negative-weight', `the weight at position ${i + 1} is negative: ${showNumber(wi)}.`);
    if (i > 0 && !(xi > xs[i - 1])) {
      throw new KnotwiseError('bad-data', `x must be strictly increasing (merge equal x first); x at position ${i + 1} is ${showNumber(xi)} after ${showNumber(xs[i - 1])}.`);
    }
    if (wi > 0) positive++;
    wSum += wi;
  }
  if (positive < order) {
    throw new KnotwiseError('too-few-points', `differences of order ${order} need at least ${order} points with positive weight; got ${positive}.`);
  }
  const h = scale ? (xs[n - 1] - xs[0]) / (n - 1) : 1;
  const wScale = scale ? wSum / n : 1;
  if (wScale !== 1) for (let i = 0; i < n; i++) ws[i] /= wScale;
  let spacing: Float64Array | null = null;
  if (order === 2) {
    let uniform = true;
    for (let r = 0; r < n - 1 && uniform; r++) uniform = h / (xs[r + 1] - xs[r]) === 1;
    if (!uniform) {
      spacing = new Float64Array(n - 1);
      for (let r = 0; r < n - 1; r++) spacing[r] = h / (xs[r + 1] - xs[r]);
    }
  }
  // the rows are built only when a kernel reads them (order 2 solves from the spacings alone)
  let rows: Float64Array | null = null;
  return { n, order, x: xs, y: ys, w: ws, wScale, h, spacing, get rows() { return (rows ??= scaledDifferenceRows(xs, h, order)); } };
}

/**
 * The penalty on the internal scale: lambda ||D(x, d) z||^2 / wScale equals
 * lambdaScaled ||D(u, d) z||^2 with u = (x - x_1) / h, since D(x, d) = D(u, d) / h^(d-1).
 * Unchecked.
 */
export function scaledLambda(inp: WhittakerInput, lambda: number): number {
  return lambda / Math.pow(inp.h, 2 * (inp.order - 1)) / inp.wScale;
}

/**
 * Rows of D(u, d) for u = (x - x_1) / h: direct formulas for d = 1 ([-1, 1]) and d = 2
 * ([s_r, -(s_r + s_{r+1}), s_{r+1}], s_r = 1 / (u_{r+1} - u_r)), else {@link differenceRows}.
 * Unchecked.
 */
function scaledDifferenceRows(x: Float64Array, h: number, d: number): Float64Array {
  const n = x.length;
  if (d === 1) {
    const rows = new Float64Array(2 * (n - 1));
    for (let r = 0; r < n - 1; r++) { rows[2 * r] = -1; rows[2 * r + 1] = 1; }
    return rows;
  }
  if (d === 2) {
    const rows = new Float64Array(3 * (n - 2));
    let s0 = h / (x[1] - x[0]);
    for (let r = 0; r < n - 2; r++) {
      const s1 = h / (x[r + 2] - x[r + 1]);
      rows[3 * r] = s0; rows[3 * r + 1] = -(s0 + s1); rows[3 * r + 2] = s1;
      s0 = s1;
    }
    return rows;
  }
  const u = new Float64Array(n);
  for (let i = 0; i < n; i++) u[i] = (x[i] - x[0]) / h;
  return differenceRows(u, d);
}

/** Checks a penalty: finite and > 0. */
export function checkWhittakerLambda(lambda: unknown): number {
  if (typeof lambda !== 'number' || !Number.isFinite(lambda) || lambda <= 0) {
    throw new KnotwiseError('bad-option', `lambda must be a finite number > 0; got ${typeof lambda === 'number' ? showNumber(lambda) : String(lambda)}.`);
  }
  return lambda;
}

/** A fresh Float64Array copy of v. Unchecked. */
export function toFloat64(v: ArrayLike<number>): Float64Array {
  if (v instanceof Float64Array) return v.slice();
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) out[i] = v[i];
  return out;
}
