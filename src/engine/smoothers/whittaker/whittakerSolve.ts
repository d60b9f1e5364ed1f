/**
 * The banded normal equations of Whittaker-Henderson graduation,
 * (W + lambda D'D) z = W y, on the internal scale of {@link whittakerInput}.
 * Unchecked.
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { KnotwiseError, showNumber } from '../../errors';
import { bandedInverseDiagonal } from './bandedInverseBand';
import type { WhittakerInput } from './whittakerInput';
import { backwardError2, pentadiagonalSolve, type PentadiagonalWork } from './pentadiagonalSolve';

export interface WhittakerSolution {
  fitted: Float64Array;
  /** h_ii = w_i (A^{-1})_ii, when asked for. */
  leverage?: Float64Array;
  df?: number;
  /** Componentwise backward error max_i |W y - A z|_i / (|W||z| + lam |D|'|D||z| + |W y|)_i, recomputed from the solution. */
  residual: number;
}

/** Lower band (half-bandwidth d) of W + lam D'D; D'D from the rows of D. Unchecked. */
export function whittakerBand(inp: WhittakerInput, lam: number): Float64Array {
  const { n, order: d, rows, w } = inp;
  const wd = d + 1;
  const a = new Float64Array(n * wd);
  for (let i = 0; i < n; i++) a[i * wd] = w[i];
  if (d === 2) {
    // row r = (p, q, s) on columns r, r+1, r+2 adds lam * its outer product
    for (let r = 0; r < n - 2; r++) {
      const o = 3 * r, p = rows[o], q = rows[o + 1], s = rows[o + 2];
      const lp = lam * p, lq = lam * q, ls = lam * s;
      a[o] += lp * p;                       // (r, r)
      a[o + 3] += lq * q; a[o + 4] += lq * p; // (r+1, r+1), (r+1, r)
      a[o + 6] += ls * s; a[o + 7] += ls * q; a[o + 8] += ls * p; // (r+2, r+2), (r+2, r+1), (r+2, r)
    }
    return a;
  }
  const m = n - d;
  for (let r = 0; r < m; r++) {
    const o = r * wd;
    for (let c1 = 0; c1 <= d; c1++) {
      const v1 = lam * rows[o + c1];
      const i = r + c1;
      for (let c2 = 0; c2 <= c1; c2++) a[i * wd + (c1 - c2)] += v1 * rows[o + c2];
    }
  }
  return a;
}

/**
 * Solves the system, optionally with the leverages from the band of the inverse.
 * `work` (order 2 only) lends arrays reused across solves, and `withResidual` false skips the
 * backward error (then NaN), for searches over lambda that read only the fit and df. Unchecked.
 */
export function whittakerSolve(inp: WhittakerInput, lam: number, withLeverage: boolean, work?: PentadiagonalWork, withResidual = true): WhittakerSolution {
  const { n, order: d, w, y } = inp;
  if (d === 2) {
    // the Hodrick-Prescott case: fused passes, no band assembled first
    const s = pentadiagonalSolve(inp, lam, withLeverage, work, withResidual);
    if (s.failedRow >= 0) notPositiveDefinite(s.failedRow, lam);
    const out: WhittakerSolution = { fitted: s.fitted, residual: s.residual };
    if (withLeverage) { out.leverage = s.leverage; out.df = s.df; }
    return out;
  }
  const band = whittakerBand(inp, lam);
  const bad = bandedCholesky(band, n, d);
  if (bad >= 0) notPositiveDefinite(bad, lam);
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = w[i] * y[i];
  bandedCholeskySolve(band, n, d, z);
  const worst = backwardError(inp, lam, z);
  const out: WhittakerSolution = { fitted: z, residual: worst };
  if (withLeverage) {
    const lev = bandedInverseDiagonal(band, n, d);
    let df = 0;
    for (let i = 0; i < n; i++) { lev[i] *= w[i]; df += lev[i]; }
    out.leverage = lev;
    out.df = df;
  }
  return out;
}

function notPositiveDefinite(row: number, lam: number): never {
  throw new KnotwiseError('numerical', `the graduation system is not numerically positive definite at row ${row + 1} (lambda on the internal scale ${showNumber(lam)}); use a smaller lambda or check for points with zero weight.`);
}

/**
 * Componentwise backward error of (W + lam D'D) z = W y, from the rows of D (no stored
 * matrix): max_i |W y - A z|_i / (|W||z| + lam |D|'|D||z| + |W y|)_i. Unchecked.
 */
function backwardError(inp: WhittakerInput, lam: number, z: Float64Array): number {
  const { n, order: d, rows, w, y } = inp;
  const wd = d + 1;
  if (d === 2) return backwardError2(inp, lam, z);
  const r = new Float64Array(n), mag = new Float64Array(n);
  for (let i = 0; i < n; i++) { r[i] = w[i] * (y[i] - z[i]); mag[i] = Math.abs(w[i] * y[i]) + Math.abs(w[i] * z[i]); }
  for (let k = 0; k < n - d; k++) {
    const o = k * wd;
    let dz = 0, adz = 0;
    for (let c = 0; c <= d; c++) { const t = rows[o + c] * z[k + c]; dz += t; adz += Math.abs(t); }
    for (let c = 0; c <= d; c++) { const a = lam * rows[o + c]; r[k + c] -= a * dz; mag[k + c] += Math.abs(a) * adz; }
  }
  let worst = 0;
  for (let i = 0; i < n; i++) if (mag[i] > 0) worst = Math.max(worst, Math.abs(r[i]) / mag[i]);
  return worst;
}
