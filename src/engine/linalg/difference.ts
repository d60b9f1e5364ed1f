/**
 * The divided-difference operator D(x, q) of trend filtering on unequally
 * spaced points and its transpose, applied in O(n q) without forming matrices.
 *
 * Recursion (R. J. Tibshirani, "Adaptive piecewise polynomial estimation via
 * trend filtering", Ann. Statist. 42 (2014), section 6; Y.-X. Wang, A. Smola and
 * R. J. Tibshirani, "The falling factorial basis and its statistical
 * applications", ICML 2014):
 *
 *   D(x, 1) = the (n-1) x n first-difference matrix, rows [-1, 1];
 *   D(x, j+1) = D(1) * diag(j / (x_{i+j} - x_i)) * D(x, j),  an (n-j-1) x n matrix.
 *
 * Row r of D(x, q) b equals (q-1)! times the change in the (q-1)-th divided
 * difference of b: (q-1)! ([x_{r+1..r+q}] b - [x_{r..r+q-1}] b), which is the
 * jump in the (q-1)-th derivative of the degree-(q-1) interpolant of b.
 * For unit spacing D(x, q) is the ordinary q-th difference.
 */

/**
 * Applies D(x, q) to b: returns the vector of length n - q.
 *
 * @param x - strictly increasing positions (length n)
 * @param q - order of the difference, 1 <= q < n
 * @param b - values at x (length n)
 * @param out - optional output of length >= n (work space; the result is its first n - q entries)
 * @returns `out.subarray(0, n - q)`
 * @example
 * ```ts
 * differenceOperator(Float64Array.of(0, 1, 3), 2, Float64Array.of(0, 1, 3)); // [0] (a line has no kink)
 * ```
 * Unchecked: the caller guarantees the shapes.
 */
export function differenceOperator(x: Float64Array, q: number, b: ArrayLike<number>, out?: Float64Array): Float64Array {
  const n = x.length;
  const v = out && out.length >= n ? out : new Float64Array(n);
  // each pass is a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  copyInto(b, v, n);
  let len = n;
  for (let s = 1; s <= q; s++) {
    if (s >= 2) scaleByDividedSpacing(x, s - 1, v, len);
    firstDifferenceInPlace(v, len);
    len--;
  }
  return v.subarray(0, n - q);
}

/** v_i = b_i for i < n. Unchecked. */
function copyInto(b: ArrayLike<number>, v: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) v[i] = b[i];
}

/** v_i *= j / (x_{i+j} - x_i) for i < len: one step of the divided-difference recursion. Unchecked. */
function scaleByDividedSpacing(x: Float64Array, j: number, v: Float64Array, len: number): void {
  for (let i = 0; i < len; i++) v[i] *= j / (x[i + j] - x[i]);
}

/** v_i = v_{i+1} - v_i for i < len - 1, in place from the bottom. Unchecked. */
function firstDifferenceInPlace(v: Float64Array, len: number): void {
  for (let i = 0; i < len - 1; i++) v[i] = v[i + 1] - v[i];
}

/**
 * Applies the transpose D(x, q)^T to u (length n - q): returns a vector of length n.
 *
 * @param x - strictly increasing positions (length n)
 * @param q - order of the difference, 1 <= q < n
 * @param u - a vector of length n - q
 * @param out - optional output of length n
 * @example
 * ```ts
 * differenceTranspose(Float64Array.of(0, 1, 2), 1, Float64Array.of(1, 1)); // [-1, 0, 1]
 * ```
 * Unchecked.
 */
export function differenceTranspose(x: Float64Array, q: number, u: ArrayLike<number>, out?: Float64Array): Float64Array {
  const n = x.length;
  const v = out && out.length >= n ? out : new Float64Array(n);
  let len = n - q;
  copyInto(u, v, len);
  for (let s = q; s >= 1; s--) {
    // first-difference transpose: length len -> len + 1, in place from the top (v_0 is read by the
    // kernel before it is negated here)
    v[len] = v[len - 1];
    transposedDifferenceInPlace(v, len);
    v[0] = -v[0];
    len++;
    if (s >= 2) scaleByDividedSpacing(x, s - 1, v, len);
  }
  return v.subarray(0, n);
}

/** v_i = v_{i-1} - v_i for i = len - 1 down to 1 (the interior rows of D_1^T). Unchecked. */
function transposedDifferenceInPlace(v: Float64Array, len: number): void {
  for (let i = len - 1; i >= 1; i--) v[i] = v[i - 1] - v[i];
}

/**
 * d = D1^T v for the plain first-difference operator D1 (rows (-1, 1), no spacing) with m rows:
 * d_0 = -v_0, d_r = v_{r-1} - v_r, d_m = v_{m-1} (d has m + 1 entries; the dual of a fused lasso and
 * the ADMM's scaled dual in trend filtering).
 *
 * @example
 * ```ts
 * firstDifferenceTranspose(Float64Array.of(1, 1), new Float64Array(3), 2); // [-1, 0, 1]
 * ```
 * Unchecked: m >= 1, d not v.
 */
export function firstDifferenceTranspose(v: Float64Array, d: Float64Array, m: number): void {
  d[0] = -v[0];
  d[m] = v[m - 1];
  for (let r = 1; r < m; r++) d[r] = v[r - 1] - v[r];
}
