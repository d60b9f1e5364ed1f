/**
 * The non-zero entries of D(x, q) (see {@link differenceOperator}) row by row:
 * row r has q + 1 entries, for columns r .. r + q, stored at
 * `rows[r * (q + 1) + c]`. Built by the same recursion,
 * row_r(D(j+1)) = s_{r+1} row_{r+1}(D(j)) - s_r row_r(D(j)), s_i = j / (x_{i+j} - x_i),
 * in O(n q^2). Storage is (n - q)(q + 1) numbers: banded, never a dense matrix.
 *
 * @param x - strictly increasing positions (length n > q)
 * @param q - order of the difference, q >= 1
 * @example
 * ```ts
 * differenceRows(Float64Array.of(0, 1, 2), 2); // [1, -2, 1]
 * ```
 * Unchecked.
 */
export function differenceRows(x: Float64Array, q: number): Float64Array {
  const n = x.length;
  // cur holds D(j) with width j + 1, for rows 0 .. n - j - 1
  let width = 2;
  let cur = new Float64Array((n - 1) * 2);
  for (let r = 0; r < n - 1; r++) { cur[2 * r] = -1; cur[2 * r + 1] = 1; }
  for (let j = 1; j < q; j++) {
    const m = n - j - 1;
    const nw = width + 1;
    const next = new Float64Array(m * nw);
    for (let r = 0; r < m; r++) {
      const s0 = j / (x[r + j] - x[r]);
      const s1 = j / (x[r + 1 + j] - x[r + 1]);
      const o = r * nw;
      for (let c = 0; c < width; c++) {
        next[o + c] -= s0 * cur[r * width + c];
        next[o + c + 1] += s1 * cur[(r + 1) * width + c];
      }
    }
    cur = next;
    width = nw;
  }
  return cur;
}
