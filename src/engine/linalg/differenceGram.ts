import { applyRowsTransposed } from './applyRowsTransposed';

/**
 * The band of Q = D W^{-1} D^T for D = D(x, q) given row by row
 * (see {@link differenceRows}): Q is (n - q) x (n - q) with half-bandwidth q,
 * stored in the lower-band layout of {@link bandedCholesky}
 * (Q(i, i - d) at `band[i * (q + 1) + d]`). O(n q^2).
 *
 * @param rows - entries of D, width q + 1 per row
 * @param winv - 1 / w_i (length n)
 * @param q - order of the difference
 * Unchecked.
 */
export function differenceGram(rows: Float64Array, winv: Float64Array, q: number): Float64Array {
  const n = winv.length;
  const m = n - q;
  const wd = q + 1;
  const band = new Float64Array(m * wd);
  for (let i = 0; i < m; i++) {
    for (let d = 0; d <= q && d <= i; d++) {
      const j = i - d;
      let s = 0;
      // columns shared by row i (i .. i+q) and row j (j .. j+q): i .. j+q
      for (let col = i; col <= j + q; col++) s += rows[i * wd + (col - i)] * rows[j * wd + (col - j)] * winv[col];
      band[i * wd + d] = s;
    }
  }
  return band;
}

/**
 * out = Q z = D (W^{-1} (D^T z)) with the rows of D, O(n q); each entry of W^{-1} D^T z is scaled
 * just before its first use. With `p` and `sums`, a pass after it forms, for v = p - Q z,
 * sums = [||v||_1, z.v, z.Q z] (the trend interior point's objective and duality gap need no more).
 *
 * Each pass is a function of its own ending with its loop: in a fresh process a long loop's first
 * compiled code is made while the loop runs, before any code after it has run, and Node's engine kept
 * entering that code and throwing it away on later calls (up to 1,188 times in one cross-validation of
 * order 3 at 1e4, when the sums were formed after the gather's loop).
 * Unchecked; `tmp` has length n.
 */
export function applyDifferenceGram(rows: Float64Array, winv: Float64Array, q: number, z: Float64Array, out: Float64Array, tmp: Float64Array, p?: Float64Array, sums?: Float64Array): Float64Array {
  applyRowsTransposed(rows, q + 1, z, tmp.length - q, tmp);
  differenceGather(rows, winv, q, tmp, out);
  if (p !== undefined && sums !== undefined) gapSums(p, z, out, winv.length - q, sums);
  return out;
}

/** out = D (W^{-1} tmp), scaling tmp by W^{-1} in place just before each entry's first use. Unchecked. */
function differenceGather(rows: Float64Array, winv: Float64Array, q: number, tmp: Float64Array, out: Float64Array): void {
  const n = winv.length;
  const m = n - q;
  const wd = q + 1;
  for (let i = 0; i < q && i < n; i++) tmp[i] *= winv[i];
  for (let r = 0; r < m; r++) {
    tmp[r + q] *= winv[r + q];
    let s = 0;
    const o = r * wd;
    for (let c = 0; c <= q; c++) s += rows[o + c] * tmp[r + c];
    out[r] = s;
  }
}

/**
 * sums = [||v||_1, z.v, z.Qz] over the first m rows for v = p - Qz, Qz given in qz: added in row
 * order, kept in `sums` as the loop runs so that nothing follows it. Unchecked.
 */
function gapSums(p: Float64Array, z: Float64Array, qz: Float64Array, m: number, sums: Float64Array): void {
  sums[0] = 0; sums[1] = 0; sums[2] = 0;
  for (let r = 0; r < m; r++) {
    const s = qz[r], v = p[r] - s;
    sums[0] += Math.abs(v); sums[1] += z[r] * v; sums[2] += z[r] * s;
  }
}
