/**
 * out = R^T z for the first m rows of a banded operator given by its rows ({@link applyRows}'s
 * layout): out is zeroed, then row r adds rows[r wd + c] z_r to out[r + c], rows in order.
 *
 * @example
 * ```ts
 * applyRowsTransposed(Float64Array.of(-1, 1, -1, 1), 2, Float64Array.of(1, 2), 2, new Float64Array(3)); // [-1, -1, 2]
 * ```
 * Unchecked.
 */
export function applyRowsTransposed(rows: Float64Array, wd: number, z: Float64Array, m: number, out: Float64Array): Float64Array {
  out.fill(0);
  for (let r = 0; r < m; r++) {
    const zr = z[r];
    const o = r * wd;
    for (let c = 0; c < wd; c++) out[r + c] += rows[o + c] * zr;
  }
  return out;
}
