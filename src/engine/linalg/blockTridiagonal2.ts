/**
 * Symmetric block-tridiagonal matrices with 2 x 2 blocks, possibly indefinite:
 * block LDL' factorisation, solves and the diagonal blocks of the inverse.
 *
 * The matrix has diagonal blocks B_k (symmetric) and sub-diagonal blocks C_k
 * (block row k, block column k-1), k = 0..m-1. Storage is flat, row-major per
 * block: `b[4k..4k+3] = [B_k00, B_k01, B_k10, B_k11]`, likewise `c` (C_0 unused).
 *
 * Factorisation (no pivoting across blocks; each 2 x 2 pivot is inverted
 * exactly):   D_0 = B_0,   L_k = C_k D_{k-1}^{-1},   D_k = B_k - L_k C_k'.
 * This is stable for the saddle-point systems it serves, whose 2 x 2 pivots are
 * strongly indefinite (determinant < 0), in the way fixed 2 x 2 pivots are in
 * Bunch-Kaufman factorisations.
 *
 * Diagonal blocks of the inverse, from the last block up (the block form of
 * the Hutchinson & de Hoog 1985 / Takahashi 1973 recursion):
 *   S_{m-1} = D_{m-1}^{-1},   S_k = D_k^{-1} + L_{k+1}' S_{k+1} L_{k+1}.
 *
 * Work and memory O(m). Unchecked: a singular 2 x 2 pivot throws a
 * `numerical` error only as a last guard.
 */
import { KnotwiseError } from '../errors';

export interface BlockLDL2 {
  m: number;
  /** D_k^{-1}, flat 2 x 2 blocks. */
  dinv: Float64Array;
  /** L_k, flat 2 x 2 blocks (L_0 unused). */
  l: Float64Array;
}

/** Factorises the block-tridiagonal matrix (b, c) as L D L', into `work` when given. Unchecked. */
export function blockLDL2(b: Float64Array, c: Float64Array, work?: BlockLDL2): BlockLDL2 {
  const m = b.length / 4;
  const dinv = work ? work.dinv : new Float64Array(4 * m);
  const l = work ? work.l : new Float64Array(4 * m);
  // the loop is a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  factorBlocks(b, c, m, dinv, l);
  return { m, dinv, l };
}

/** The loop of {@link blockLDL2}: D_k^{-1} into dinv and L_k into l. Unchecked. */
function factorBlocks(b: Float64Array, c: Float64Array, m: number, dinv: Float64Array, l: Float64Array): void {
  let p0 = 0, p1 = 0, p3 = 0; // previous D^{-1} (symmetric: p1 = p2)
  for (let k = 0; k < m; k++) {
    const o = 4 * k;
    let d0 = b[o], d1 = b[o + 1], d3 = b[o + 3];
    if (k > 0) {
      const c0 = c[o], c1 = c[o + 1], c2 = c[o + 2], c3 = c[o + 3];
      // L = C Dprev^{-1}
      const l0 = c0 * p0 + c1 * p1, l1 = c0 * p1 + c1 * p3;
      const l2 = c2 * p0 + c3 * p1, l3 = c2 * p1 + c3 * p3;
      l[o] = l0; l[o + 1] = l1; l[o + 2] = l2; l[o + 3] = l3;
      // D = B - L C'
      d0 -= l0 * c0 + l1 * c1;
      d1 -= l0 * c2 + l1 * c3;
      d3 -= l2 * c2 + l3 * c3;
    }
    const det = d0 * d3 - d1 * d1;
    if (!(Math.abs(det) > 0) || !Number.isFinite(det)) {
      throw new KnotwiseError('numerical', `block system is singular at block ${k + 1}; the x values may be too close together for their scale.`);
    }
    p0 = d3 / det; p1 = -d1 / det; p3 = d0 / det;
    dinv[o] = p0; dinv[o + 1] = p1; dinv[o + 2] = p1; dinv[o + 3] = p3;
  }
}

/** Solves the system for a right-hand side of length 2m (pairs per block). Unchecked. */
export function blockSolve2(f: BlockLDL2, rhs: Float64Array, out: Float64Array = new Float64Array(rhs.length)): Float64Array {
  const { m, dinv, l } = f;
  out.set(rhs);
  // each sweep is a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  blockForward(l, m, out);
  blockDiagonal(dinv, m, out);
  blockBackward(l, m, out);
  return out;
}

/** Forward sweep of {@link blockSolve2}: x_k -= L_k x_{k-1}. Unchecked. */
function blockForward(l: Float64Array, m: number, out: Float64Array): void {
  for (let k = 1; k < m; k++) {
    const o = 4 * k, j = 2 * k;
    out[j] -= l[o] * out[j - 2] + l[o + 1] * out[j - 1];
    out[j + 1] -= l[o + 2] * out[j - 2] + l[o + 3] * out[j - 1];
  }
}

/** Diagonal sweep of {@link blockSolve2}: x_k = D_k^{-1} x_k. Unchecked. */
function blockDiagonal(dinv: Float64Array, m: number, out: Float64Array): void {
  for (let k = 0; k < m; k++) {
    const o = 4 * k, j = 2 * k;
    const a = out[j], b = out[j + 1];
    out[j] = dinv[o] * a + dinv[o + 1] * b;
    out[j + 1] = dinv[o + 2] * a + dinv[o + 3] * b;
  }
}

/** Backward sweep of {@link blockSolve2}: x_k -= L_{k+1}' x_{k+1}. Unchecked. */
function blockBackward(l: Float64Array, m: number, out: Float64Array): void {
  for (let k = m - 2; k >= 0; k--) {
    const o = 4 * (k + 1), j = 2 * k;
    const a = out[j + 2], b = out[j + 3];
    out[j] -= l[o] * a + l[o + 2] * b;
    out[j + 1] -= l[o + 1] * a + l[o + 3] * b;
  }
}

/** Diagonal blocks of the inverse, flat 2 x 2 per block. Unchecked. */
export function blockInverseDiagonal2(f: BlockLDL2, s: Float64Array = new Float64Array(4 * f.m)): Float64Array {
  const { m, dinv, l } = f;
  const last = 4 * (m - 1);
  s[last] = dinv[last]; s[last + 1] = dinv[last + 1]; s[last + 2] = dinv[last + 2]; s[last + 3] = dinv[last + 3];
  for (let k = m - 2; k >= 0; k--) {
    const o = 4 * k, q = 4 * (k + 1);
    const l0 = l[q], l1 = l[q + 1], l2 = l[q + 2], l3 = l[q + 3];
    const s0 = s[q], s1 = s[q + 1], s3 = s[q + 3];
    // T = S_{k+1} L  (2 x 2), then L' T
    const t0 = s0 * l0 + s1 * l2, t1 = s0 * l1 + s1 * l3;
    const t2 = s1 * l0 + s3 * l2, t3 = s1 * l1 + s3 * l3;
    const u0 = l0 * t0 + l2 * t2;
    const u1 = l0 * t1 + l2 * t3;
    const u3 = l1 * t1 + l3 * t3;
    s[o] = dinv[o] + u0; s[o + 1] = dinv[o + 1] + u1; s[o + 2] = dinv[o + 2] + u1; s[o + 3] = dinv[o + 3] + u3;
  }
  return s;
}
