/**
 * Orthogonal discrete wavelet transform with periodic boundaries ("periodization":
 * the signal is one period of a periodic sequence, so the transform of N values has
 * exactly N coefficients and is an orthogonal matrix). S. Mallat, "A theory for
 * multiresolution signal decomposition", IEEE PAMI 11 (1989) 674-693; I. Daubechies,
 * "Ten Lectures on Wavelets" (1992), chapter 5.
 *
 * One level, with h the scaling filter of even length L and window start
 * b_k = 2k + 1 - L/2 (indices mod N):
 *
 *   a_k = sum_q h_q x_{b_k + q},     d_k = sum_q (-1)^q h_{L-1-q} x_{b_k + q},    k = 0 .. N/2 - 1,
 *
 * which is PyWavelets' dwt(x, mode='periodization') coefficient for coefficient. The
 * inverse is the transpose. Coefficients are stored as PyWavelets' wavedec lists
 * them, coarsest first: [a_J | d_J | d_{J-1} | ... | d_1], with d_1 the finest
 * (N/2 values) in the last half.
 */

/** One analysis step on x[0..N) into a (N/2) and d (N/2). Unchecked: N even, N >= 2. */
function analysisStep(x: Float64Array, N: number, h: readonly number[], a: Float64Array, d: Float64Array, ao: number, dO: number): void {
  const L = h.length;
  const half = N >> 1;
  const off = 1 - (L >> 1);
  const g = new Float64Array(L);
  for (let q = 0; q < L; q++) g[q] = (q % 2 === 0 ? 1 : -1) * h[L - 1 - q];
  for (let k = 0; k < half; k++) {
    const b = 2 * k + off;
    let sa = 0, sd = 0;
    if (b >= 0 && b + L <= N) {
      for (let q = 0; q < L; q++) { const v = x[b + q]; sa += h[q] * v; sd += g[q] * v; }
    } else {
      for (let q = 0; q < L; q++) {
        let i = (b + q) % N;
        if (i < 0) i += N;
        const v = x[i];
        sa += h[q] * v; sd += g[q] * v;
      }
    }
    a[ao + k] = sa;
    d[dO + k] = sd;
  }
}

/**
 * One synthesis step: out[0..N) from a and d (the transpose of analysisStep), summed over the
 * coefficients k < first and k >= last only (all of them by default), in increasing k: an output
 * all of whose coefficients are in those ranges gets the same sum, in the same order, as from all
 * of them. Unchecked.
 */
function synthesisStep(a: Float64Array, ao: number, d: Float64Array, dO: number, N: number, h: readonly number[], out: Float64Array, first = N >> 1, last = N >> 1): void {
  const L = h.length;
  const half = N >> 1;
  const off = 1 - (L >> 1);
  const g = new Float64Array(L);
  for (let q = 0; q < L; q++) g[q] = (q % 2 === 0 ? 1 : -1) * h[L - 1 - q];
  out.fill(0, 0, N);
  for (let k = 0; k < half; k++) {
    if (k === first && last > first) k = last;
    const b = 2 * k + off;
    const ak = a[ao + k], dk = d[dO + k];
    if (b >= 0 && b + L <= N) {
      for (let q = 0; q < L; q++) out[b + q] += h[q] * ak + g[q] * dk;
    } else {
      for (let q = 0; q < L; q++) {
        let i = (b + q) % N;
        if (i < 0) i += N;
        out[i] += h[q] * ak + g[q] * dk;
      }
    }
  }
}

/**
 * Multilevel periodic DWT.
 *
 * @param x - signal, length N divisible by 2^levels
 * @param h - scaling filter (even length)
 * @param levels - number of levels J >= 1
 * @returns coefficients [a_J | d_J | ... | d_1], length N
 * @example
 * ```ts
 * periodicDwt(Float64Array.of(1, 1, 1, 1), WAVELET_FILTERS.db1, 2); // [2, 0, 0, 0]
 * ```
 * Unchecked.
 */
export function periodicDwt(x: Float64Array, h: readonly number[], levels: number): Float64Array {
  const N = x.length;
  const c = new Float64Array(N);
  const cur = x.slice();
  let len = N;
  const tmp = new Float64Array(N >> 1);
  for (let j = 0; j < levels; j++) {
    const half = len >> 1;
    // details of this level go to c[half .. len)
    analysisStep(cur, len, h, tmp, c, 0, half);
    cur.set(tmp.subarray(0, half), 0);
    len = half;
  }
  c.set(cur.subarray(0, len), 0);
  return c;
}

/**
 * Inverse of {@link periodicDwt}.
 *
 * With `keep` < N only the first `keep` values are computed (the others are left unspecified): the
 * reflected boundary transforms the series with its mirror image appended and keeps the first
 * half. Output i of a level depends on the coefficients k with 2k + 1 - L/2 in (i - L, i], modulo
 * the level's length, so the values 0 .. p - 1 of a level, and its last r values, need only the
 * first ceil(p / 2) + L / 2 and the last ceil(r / 2) + L / 2 values of the coarser level (the wrap
 * of the periodic boundary reaches from each end to the other); level by level from the finest the
 * needed ranges stay about half, and each level sums only over them, in the same order as over
 * all coefficients, so the values kept are bit for bit those of the whole inverse.
 *
 * @param c - coefficients [a_J | d_J | ... | d_1], length N divisible by 2^levels
 * @param h - scaling filter
 * @param levels - J
 * @param keep - how many leading values are wanted (default N)
 * @returns the signal (its first `keep` values)
 * @example
 * ```ts
 * periodicIdwt(periodicDwt(x, h, 3), h, 3); // x, to rounding
 * ```
 * Unchecked.
 */
export function periodicIdwt(c: Float64Array, h: readonly number[], levels: number, keep = c.length): Float64Array {
  const N = c.length;
  const L = h.length;
  // needed values per level, finest (t = 0, length N) to coarsest: the first P[t] and the last R[t]
  const P = new Int32Array(levels + 1), R = new Int32Array(levels + 1);
  P[0] = Math.min(N, Math.max(0, keep));
  for (let t = 0, n = N; t < levels; t++, n >>= 1) {
    const half = n >> 1;
    P[t + 1] = Math.min(half, ((P[t] + 1) >> 1) + (L >> 1));
    R[t + 1] = Math.min(half, ((R[t] + 1) >> 1) + (L >> 1));
  }
  let len = N >> levels;
  const a = new Float64Array(N);
  a.set(c.subarray(0, len), 0);
  const out = new Float64Array(N);
  for (let j = 0; j < levels; j++) {
    // coefficients of this step: the needed values of the coarser level (t = levels - j)
    const t = levels - j;
    const first = P[t], last = Math.max(first, len - R[t]);
    synthesisStep(a, 0, c, len, 2 * len, h, out, first, last);
    len *= 2;
    a.set(out.subarray(0, len), 0);
  }
  return a;
}
