/**
 * Cholesky factorisation A = L L^T of a symmetric positive definite band
 * matrix with half-bandwidth p, in place, in O(n p^2) (G. H. Golub and
 * C. F. Van Loan, "Matrix Computations", 4th ed., section 4.3.5).
 *
 * Storage ("lower band"): entry A(i, i - d), 0 <= d <= p, at `a[i * (p + 1) + d]`;
 * entries with i - d < 0 are ignored. On success `a` holds L in the same layout,
 * except that the diagonal holds the reciprocals 1 / L(i, i): the triangular solves,
 * a chain of dependent operations, then multiply instead of divide.
 *
 * @param a - the band of A, length n (p + 1); overwritten by L
 * @param n - order of A
 * @param p - half-bandwidth
 * @param pivotFloor - optional relative floor: a pivot below `pivotFloor * A(i, i)` is raised to it
 *   (a modified Cholesky factorisation of A + E with E >= 0 diagonal, for Newton steps on
 *   numerically singular systems); 0 (default) means no floor
 * @returns -1 on success, else the row index where a pivot was not positive (A is not numerically positive definite)
 * @example
 * ```ts
 * const a = Float64Array.of(4, 0, 5, 2); // [[4, 2], [2, 5]]
 * bandedCholesky(a, 2, 1); // -1; a = [0.5, 0, 0.5, 1]  (L = [[2, 0], [1, 2]])
 * ```
 * Unchecked.
 */
export function bandedCholesky(a: Float64Array, n: number, p: number, pivotFloor = 0): number {
  if (p === 2) return bandedCholesky2(a, n, pivotFloor);
  if (p === 1) return bandedCholesky1(a, n, pivotFloor);
  if (p === 3 && n > 3) { const r = bandedCholeskyRows(a, 3, 3, pivotFloor); return r >= 0 ? r : bandedCholesky3(a, n, pivotFloor); }
  if (p === 4 && n > 4) { const r = bandedCholeskyRows(a, 4, 4, pivotFloor); return r >= 0 ? r : bandedCholesky4(a, n, pivotFloor); }
  return bandedCholeskyRows(a, n, p, pivotFloor);
}

/**
 * {@link bandedCholesky}'s general loop over rows 0 .. rows - 1: the factor for any half-bandwidth,
 * the first rows of the unrolled versions, and their reference in tests (bit for bit). Unchecked.
 */
export function bandedCholeskyRows(a: Float64Array, rows: number, p: number, pivotFloor: number): number {
  const w = p + 1;
  for (let i = 0; i < rows; i++) {
    const j0 = i - p > 0 ? i - p : 0;
    for (let j = j0; j <= i; j++) {
      const aij = a[i * w + (i - j)];
      let s = aij;
      const l0 = j0 > j - p ? j0 : j - p;
      for (let l = l0; l < j; l++) s -= a[i * w + (i - l)] * a[j * w + (j - l)];
      if (j === i) {
        if (pivotFloor > 0 && !(s >= pivotFloor * aij)) s = pivotFloor * aij;
        if (!(s > 0)) return i;
        a[i * w] = 1 / Math.sqrt(s);
      } else {
        a[i * w + (i - j)] = s * a[j * w];
      }
    }
  }
  return -1;
}

/**
 * {@link bandedCholesky} unrolled for half-bandwidth 3 (order 2's interior point, order 3's restricted
 * solves), rows 3 .. n - 1 after the general loop's first three: the last rows' entries of L are carried
 * in locals. The same operations in the same order as the general loop (identical factors). Unchecked.
 */
function bandedCholesky3(a: Float64Array, n: number, pivotFloor: number): number {
  // r1..r3: 1 / L(i-1, i-1) .. 1 / L(i-3, i-3); b11 = L(i-1, i-2), b12 = L(i-1, i-3); b21 = L(i-2, i-3)
  let r1 = a[8], r2 = a[4], r3 = a[0];
  let b11 = a[9], b12 = a[10], b21 = a[5];
  for (let i = 3; i < n; i++) {
    const o = 4 * i;
    const l3 = a[o + 3] * r3;
    const l2 = (a[o + 2] - l3 * b21) * r2;
    const l1 = ((a[o + 1] - l3 * b12) - l2 * b11) * r1;
    a[o + 3] = l3; a[o + 2] = l2; a[o + 1] = l1;
    const aii = a[o];
    let s = aii - l3 * l3 - l2 * l2 - l1 * l1;
    if (pivotFloor > 0 && !(s >= pivotFloor * aii)) s = pivotFloor * aii;
    if (!(s > 0)) return i;
    const r = 1 / Math.sqrt(s);
    a[o] = r;
    r3 = r2; r2 = r1; r1 = r;
    b21 = b11; b11 = l1; b12 = l2;
  }
  return -1;
}

/** {@link bandedCholesky} unrolled for half-bandwidth 4 (order 3's interior point), as {@link bandedCholesky3}. Unchecked. */
function bandedCholesky4(a: Float64Array, n: number, pivotFloor: number): number {
  // r1..r4: 1 / L(i-1, i-1) .. 1 / L(i-4, i-4); bjd = L(i-j, i-j-d)
  let r1 = a[15], r2 = a[10], r3 = a[5], r4 = a[0];
  let b11 = a[16], b12 = a[17], b13 = a[18], b21 = a[11], b22 = a[12], b31 = a[6];
  for (let i = 4; i < n; i++) {
    const o = 5 * i;
    const l4 = a[o + 4] * r4;
    const l3 = (a[o + 3] - l4 * b31) * r3;
    const l2 = ((a[o + 2] - l4 * b22) - l3 * b21) * r2;
    const l1 = (((a[o + 1] - l4 * b13) - l3 * b12) - l2 * b11) * r1;
    a[o + 4] = l4; a[o + 3] = l3; a[o + 2] = l2; a[o + 1] = l1;
    const aii = a[o];
    let s = aii - l4 * l4 - l3 * l3 - l2 * l2 - l1 * l1;
    if (pivotFloor > 0 && !(s >= pivotFloor * aii)) s = pivotFloor * aii;
    if (!(s > 0)) return i;
    const r = 1 / Math.sqrt(s);
    a[o] = r;
    r4 = r3; r3 = r2; r2 = r1; r1 = r;
    b31 = b21; b21 = b11; b22 = b12; b11 = l1; b12 = l2; b13 = l3;
  }
  return -1;
}

/** {@link bandedCholesky} unrolled for half-bandwidth 1 (tridiagonal). Unchecked. */
function bandedCholesky1(a: Float64Array, n: number, pivotFloor: number): number {
  let prev = 0; // 1 / L(i-1, i-1)
  for (let i = 0; i < n; i++) {
    const o = 2 * i;
    let l1 = 0;
    if (i >= 1) { l1 = a[o + 1] * prev; a[o + 1] = l1; }
    const aii = a[o];
    let s = aii - l1 * l1;
    if (pivotFloor > 0 && !(s >= pivotFloor * aii)) s = pivotFloor * aii;
    if (!(s > 0)) return i;
    prev = 1 / Math.sqrt(s);
    a[o] = prev;
  }
  return -1;
}

/** {@link bandedCholesky} unrolled for half-bandwidth 2 (pentadiagonal: trend filtering of order 1). Unchecked. */
function bandedCholesky2(a: Float64Array, n: number, pivotFloor: number): number {
  // r1, r2: 1 / L(i-1, i-1) and 1 / L(i-2, i-2); c1: L(i-1, i-2)
  let r1 = 0, r2 = 0, c1 = 0;
  for (let i = 0; i < n; i++) {
    const o = 3 * i;
    let l2 = 0, l1 = 0;
    if (i >= 2) {
      // L(i, i-2) = A(i, i-2) / L(i-2, i-2)
      l2 = a[o + 2] * r2;
      a[o + 2] = l2;
    }
    if (i >= 1) {
      // L(i, i-1) = (A(i, i-1) - L(i, i-2) L(i-1, i-2)) / L(i-1, i-1)
      l1 = (a[o + 1] - l2 * c1) * r1;
      a[o + 1] = l1;
    }
    const aii = a[o];
    let s = aii - l1 * l1 - l2 * l2;
    if (pivotFloor > 0 && !(s >= pivotFloor * aii)) s = pivotFloor * aii;
    if (!(s > 0)) return i;
    const r = 1 / Math.sqrt(s);
    a[o] = r;
    r2 = r1; r1 = r; c1 = l1;
  }
  return -1;
}

/**
 * Solves L L^T x = b with the factor from {@link bandedCholesky}, in place on b, O(n p).
 *
 * Each substitution is a function of its own that ends with its loop: in a fresh process a long
 * loop's first compiled code is made while the loop runs, before the code after it has ever run,
 * and Node's engine went on entering that code and throwing it away at the second loop on later
 * calls (up to 711 times in one cross-validation of order 3 at 1e4).
 * Unchecked.
 */
export function bandedCholeskySolve(l: Float64Array, n: number, p: number, b: Float64Array): Float64Array {
  if (n === 0) return b;
  if (p === 1) { forward1(l, n, b); backward1(l, n, b); return b; }
  if (p === 2) { forward2(l, n, b); backward2(l, n, b); return b; }
  if (p === 3 && n > 6) { forwardRows(l, n, 3, b, 0, 3); forward3(l, n, b); backwardRows(l, n, 3, b, n - 1, n - 3); backward3(l, n, b); return b; }
  if (p === 4 && n > 8) { forwardRows(l, n, 4, b, 0, 4); forward4(l, n, b); backwardRows(l, n, 4, b, n - 1, n - 4); backward4(l, n, b); return b; }
  return bandedCholeskySolveRows(l, n, p, b);
}

/** Forward substitution for half-bandwidth 1: z_i = (b_i - L(i, i-1) z_{i-1}) / L(i, i). Unchecked. */
function forward1(l: Float64Array, n: number, b: Float64Array): void {
  let prev = b[0] * l[0];
  b[0] = prev;
  for (let i = 1; i < n; i++) { prev = (b[i] - l[2 * i + 1] * prev) * l[2 * i]; b[i] = prev; }
}

/** Back substitution for half-bandwidth 1: x_i = (z_i - L(i+1, i) x_{i+1}) / L(i, i). Unchecked. */
function backward1(l: Float64Array, n: number, b: Float64Array): void {
  let next = b[n - 1] * l[2 * (n - 1)];
  b[n - 1] = next;
  for (let i = n - 2; i >= 0; i--) { next = (b[i] - l[2 * (i + 1) + 1] * next) * l[2 * i]; b[i] = next; }
}

/** Forward substitution for half-bandwidth 2: z_i = (b_i - L(i, i-1) z_{i-1} - L(i, i-2) z_{i-2}) / L(i, i). Unchecked. */
function forward2(l: Float64Array, n: number, b: Float64Array): void {
  let z1 = 0, z2 = 0;
  for (let i = 0; i < n; i++) {
    const o = 3 * i;
    const z = (b[i] - l[o + 1] * z1 - l[o + 2] * z2) * l[o];
    b[i] = z;
    z2 = z1; z1 = z;
  }
}

/** Back substitution for half-bandwidth 2: x_i = (z_i - L(i+1, i) x_{i+1} - L(i+2, i) x_{i+2}) / L(i, i). Unchecked. */
function backward2(l: Float64Array, n: number, b: Float64Array): void {
  let x1 = 0, x2 = 0;
  for (let i = n - 1; i >= 0; i--) {
    const c1 = i + 1 < n ? l[3 * (i + 1) + 1] : 0; // L(i+1, i)
    const c2 = i + 2 < n ? l[3 * (i + 2) + 2] : 0; // L(i+2, i)
    const x = (b[i] - c1 * x1 - c2 * x2) * l[3 * i];
    b[i] = x;
    x2 = x1; x1 = x;
  }
}

/** {@link bandedCholeskySolve}'s general loops, for any half-bandwidth (the reference of the unrolled ones in tests). Unchecked. */
export function bandedCholeskySolveRows(l: Float64Array, n: number, p: number, b: Float64Array): Float64Array {
  forwardRows(l, n, p, b, 0, n);
  backwardRows(l, n, p, b, n - 1, 0);
  return b;
}

/** The forward substitution L z = b of {@link bandedCholeskySolve} on rows from .. to - 1, in place. Unchecked. */
function forwardRows(l: Float64Array, n: number, p: number, b: Float64Array, from: number, to: number): void {
  const w = p + 1;
  for (let i = from; i < to; i++) {
    let s = b[i];
    const j0 = i - p > 0 ? i - p : 0;
    for (let j = j0; j < i; j++) s -= l[i * w + (i - j)] * b[j];
    b[i] = s * l[i * w];
  }
}

/** The back substitution L^T x = z of {@link bandedCholeskySolve} on rows from down to `to`, in place (rows above `from` solved). Unchecked. */
function backwardRows(l: Float64Array, n: number, p: number, b: Float64Array, from: number, to: number): void {
  const w = p + 1;
  for (let i = from; i >= to; i--) {
    let s = b[i];
    const j1 = i + p < n - 1 ? i + p : n - 1;
    for (let j = i + 1; j <= j1; j++) s -= l[j * w + (j - i)] * b[j];
    b[i] = s * l[i * w];
  }
}

/**
 * {@link bandedCholeskySolve} unrolled for half-bandwidth 3, rows 3 .. n - 1 of the forward
 * substitution (the general loops solve the first rows), the last three values in locals; the same
 * operations in the same order as the general loops (identical results).
 * z_i = (b_i - L(i, i-3) z_{i-3} - L(i, i-2) z_{i-2} - L(i, i-1) z_{i-1}) / L(i, i). Unchecked.
 */
function forward3(l: Float64Array, n: number, b: Float64Array): void {
  let z3 = b[0], z2 = b[1], z1 = b[2];
  for (let i = 3; i < n; i++) {
    const o = 4 * i;
    const z = (((b[i] - l[o + 3] * z3) - l[o + 2] * z2) - l[o + 1] * z1) * l[o];
    b[i] = z;
    z3 = z2; z2 = z1; z1 = z;
  }
}

/**
 * The back substitution of {@link forward3}, rows n - 4 down to 0 (the general loops solve the last rows).
 * x_i = (z_i - L(i+1, i) x_{i+1} - L(i+2, i) x_{i+2} - L(i+3, i) x_{i+3}) / L(i, i). Unchecked.
 */
function backward3(l: Float64Array, n: number, b: Float64Array): void {
  let x1 = b[n - 3], x2 = b[n - 2], x3 = b[n - 1];
  for (let i = n - 4; i >= 0; i--) {
    const x = (((b[i] - l[4 * (i + 1) + 1] * x1) - l[4 * (i + 2) + 2] * x2) - l[4 * (i + 3) + 3] * x3) * l[4 * i];
    b[i] = x;
    x3 = x2; x2 = x1; x1 = x;
  }
}

/** {@link forward3} for half-bandwidth 4 (rows 4 .. n - 1). Unchecked. */
function forward4(l: Float64Array, n: number, b: Float64Array): void {
  let z4 = b[0], z3 = b[1], z2 = b[2], z1 = b[3];
  for (let i = 4; i < n; i++) {
    const o = 5 * i;
    const z = ((((b[i] - l[o + 4] * z4) - l[o + 3] * z3) - l[o + 2] * z2) - l[o + 1] * z1) * l[o];
    b[i] = z;
    z4 = z3; z3 = z2; z2 = z1; z1 = z;
  }
}

/** {@link backward3} for half-bandwidth 4 (rows n - 5 down to 0). Unchecked. */
function backward4(l: Float64Array, n: number, b: Float64Array): void {
  let x1 = b[n - 4], x2 = b[n - 3], x3 = b[n - 2], x4 = b[n - 1];
  for (let i = n - 5; i >= 0; i--) {
    const x = ((((b[i] - l[5 * (i + 1) + 1] * x1) - l[5 * (i + 2) + 2] * x2) - l[5 * (i + 3) + 3] * x3) - l[5 * (i + 4) + 4] * x4) * l[5 * i];
    b[i] = x;
    x4 = x3; x3 = x2; x2 = x1; x1 = x;
  }
}
