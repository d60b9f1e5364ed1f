/**
 * Independent optimality check for trend filtering, used by the tests (it
 * shares no code with the solvers). For
 *   minimise 1/2 sum w (y - b)^2 + lambda ||D b||_1,
 * b is optimal iff there is u with D^T u = W (y - b), |u_r| <= lambda, and
 * u_r = lambda sign((D b)_r) wherever (D b)_r != 0 (subgradient condition).
 * D is built densely from the divided-difference formula
 *   (D(x, k+1) b)_r = k! (x_{r+k+1} - x_r) [x_r .. x_{r+k+1}] b,
 * and u is the least-squares solution of D^T u = W (y - b) by dense QR (small n only).
 */
import { Matrix, QrDecomposition } from 'ml-matrix';

export interface KktReport {
  /** max_r |u_r| / lambda - 1 (<= 0 when feasible). */
  boxExcess: number;
  /** max over knot rows of |u_r - lambda sign(Db_r)| / lambda. */
  signError: number;
  /** ||D^T u - W (y - b)||_inf relative to ||W (y - b)||_inf (stationarity residual). */
  stationarity: number;
  /** Rows with |D b| above the knot threshold. */
  knotRows: number[];
  u: number[];
}

export function denseDifference(x: ArrayLike<number>, q: number): number[][] {
  const n = x.length;
  const k = q - 1;
  let fact = 1;
  for (let i = 2; i <= k; i++) fact *= i;
  const rows: number[][] = [];
  for (let r = 0; r < n - q; r++) {
    const row = new Array(n).fill(0);
    for (let j = 0; j <= q; j++) {
      let den = 1;
      for (let l = 0; l <= q; l++) if (l !== j) den *= x[r + j] - x[r + l];
      row[r + j] = (fact * (x[r + q] - x[r])) / den;
    }
    rows.push(row);
  }
  return rows;
}

/**
 * @param knotRelative - a row is a knot when |(D b)_r| > knotRelative * max |D b|
 */
export function checkTrendKkt(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>, b: ArrayLike<number>, k: number, lambda: number, knotRelative = 1e-6): KktReport {
  const n = x.length;
  const D = new Matrix(denseDifference(x, k + 1));
  const m = D.rows;
  const g = Matrix.columnVector(Array.from({ length: n }, (_, i) => w[i] * (y[i] - b[i])));
  // least squares D^T u = g by Householder QR of D^T (condition number of D, not its square)
  const u = new QrDecomposition(D.transpose()).solve(g).to1DArray();
  const dtu = D.transpose().mmul(Matrix.columnVector(u)).to1DArray();
  let gmax = 0, sres = 0;
  for (let i = 0; i < n; i++) { gmax = Math.max(gmax, Math.abs(g.get(i, 0))); sres = Math.max(sres, Math.abs(dtu[i] - g.get(i, 0))); }
  const db = D.mmul(Matrix.columnVector(Array.from(b))).to1DArray();
  let dmax = 0;
  for (const v of db) dmax = Math.max(dmax, Math.abs(v));
  const knotRows: number[] = [];
  let boxExcess = -Infinity, signError = 0;
  for (let r = 0; r < m; r++) {
    boxExcess = Math.max(boxExcess, Math.abs(u[r]) / lambda - 1);
    if (Math.abs(db[r]) > knotRelative * dmax) {
      knotRows.push(r);
      signError = Math.max(signError, Math.abs(u[r] - lambda * Math.sign(db[r])) / lambda);
    }
  }
  return { boxExcess, signError, stationarity: gmax > 0 ? sres / gmax : sres, knotRows, u };
}
