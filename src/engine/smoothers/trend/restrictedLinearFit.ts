import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';

/**
 * The restricted trend-filtering problem of order 1 solved in O(n):
 *
 *   minimise 1/2 sum w (y - b)^2 + lambda sum_{r in A} s_r (D b)_r  subject to (D b)_j = 0, j not in A,
 *
 * with D = D(x, 2), whose row r is the change of slope at x_{r+1}. The
 * feasible b are the continuous piecewise-linear functions with kinks at the
 * points x_{r+1}, r in A, spanned by the hat functions (linear B-splines) on
 * the breakpoints x_0, x_{r+1} (r in A), x_{n-1}; the normal equations are
 * tridiagonal and solved by banded Cholesky. Row r's slope change is
 * (c_{j+1} - c_j) / h_j - (c_j - c_{j-1}) / h_{j-1} in the hat coefficients c.
 *
 * @param rowsA - knot rows, strictly increasing, in 0 .. n - 3
 * @param sA - their signs
 * @returns fitted values, or null when the system is singular
 * Unchecked.
 */
export function restrictedLinearFit(x: Float64Array, y: Float64Array, w: Float64Array, lambda: number, rowsA: ArrayLike<number>, sA: ArrayLike<number>): Float64Array | null {
  const n = x.length;
  const K = rowsA.length;
  const p = K + 2;
  const xi = new Float64Array(p);
  xi[0] = x[0];
  for (let j = 0; j < K; j++) xi[j + 1] = x[rowsA[j] + 1];
  xi[p - 1] = x[n - 1];
  const band = new Float64Array(p * 2);
  const rhs = new Float64Array(p);
  const seg = new Int32Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    while (j < p - 2 && x[i] > xi[j + 1]) j++;
    seg[i] = j;
    const h = xi[j + 1] - xi[j];
    const b1 = (x[i] - xi[j]) / h, b0 = 1 - b1;
    const wi = w[i];
    band[j * 2] += wi * b0 * b0;
    band[(j + 1) * 2] += wi * b1 * b1;
    band[(j + 1) * 2 + 1] += wi * b0 * b1;
    rhs[j] += wi * b0 * y[i];
    rhs[j + 1] += wi * b1 * y[i];
  }
  for (let a = 0; a < K; a++) {
    const jj = a + 1; // interior breakpoint index
    const hl = xi[jj] - xi[jj - 1], hr = xi[jj + 1] - xi[jj];
    const ls = lambda * sA[a];
    rhs[jj + 1] -= ls / hr;
    rhs[jj] += ls * (1 / hr + 1 / hl);
    rhs[jj - 1] -= ls / hl;
  }
  if (bandedCholesky(band, p, 1) >= 0) return null;
  bandedCholeskySolve(band, p, 1, rhs);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const jj = seg[i];
    const h = xi[jj + 1] - xi[jj];
    const b1 = (x[i] - xi[jj]) / h;
    b[i] = (1 - b1) * rhs[jj] + b1 * rhs[jj + 1];
  }
  return b;
}
