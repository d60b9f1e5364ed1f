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
  // cur holds D(j) with width j + 1, for rows 0 .. n - j - 1; each pass is a function of its own
  // (DEVELOPERS.md, "Long loops and the first call")
  let width = 2;
  let cur = firstDifferenceRows(n);
  for (let j = 1; j < q; j++) {
    const next = new Float64Array((n - j - 1) * (width + 1));
    raiseDifferenceRows(x, j, cur, width, next);
    cur = next;
    width++;
  }
  return cur;
}

/** The rows of D(x, 1): [-1, 1] for each of the n - 1 rows. Unchecked. */
function firstDifferenceRows(n: number): Float64Array {
  const cur = new Float64Array((n - 1) * 2);
  for (let r = 0; r < n - 1; r++) { cur[2 * r] = -1; cur[2 * r + 1] = 1; }
  return cur;
}

/** The rows of D(j+1) (width + 1 entries each, into `next`, zeroed) from those of D(j) (`width` entries). Unchecked. */
function raiseDifferenceRows(x: Float64Array, j: number, cur: Float64Array, width: number, next: Float64Array): void {
  const nw = width + 1;
  const m = next.length / nw;
  for (let r = 0; r < m; r++) {
    const s0 = j / (x[r + j] - x[r]);
    const s1 = j / (x[r + 1 + j] - x[r + 1]);
    const o = r * nw;
    for (let c = 0; c < width; c++) {
      next[o + c] -= s0 * cur[r * width + c];
      next[o + c + 1] += s1 * cur[(r + 1) * width + c];
    }
  }
}
