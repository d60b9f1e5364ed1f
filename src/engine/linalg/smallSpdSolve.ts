/**
 * Solves M x = b for a small dense symmetric positive definite m x m matrix (row-major) by
 * Cholesky, M = L L^T, then forward and back substitution: O(m^3), meant for the few
 * coefficients of a season or a polynomial block, never for n x n systems. A pivot that is
 * not positive (M not positive definite to working precision) gives x = 0, so an update
 * built on x leaves its block unchanged rather than filling it with NaN. Unchecked.
 *
 * @param M - the matrix, row-major, length m * m
 * @param b - the right-hand side, length m
 * @param m - the size
 * @example
 * ```ts
 * smallSpdSolve(Float64Array.of(4, 2, 2, 3), Float64Array.of(2, 1), 2); // [0.5, 0]
 * ```
 */
export function smallSpdSolve(M: Float64Array, b: Float64Array, m: number): Float64Array {
  const L = new Float64Array(m * m);
  for (let j = 0; j < m; j++) {
    let d = M[j * m + j];
    for (let p = 0; p < j; p++) d -= L[j * m + p] * L[j * m + p];
    if (!(d > 0)) return new Float64Array(m);
    L[j * m + j] = Math.sqrt(d);
    for (let i = j + 1; i < m; i++) {
      let v = M[i * m + j];
      for (let p = 0; p < j; p++) v -= L[i * m + p] * L[j * m + p];
      L[i * m + j] = v / L[j * m + j];
    }
  }
  const yv = new Float64Array(m);
  for (let i = 0; i < m; i++) { let v = b[i]; for (let p = 0; p < i; p++) v -= L[i * m + p] * yv[p]; yv[i] = v / L[i * m + i]; }
  const xv = new Float64Array(m);
  for (let i = m - 1; i >= 0; i--) { let v = yv[i]; for (let p = i + 1; p < m; p++) v -= L[p * m + i] * xv[p]; xv[i] = v / L[i * m + i]; }
  return xv;
}
