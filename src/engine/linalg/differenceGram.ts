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
 * just before its first use. With `p` and `sums`, the same pass also forms, for v = p - Q z,
 * sums = [||v||_1, z.v, z.Q z] (the trend interior point's objective and duality gap need no more).
 * Unchecked; `tmp` has length n.
 */
export function applyDifferenceGram(rows: Float64Array, winv: Float64Array, q: number, z: Float64Array, out: Float64Array, tmp: Float64Array, p?: Float64Array, sums?: Float64Array): Float64Array {
  const n = winv.length;
  const m = n - q;
  const wd = q + 1;
  tmp.fill(0);
  for (let r = 0; r < m; r++) {
    const zr = z[r];
    const o = r * wd;
    for (let c = 0; c <= q; c++) tmp[r + c] += rows[o + c] * zr;
  }
  for (let i = 0; i < q && i < n; i++) tmp[i] *= winv[i];
  let l1 = 0, zv = 0, zqz = 0;
  for (let r = 0; r < m; r++) {
    tmp[r + q] *= winv[r + q];
    let s = 0;
    const o = r * wd;
    for (let c = 0; c <= q; c++) s += rows[o + c] * tmp[r + c];
    out[r] = s;
    if (p !== undefined) { const v = p[r] - s; l1 += Math.abs(v); zv += z[r] * v; zqz += z[r] * s; }
  }
  if (sums !== undefined) { sums[0] = l1; sums[1] = zv; sums[2] = zqz; }
  return out;
}
