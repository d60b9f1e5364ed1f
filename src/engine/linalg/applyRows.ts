/**
 * out = R v for a banded operator given by its rows: row r has `wd` entries, rows[r wd + c] at
 * column r + c (the layout of {@link differenceRows}), so out_r = sum_c rows[r wd + c] v[r + c],
 * added in column order; one row per entry of `out`.
 *
 * @example
 * ```ts
 * applyRows(Float64Array.of(-1, 1, -1, 1), 2, Float64Array.of(1, 4, 9), new Float64Array(2)); // [3, 5]
 * ```
 * Unchecked.
 */
export function applyRows(rows: Float64Array, wd: number, v: Float64Array, out: Float64Array): Float64Array {
  for (let r = 0; r < out.length; r++) {
    let s = 0;
    const o = r * wd;
    for (let c = 0; c < wd; c++) s += rows[o + c] * v[r + c];
    out[r] = s;
  }
  return out;
}
