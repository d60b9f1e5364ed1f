/**
 * The banded normal equations of Whittaker-Henderson graduation,
 * (W + lambda D'D) z = W y, on the internal scale of {@link whittakerInput}.
 * Unchecked.
 */
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { KnotwiseError, showNumber } from '../../errors';
import { bandedInverseBand } from './bandedInverseBand';
import type { WhittakerInput } from './whittakerInput';

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

/** Solves the system, optionally with the leverages from the band of the inverse. Unchecked. */
export function whittakerSolve(inp: WhittakerInput, lam: number, withLeverage: boolean): WhittakerSolution {
  const { n, order: d, w, y } = inp;
  const wd = d + 1;
  const band = whittakerBand(inp, lam);
  const bad = bandedCholesky(band, n, d);
  if (bad >= 0) {
    throw new KnotwiseError('numerical', `the graduation system is not numerically positive definite at row ${bad + 1} (lambda on the internal scale ${showNumber(lam)}); use a smaller lambda or check for points with zero weight.`);
  }
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = w[i] * y[i];
  bandedCholeskySolve(band, n, d, z);
  const worst = backwardError(inp, lam, z);
  const out: WhittakerSolution = { fitted: z, residual: worst };
  if (withLeverage) {
    const sig = bandedInverseBand(band, n, d);
    const lev = new Float64Array(n);
    let df = 0;
    for (let i = 0; i < n; i++) { lev[i] = w[i] * sig[i * wd]; df += lev[i]; }
    out.leverage = lev;
    out.df = df;
  }
  return out;
}

/**
 * Componentwise backward error of (W + lam D'D) z = W y, from the rows of D (no stored
 * matrix): max_i |W y - A z|_i / (|W||z| + lam |D|'|D||z| + |W y|)_i. Unchecked.
 */
function backwardError(inp: WhittakerInput, lam: number, z: Float64Array): number {
  const { n, order: d, rows, w, y } = inp;
  const wd = d + 1;
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
