/**
 * The order-2 (Hodrick-Prescott) case of Whittaker-Henderson graduation in two
 * fused passes over the data, with no band matrix assembled first and no allocation
 * inside the loops. Unchecked.
 */
import type { WhittakerInput } from './whittakerInput';
import { FIRST_CALL_POINTS } from '../../linalg/firstCallPoints';
import { sum } from '../../linalg/sum';

/** Arrays a caller may pass to {@link pentadiagonalSolve} to be reused across solves of one length n. */
export interface PentadiagonalWork {
  /** The factor, length 3n. */
  l: Float64Array;
  /** The solution, length n (returned as `fitted`: copy it before the next solve if it is kept). */
  z: Float64Array;
  /** The leverages, length n. */
  lev: Float64Array;
}

/** Output of {@link pentadiagonalSolve}. */
export interface PentadiagonalSolution {
  /** The solution z of (W + lam D'D) z = W y. */
  fitted: Float64Array;
  /** h_ii = w_i (A^{-1})_ii, when asked for. */
  leverage?: Float64Array;
  /** Sum of the leverages (trace of the hat matrix), when asked for. */
  df?: number;
  /** Componentwise backward error, as in whittakerSolve. */
  residual: number;
  /** Row (0-based) where a pivot was not positive, or -1. */
  failedRow: number;
}

/**
 * Solves (W + lam D'D) z = W y for second differences D (rows (c0_r, c1_r, c2_r) on
 * columns r, r+1, r+2; r = 0..n-3), A pentadiagonal, by a Cholesky factorisation
 * A = L L' (Golub & Van Loan, "Matrix Computations", 4th ed., 4.3.5):
 *
 * 1. forward: row i of A is formed from the three rows of D that touch column i
 *    (A(i, i) = w_i + lam (c2_{i-2}^2 + c1_{i-1}^2 + c0_i^2), A(i, i-1) = lam (c1_{i-2} c2_{i-2}
 *    + c0_{i-1} c1_{i-1}), A(i, i-2) = lam c0_{i-2} c2_{i-2}), factorised at once
 *    (L(i, i-2) = A(i, i-2) / L(i-2, i-2), L(i, i-1) = (A(i, i-1) - L(i, i-2) L(i-1, i-2)) / L(i-1, i-1),
 *    L(i, i) = sqrt(A(i, i) - L(i, i-1)^2 - L(i, i-2)^2)) and the forward substitution
 *    L u = W y advanced in the same step;
 * 2. backward: L' z = u, and in the same pass the backward error (step 3) and, when asked, the diagonal of A^{-1} from
 *    the band of the inverse (Takahashi, Fagan & Chin 1973; Hutchinson & de Hoog 1985:
 *    S(i, i+2) = -(a S(i+1, i+2) + b S(i+2, i+2)) r, S(i, i+1) = -(a S(i+1, i+1) + b S(i+1, i+2)) r,
 *    S(i, i) = (r - a S(i, i+1) - b S(i, i+2)) r with a = L(i+1, i), b = L(i+2, i), r = 1 / L(i, i));
 * 3. the componentwise backward error max_i |W y - A z|_i / (|W||z| + lam |D|'|D||z| + |W y|)_i
 *    recomputed from the rows of D (residual i + 2 as soon as z_i is known; the same arithmetic
 *    as {@link backwardError2}).
 *
 * The arithmetic, operation by operation, is that of whittakerBand + bandedCholesky +
 * bandedCholeskySolve + bandedInverseDiagonal, so the results are the same to the last bit;
 * it reads and writes each array once per pass instead of assembling and rereading a band.
 * O(n) time, memory 3n + 2n doubles (the factor, z and the leverages).
 *
 * @param inp - checked and scaled input of order 2 (see whittakerInput); D is read from its spacings, its rows are not built
 * @param lam - penalty on the internal scale, > 0
 * @param withLeverage - also compute the leverages and their sum
 * @param work - arrays to reuse (a search over lambda solves many times at one n); absent: fresh arrays
 * @param withResidual - also compute the backward error (default true; a search that reads only
 *   the fit and df can leave it out, `residual` is then NaN)
 * @example
 * ```ts
 * const inp = whittakerInput(x, y, null, 2);
 * const s = pentadiagonalSolve(inp, scaledLambda(inp, 1600), true); // s.fitted, s.df
 * ```
 * Unchecked.
 */
export function pentadiagonalSolve(inp: WhittakerInput, lam: number, withLeverage: boolean, work?: PentadiagonalWork, withResidual = true): PentadiagonalSolution {
  const { n, spacing: sp, w, y } = inp;
  const m = n - 2; // rows of D
  const l = work ? work.l : new Float64Array(3 * n); // [1 / L(i, i), L(i, i-1), L(i, i-2)] per row i
  const z = work ? work.z : new Float64Array(n);
  // the two passes are kernels of their own, the backward one first over a few points with its
  // running values carried in st (DEVELOPERS.md, "Long loops and the first call")
  const failedRow = factorForward(sp, w, y, lam, n, l, z);
  if (failedRow >= 0) return { fitted: z, residual: Infinity, failedRow };
  const lev = withLeverage ? (work ? work.lev : new Float64Array(n)) : null;
  const st = new Float64Array(BACKWARD_STATE);
  const last = Math.max(-1, n - 1 - FIRST_CALL_POINTS);
  backwardPass(sp, w, y, lam, n, l, z, lev, withResidual, n - 1, last, st);
  backwardPass(sp, w, y, lam, n, l, z, lev, withResidual, last, -1, st);
  const x1 = st[0], x2 = st[1];
  let worst = st[5];
  const dzP = st[6], adzP = st[7], dzPP = st[8], adzPP = st[9], c0P = st[10], c1P = st[11], c0PP = st[12];
  if (withResidual) {
    // the first two columns (rows 0 and 1 of D are now P and PP); x1 = z_0, x2 = z_1
    if (n > 1) {
      let r1 = w[1] * (y[1] - x2);
      let m1 = Math.abs(w[1] * y[1]) + Math.abs(w[1] * x2);
      if (0 < m) { r1 -= c1P * dzP; m1 += Math.abs(c1P) * adzP; }
      if (1 < m) { r1 -= c0PP * dzPP; m1 += Math.abs(c0PP) * adzPP; }
      if (m1 > 0) { const e = Math.abs(r1) / m1; if (e > worst) worst = e; }
    }
    let r0 = w[0] * (y[0] - x1);
    let m0 = Math.abs(w[0] * y[0]) + Math.abs(w[0] * x1);
    if (0 < m) { r0 -= c0P * dzP; m0 += Math.abs(c0P) * adzP; }
    if (m0 > 0) { const e = Math.abs(r0) / m0; if (e > worst) worst = e; }
  }
  const out: PentadiagonalSolution = { fitted: z, residual: withResidual ? worst : NaN, failedRow: -1 };
  if (lev) { out.leverage = lev; out.df = sum(lev); } // summed in row order, as before
  return out;
}

/**
 * Entries of the state of {@link backwardPass}: x1, x2 (z at i+1, i+2); s11, s12, s22 (S(i+1, i+1),
 * S(i+1, i+2), S(i+2, i+2)); the worst backward error so far; dzP, adzP, dzPP, adzPP (lam (D z) and
 * lam |D||z| of rows i+1 and i+2); c0P, c1P (c0 and c1 of row i+1), c0PP (c0 of row i+2).
 */
const BACKWARD_STATE = 13;

/**
 * Step 1 of {@link pentadiagonalSolve}: rows of A formed, factorised and the forward substitution
 * L u = W y advanced, row by row; returns the row where a pivot was not positive, or -1. Unchecked.
 */
function factorForward(sp: Float64Array | null, w: Float64Array, y: Float64Array, lam: number, n: number, l: Float64Array, z: Float64Array): number {
  const m = n - 2;
  // rolling row coefficients of D: rows i-2 (a*), i-1 (b*)
  let a0 = 0, a1 = 0, a2 = 0, b0 = 0, b1 = 0, b2 = 0;
  let r1 = 0, r2 = 0, c1 = 0; // 1 / L(i-1, i-1), 1 / L(i-2, i-2), L(i-1, i-2)
  let u1 = 0, u2 = 0; // forward solution at i-1, i-2
  for (let i = 0; i < n; i++) {
    let d0 = 0, d1 = 0, d2 = 0; // row i of D (absent for i >= n - 2)
    if (i < m) {
      // row i of D from the spacings, as whittakerInput's rows are built (equal spacing: 1, -2, 1)
      if (sp) { d0 = sp[i]; d2 = sp[i + 1]; d1 = -(d0 + d2); } else { d0 = 1; d1 = -2; d2 = 1; }
    }
    // A(i, i), A(i, i-1), A(i, i-2), accumulated in the order whittakerBand adds them
    let aii = w[i];
    let ai1 = 0, ai2 = 0;
    if (i >= 2) { const ls = lam * a2; aii += ls * a2; ai1 += ls * a1; ai2 += ls * a0; }
    if (i >= 1 && i - 1 < m) { const lq = lam * b1; aii += lq * b1; ai1 += lq * b0; }
    if (i < m) { const lp = lam * d0; aii += lp * d0; }
    let l2 = 0, l1 = 0;
    if (i >= 2) l2 = ai2 * r2;
    if (i >= 1) l1 = (ai1 - l2 * c1) * r1;
    const s = aii - l1 * l1 - l2 * l2;
    if (!(s > 0)) return i;
    const r = 1 / Math.sqrt(s);
    const o = 3 * i;
    l[o] = r; l[o + 1] = l1; l[o + 2] = l2;
    const u = (w[i] * y[i] - l1 * u1 - l2 * u2) * r;
    z[i] = u;
    u2 = u1; u1 = u;
    r2 = r1; r1 = r; c1 = l1;
    a0 = b0; a1 = b1; a2 = b2; b0 = d0; b1 = d1; b2 = d2;
  }
  return -1;
}

/**
 * Steps 2 and 3 of {@link pentadiagonalSolve} for rows from down to to + 1: the backward substitution,
 * with the diagonal of the inverse (into lev, when given) and the backward error in the same pass, its
 * running values read from and written back to st ({@link BACKWARD_STATE}). Unchecked.
 */
function backwardPass(sp: Float64Array | null, w: Float64Array, y: Float64Array, lam: number, n: number, l: Float64Array, z: Float64Array, lev: Float64Array | null, withResidual: boolean, from: number, to: number, st: Float64Array): void {
  const m = n - 2;
  let x1 = st[0], x2 = st[1]; // z at i+1, i+2
  let s11 = st[2], s12 = st[3], s22 = st[4]; // S(i+1, i+1), S(i+1, i+2), S(i+2, i+2)
  // backward error, as in backwardError2: residual j = i + 2 is complete once z_i is known;
  // lam (D z) and lam |D||z| of rows i+1 (P) and i+2 (PP), c0 and c1 of row i+1, c0 of row i+2
  let worst = st[5], dzP = st[6], adzP = st[7], dzPP = st[8], adzPP = st[9], c0P = st[10], c1P = st[11], c0PP = st[12];
  for (let i = from; i > to; i--) {
    const r = l[3 * i];
    const a = i + 1 < n ? l[3 * (i + 1) + 1] : 0; // L(i+1, i)
    const b = i + 2 < n ? l[3 * (i + 2) + 2] : 0; // L(i+2, i)
    const xi = (z[i] - a * x1 - b * x2) * r;
    z[i] = xi;
    if (withResidual) {
      let dzI = 0, adzI = 0, c0 = 0, c1 = 0, c2 = 0;
      if (i < m) {
        if (sp) { c0 = sp[i]; c2 = sp[i + 1]; c1 = -(c0 + c2); } else { c0 = 1; c1 = -2; c2 = 1; }
        const t0 = c0 * xi, t1 = c1 * x1, t2 = c2 * x2;
        dzI = lam * (t0 + t1 + t2); adzI = lam * (Math.abs(t0) + Math.abs(t1) + Math.abs(t2));
      }
      const j = i + 2;
      if (j < n) {
        // rows j-2 = i, j-1 and j touch column j
        let rj = w[j] * (y[j] - x2);
        let mj = Math.abs(w[j] * y[j]) + Math.abs(w[j] * x2);
        rj -= c2 * dzI; mj += Math.abs(c2) * adzI;
        if (j - 1 < m) { rj -= c1P * dzP; mj += Math.abs(c1P) * adzP; }
        if (j < m) { rj -= c0PP * dzPP; mj += Math.abs(c0PP) * adzPP; }
        if (mj > 0) { const e = Math.abs(rj) / mj; if (e > worst) worst = e; }
      }
      dzPP = dzP; adzPP = adzP; dzP = dzI; adzP = adzI; c0PP = c0P; c0P = c0; c1P = c1;
    }
    x2 = x1; x1 = xi;
    if (lev) {
      const e2 = -(a * s12 + b * s22) * r;
      const e1 = -(a * s11 + b * s12) * r;
      const e0 = (r - a * e1 - b * e2) * r;
      const h = e0 * w[i];
      lev[i] = h;
      s22 = s11; s12 = e1; s11 = e0;
    }
  }
  st[0] = x1; st[1] = x2; st[2] = s11; st[3] = s12; st[4] = s22;
  st[5] = worst; st[6] = dzP; st[7] = adzP; st[8] = dzPP; st[9] = adzPP; st[10] = c0P; st[11] = c1P; st[12] = c0PP;
}

/** Componentwise backward error for order 2 in one pass (see pentadiagonalSolve). Unchecked. */
export function backwardError2(inp: WhittakerInput, lam: number, z: Float64Array): number {
  const { n, spacing: sp, w, y } = inp;
  let worst = 0;
  let dzA = 0, adzA = 0, dzB = 0, adzB = 0; // lam (D z) and lam |D||z| of rows i-2 and i-1
  let cA = 0, cB = 0, c2Prev = 0; // c2 of row i-2 and c1 of row i-1 (the entries of those rows in column i); c2 of row i-1
  for (let i = 0; i < n; i++) {
    let dzC = 0, adzC = 0, c0 = 0, c1 = 0, c2 = 0;
    if (i < n - 2) {
      if (sp) { c0 = sp[i]; c2 = sp[i + 1]; c1 = -(c0 + c2); } else { c0 = 1; c1 = -2; c2 = 1; }
      const t0 = c0 * z[i], t1 = c1 * z[i + 1], t2 = c2 * z[i + 2];
      dzC = lam * (t0 + t1 + t2); adzC = lam * (Math.abs(t0) + Math.abs(t1) + Math.abs(t2));
    }
    let ri = w[i] * (y[i] - z[i]);
    let mi = Math.abs(w[i] * y[i]) + Math.abs(w[i] * z[i]);
    if (i >= 2) { ri -= cA * dzA; mi += Math.abs(cA) * adzA; }
    if (i >= 1 && i - 1 < n - 2) { ri -= cB * dzB; mi += Math.abs(cB) * adzB; }
    if (i < n - 2) { ri -= c0 * dzC; mi += Math.abs(c0) * adzC; }
    if (mi > 0) { const e = Math.abs(ri) / mi; if (e > worst) worst = e; }
    dzA = dzB; adzA = adzB; dzB = dzC; adzB = adzC;
    cA = c2Prev; c2Prev = c2; cB = c1; // for row i + 1: c2 of row i - 1, c1 of row i

  }
  return worst;
}
