/**
 * Symmetric positive definite banded matrices: LDL' factorisation, solves,
 * and the band of the inverse ("selected inverse").
 *
 * Storage: a matrix of order n with half-bandwidth p is held as p + 1 arrays,
 * `band[k][i] = A[i][i - k]` for k = 0..p (k = 0 is the diagonal; entries with
 * i < k are unused). Work is O(n p^2) and memory O(n p); no dense matrix is formed.
 */
import { KnotwiseError } from '../errors';

/** A factorisation A = L D L' with L unit lower triangular of bandwidth p. */
export interface BandedLDL {
  n: number;
  p: number;
  /** Pivots D (all > 0 for an SPD matrix). */
  d: Float64Array;
  /** `l[k][i] = L[i][i - k]`, k = 1..p (`l[0]` is unused). */
  l: Float64Array[];
}

/**
 * Factorises a symmetric positive definite banded matrix as L D L'.
 *
 * Pivots are D_i = A_ii - sum_k L_{i,i-k}^2 D_{i-k}. A pivot that is not
 * positive (beyond rounding: below `n * eps * max|A_ii|`) means the matrix is
 * not positive definite, and a `numerical` {@link KnotwiseError} is thrown.
 *
 * @param band - lower bands as described in the module doc; not modified
 * @example
 * ```ts
 * // [[4,1],[1,3]]: band[0] = [4,3], band[1] = [0,1]
 * const f = bandedLDL([Float64Array.of(4, 3), Float64Array.of(0, 1)]);
 * ```
 */
export function bandedLDL(band: readonly Float64Array[]): BandedLDL {
  const p = band.length - 1;
  const n = band[0].length;
  const d = new Float64Array(n);
  const l: Float64Array[] = [new Float64Array(0)];
  for (let k = 1; k <= p; k++) l.push(new Float64Array(n));
  let maxDiag = 0;
  for (let i = 0; i < n; i++) maxDiag = Math.max(maxDiag, Math.abs(band[0][i]));
  const floor = maxDiag * 1e-15;
  if (p === 2) {
    // Pentadiagonal case, unrolled: the smoothing spline's system.
    const a0 = band[0], a1 = band[1], a2 = band[2];
    const l1 = l[1], l2 = l[2];
    for (let i = 0; i < n; i++) {
      let v2 = 0, v1 = 0;
      if (i >= 2) v2 = a2[i] / d[i - 2];
      if (i >= 1) v1 = (a1[i] - (i >= 2 ? v2 * l1[i - 1] * d[i - 2] : 0)) / d[i - 1];
      l2[i] = v2; l1[i] = v1;
      const di = a0[i] - (i >= 1 ? v1 * v1 * d[i - 1] : 0) - (i >= 2 ? v2 * v2 * d[i - 2] : 0);
      if (!(di > floor)) throw notPositive(i, di);
      d[i] = di;
    }
    return { n, p, d, l };
  }
  for (let i = 0; i < n; i++) {
    for (let k = Math.min(p, i); k >= 1; k--) {
      const j = i - k;
      let s = band[k][i];
      for (let m = 1; k + m <= p && j - m >= 0; m++) s -= l[k + m][i] * l[m][j] * d[j - m];
      l[k][i] = s / d[j];
    }
    let di = band[0][i];
    for (let k = 1; k <= Math.min(p, i); k++) di -= l[k][i] * l[k][i] * d[i - k];
    if (!(di > floor)) throw notPositive(i, di);
    d[i] = di;
  }
  return { n, p, d, l };
}

function notPositive(i: number, di: number): KnotwiseError {
  return new KnotwiseError('numerical', `banded system is not positive definite (pivot ${i + 1} is ${di}); the x values may be too close together for their scale.`);
}

/** Solves A z = b with a {@link bandedLDL} factorisation. Unchecked: `b.length` must equal n. */
export function bandedSolve(f: BandedLDL, b: ArrayLike<number>, out: Float64Array = new Float64Array(f.n)): Float64Array {
  const { n, p, d, l } = f;
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 1; k <= p && k <= i; k++) s -= l[k][i] * out[i - k];
    out[i] = s;
  }
  for (let i = 0; i < n; i++) out[i] /= d[i];
  for (let i = n - 1; i >= 0; i--) {
    let s = out[i];
    for (let k = 1; k <= p && i + k < n; k++) s -= l[k][i + k] * out[i + k];
    out[i] = s;
  }
  return out;
}

/**
 * The central band of A^{-1} (entries Sigma_ij with |i - j| <= p), in O(n p^2).
 *
 * Recursion of Hutchinson & de Hoog (1985), from the last row up:
 *   Sigma_ij = - sum_{k=1..p} L_{i+k,i} Sigma_{i+k,j}    (j = i+1..i+p)
 *   Sigma_ii = 1 / D_i - sum_{k=1..p} L_{i+k,i} Sigma_{i+k,i}
 *
 * Reference: M. F. Hutchinson and F. R. de Hoog, "Smoothing noisy data with
 * spline functions", Numerische Mathematik 47 (1985) 99-106.
 *
 * @returns `s[k][i] = Sigma[i][i + k]` for k = 0..p
 */
export function bandedInverseBand(f: BandedLDL): Float64Array[] {
  const { n, p, d, l } = f;
  const s: Float64Array[] = [];
  for (let k = 0; k <= p; k++) s.push(new Float64Array(n));
  const get = (a: number, b: number): number => (a <= b ? s[b - a][a] : s[a - b][b]);
  for (let i = n - 1; i >= 0; i--) {
    for (let j = Math.min(n - 1, i + p); j > i; j--) {
      let v = 0;
      for (let k = 1; k <= p && i + k < n; k++) v -= l[k][i + k] * get(i + k, j);
      s[j - i][i] = v;
    }
    let v = 1 / d[i];
    for (let k = 1; k <= p && i + k < n; k++) v -= l[k][i + k] * s[k][i];
    s[0][i] = v;
  }
  return s;
}

/** y = A x for a symmetric banded A in the module's storage. Unchecked. */
export function bandedMultiply(band: readonly Float64Array[], x: ArrayLike<number>, out: Float64Array = new Float64Array(x.length)): Float64Array {
  const p = band.length - 1;
  const n = x.length;
  for (let i = 0; i < n; i++) {
    let v = band[0][i] * x[i];
    for (let k = 1; k <= p; k++) {
      if (i - k >= 0) v += band[k][i] * x[i - k];
      if (i + k < n) v += band[k][i + k] * x[i + k];
    }
    out[i] = v;
  }
  return out;
}
