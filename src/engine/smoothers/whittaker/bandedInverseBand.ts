/**
 * The band of the inverse of a symmetric positive definite band matrix from its
 * Cholesky factor: Sigma(i, j) = (A^{-1})(i, j) for |i - j| <= p, in O(n p^2)
 * without forming A^{-1}.
 *
 * From L' Sigma = L^{-1} (A = L L', L lower triangular with half-bandwidth p),
 * reading entries on and above the diagonal, where L^{-1} is zero except for
 * its diagonal 1 / L(i, i):
 *
 *   Sigma(i, j) = ( [i = j] / L(i, i)  -  sum_{k = i+1}^{i+p} L(k, i) Sigma(k, j) ) / L(i, i),   i <= j <= i + p,
 *
 * run for i = n-1 down to 0; every Sigma(k, j) on the right lies in the band and is
 * already known (K. Takahashi, J. Fagan and M.-S. Chin, "Formation of a sparse bus
 * impedance matrix and its application to short circuit study", 8th PICA Conference,
 * 1973; M. F. Hutchinson and F. R. de Hoog, "Smoothing noisy data with spline
 * functions", Numer. Math. 47 (1985) 99-106, for the banded case).
 *
 * @param l - the factor from `bandedCholesky` (lower band, diagonal holding 1 / L(i, i)), length n (p + 1)
 * @param n - order of A
 * @param p - half-bandwidth
 * @returns the upper band of Sigma: `Sigma(i, i + d)` at `[i * (p + 1) + d]`, 0 <= d <= p
 *   (entries with i + d >= n are 0)
 * @example
 * ```ts
 * const a = Float64Array.of(4, 0, 5, 2); // [[4, 2], [2, 5]]
 * bandedCholesky(a, 2, 1);
 * bandedInverseBand(a, 2, 1); // [5/16, -2/16, 4/16, 0]
 * ```
 * Unchecked.
 */
export function bandedInverseBand(l: Float64Array, n: number, p: number): Float64Array {
  if (p === 2) return bandedInverseBand2(l, n);
  const w = p + 1;
  const s = new Float64Array(n * w);
  for (let i = n - 1; i >= 0; i--) {
    const r = l[i * w]; // 1 / L(i, i)
    const kMax = i + p < n - 1 ? i + p : n - 1;
    // off-diagonal entries first: they need only rows below i;
    // Sigma(k, j) for k, j > i is read from the upper band at row min(k, j)
    for (let j = kMax; j > i; j--) {
      let acc = 0;
      for (let k = i + 1; k <= kMax; k++) {
        const sk = k <= j ? s[k * w + (j - k)] : s[j * w + (k - j)];
        acc += l[k * w + (k - i)] * sk;
      }
      s[i * w + (j - i)] = -acc * r;
    }
    let acc = 0;
    for (let k = i + 1; k <= kMax; k++) acc += l[k * w + (k - i)] * s[i * w + (k - i)];
    s[i * w] = (r - acc) * r;
  }
  return s;
}

/**
 * {@link bandedInverseBand} unrolled for half-bandwidth 2 (order-2 graduation, the
 * Hodrick-Prescott case): with a = L(i+1, i), b = L(i+2, i), r = 1 / L(i, i),
 *   S(i, i+2) = -(a S(i+1, i+2) + b S(i+2, i+2)) r
 *   S(i, i+1) = -(a S(i+1, i+1) + b S(i+1, i+2)) r
 *   S(i, i)   = (r - a S(i, i+1) - b S(i, i+2)) r
 * Unchecked.
 */
function bandedInverseBand2(l: Float64Array, n: number): Float64Array {
  const s = new Float64Array(n * 3);
  if (n === 0) return s;
  // running values for rows i+1 and i+2: S(i+1,i+1), S(i+1,i+2), S(i+2,i+2)
  let s11 = 0, s12 = 0, s22 = 0;
  for (let i = n - 1; i >= 0; i--) {
    const r = l[3 * i];
    const a = i + 1 < n ? l[3 * (i + 1) + 1] : 0;
    const b = i + 2 < n ? l[3 * (i + 2) + 2] : 0;
    const e2 = -(a * s12 + b * s22) * r;
    const e1 = -(a * s11 + b * s12) * r;
    const e0 = (r - a * e1 - b * e2) * r;
    s[3 * i] = e0; s[3 * i + 1] = e1; s[3 * i + 2] = e2;
    // shift: row i becomes row i+1 for the next step
    s22 = s11; s12 = e1; s11 = e0;
  }
  return s;
}

/**
 * Only the diagonal of A^{-1} from the factor of {@link bandedInverseBand}: for half-bandwidth 2
 * the recursion runs on three numbers per step (no band is stored); otherwise the band is
 * computed and its diagonal read. O(n p^2).
 *
 * @example
 * ```ts
 * bandedInverseDiagonal(l, n, 2); // (A^{-1})_ii, i = 0..n-1
 * ```
 * Unchecked.
 */
export function bandedInverseDiagonal(l: Float64Array, n: number, p: number): Float64Array {
  const out = new Float64Array(n);
  if (p === 2) {
    let s11 = 0, s12 = 0, s22 = 0;
    for (let i = n - 1; i >= 0; i--) {
      const r = l[3 * i];
      const a = i + 1 < n ? l[3 * (i + 1) + 1] : 0;
      const b = i + 2 < n ? l[3 * (i + 2) + 2] : 0;
      const e2 = -(a * s12 + b * s22) * r;
      const e1 = -(a * s11 + b * s12) * r;
      const e0 = (r - a * e1 - b * e2) * r;
      out[i] = e0;
      s22 = s11; s12 = e1; s11 = e0;
    }
    return out;
  }
  const s = bandedInverseBand(l, n, p);
  for (let i = 0; i < n; i++) out[i] = s[i * (p + 1)];
  return out;
}
