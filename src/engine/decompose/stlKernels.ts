/**
 * The computing kernels of STL (Cleveland, Cleveland, McRae & Terpenning 1990,
 * "STL: a seasonal-trend decomposition procedure based on loess", J. Official
 * Statistics 6:3-73), in the order of the paper's appendix programme (its
 * routines est, ess, ss, fts, ma, rwts and stp). Indices here are 0-based; the
 * LOESS abscissae are the 1-based positions 1..n of the paper, kept so that
 * every operation matches the published programme. All functions are unchecked.
 */

/** Scratch arrays shared by one decomposition (length n + 2 period). Unchecked. */
export interface StlWork {
  w: Float64Array;
}

/**
 * One LOESS value at abscissa xs (1-based) from y[nleft-1 .. nright-1] (the
 * paper's `est`): tricube neighbourhood weights with h = max(xs - nleft,
 * nright - xs) (+ floor((len - n) / 2) when the window is longer than the
 * series), times robustness weights when given; degree 0 (weighted mean) or 1
 * (locally linear, skipped when the abscissae's spread is below 1e-3 of n - 1).
 * Returns NaN when every weight is zero (the caller then keeps y). Unchecked.
 */
export function loessPoint(y: Float64Array, yOff: number, n: number, len: number, degree: number, xs: number, nleft: number, nright: number, w: Float64Array, rw: Float64Array | null, rwOff: number): number {
  const range = n - 1;
  let h = Math.max(xs - nleft, nright - xs);
  if (len > n) h += Math.floor((len - n) / 2);
  const h9 = 0.999 * h;
  const h1 = 0.001 * h;
  let a = 0;
  for (let j = nleft; j <= nright; j++) {
    w[j - 1] = 0;
    const r = Math.abs(j - xs);
    if (r <= h9) {
      let v: number;
      if (r <= h1) v = 1;
      else {
        const q = r / h;
        const t = 1 - q * q * q;
        v = t * t * t;
      }
      if (rw) v *= rw[rwOff + j - 1];
      w[j - 1] = v;
      a += v;
    }
  }
  if (a <= 0) return NaN;
  for (let j = nleft; j <= nright; j++) w[j - 1] /= a;
  if (h > 0 && degree > 0) {
    let m = 0;
    for (let j = nleft; j <= nright; j++) m += w[j - 1] * j;
    let b = xs - m;
    let c = 0;
    for (let j = nleft; j <= nright; j++) c += w[j - 1] * (j - m) * (j - m);
    if (Math.sqrt(c) > 0.001 * range) {
      b /= c;
      for (let j = nleft; j <= nright; j++) w[j - 1] *= b * (j - m) + 1;
    }
  }
  let ys = 0;
  for (let j = nleft; j <= nright; j++) ys += w[j - 1] * y[yOff + j - 1];
  return ys;
}

/**
 * LOESS smooth of y[yOff .. yOff + n - 1] into out[outOff ..] at every `jump`-th
 * point, linear interpolation in between, and always at the last point (the
 * paper's `ess`). Window `len` (odd), degree 0 or 1, optional robustness
 * weights rw[rwOff ..]. Unchecked.
 */
export function loessSmooth(y: Float64Array, yOff: number, n: number, len: number, degree: number, jump: number, rw: Float64Array | null, rwOff: number, out: Float64Array, outOff: number, w: Float64Array): void {
  if (n < 2) {
    out[outOff] = y[yOff];
    return;
  }
  const nj = Math.min(jump, n - 1);
  let nleft = 0, nright = 0;
  const put = (i: number) => {
    const v = loessPoint(y, yOff, n, len, degree, i, nleft, nright, w, rw, rwOff);
    out[outOff + i - 1] = Number.isNaN(v) ? y[yOff + i - 1] : v;
  };
  if (len >= n) {
    nleft = 1;
    nright = n;
    for (let i = 1; i <= n; i += nj) put(i);
  } else if (nj === 1) {
    const nsh = (len + 1) >> 1;
    nleft = 1;
    nright = len;
    for (let i = 1; i <= n; i++) {
      if (i > nsh && nright !== n) { nleft++; nright++; }
      put(i);
    }
  } else {
    const nsh = (len + 1) >> 1;
    for (let i = 1; i <= n; i += nj) {
      if (i < nsh) { nleft = 1; nright = len; }
      else if (i >= n - nsh + 1) { nleft = n - len + 1; nright = n; }
      else { nleft = i - nsh + 1; nright = len + i - nsh; }
      put(i);
    }
  }
  if (nj !== 1) {
    for (let i = 1; i <= n - nj; i += nj) {
      const a = out[outOff + i - 1];
      const delta = (out[outOff + i + nj - 1] - a) / nj;
      for (let j = i + 1; j <= i + nj - 1; j++) out[outOff + j - 1] = a + delta * (j - i);
    }
    const k = Math.floor((n - 1) / nj) * nj + 1;
    if (k !== n) {
      put(n);
      if (k !== n - 1) {
        const a = out[outOff + k - 1];
        const delta = (out[outOff + n - 1] - a) / (n - k);
        for (let j = k + 1; j <= n - 1; j++) out[outOff + j - 1] = a + delta * (j - k);
      }
    }
  }
}

/** Moving average of length len of x[0 .. n-1] into ave[0 .. n-len] (the paper's `ma`). Unchecked. */
export function movingAverage(x: Float64Array, n: number, len: number, ave: Float64Array): void {
  const newn = n - len + 1;
  let v = 0;
  for (let i = 0; i < len; i++) v += x[i];
  ave[0] = v / len;
  for (let j = 1, k = len, m = 0; j < newn; j++, k++, m++) {
    v = v - x[m] + x[k];
    ave[j] = v / len;
  }
}

/**
 * Smooths each cycle-subseries (phase j: points j, j + P, ...) by LOESS and
 * extends it one period at each end (the paper's `ss`): out has n + 2P values,
 * out[m P + j] for m = 0 .. k + 1. Unchecked.
 */
export function cycleSubseries(y: Float64Array, n: number, period: number, len: number, degree: number, jump: number, rw: Float64Array | null, out: Float64Array, work: Float64Array[]): void {
  const [w1, w2, w3, w4] = work;
  for (let j = 1; j <= period; j++) {
    const k = Math.floor((n - j) / period) + 1;
    for (let i = 1; i <= k; i++) w1[i - 1] = y[(i - 1) * period + j - 1];
    if (rw) for (let i = 1; i <= k; i++) w3[i - 1] = rw[(i - 1) * period + j - 1];
    loessSmooth(w1, 0, k, len, degree, jump, rw ? w3 : null, 0, w2, 1, w4);
    const nright = Math.min(len, k);
    let v = loessPoint(w1, 0, k, len, degree, 0, 1, nright, w4, rw ? w3 : null, 0);
    w2[0] = Number.isNaN(v) ? w2[1] : v;
    const nleft = Math.max(1, k - len + 1);
    v = loessPoint(w1, 0, k, len, degree, k + 1, nleft, k, w4, rw ? w3 : null, 0);
    w2[k + 1] = Number.isNaN(v) ? w2[k] : v;
    for (let m = 1; m <= k + 2; m++) out[(m - 1) * period + j - 1] = w2[m - 1];
  }
}

/**
 * Robustness weights (the paper's `rwts`): bisquare B(|r_i| / h) with
 * h = 6 median |r|; weight 1 below 0.001 h, 0 above 0.999 h. The median is
 * the mean of the order statistics n/2 + 1 and n - n/2 (1-based). Unchecked.
 */
export function robustnessWeights(y: Float64Array, fit: Float64Array, n: number, rw: Float64Array, median: (absResiduals: Float64Array) => number = medianOfAbs): void {
  const r = new Float64Array(n);
  for (let i = 0; i < n; i++) r[i] = Math.abs(y[i] - fit[i]);
  const cmad = 6 * median(Float64Array.from(r));
  const c9 = 0.999 * cmad, c1 = 0.001 * cmad;
  for (let i = 0; i < n; i++) {
    if (r[i] <= c1) rw[i] = 1;
    else if (r[i] <= c9) {
      const q = r[i] / cmad;
      const t = 1 - q * q;
      rw[i] = t * t;
    } else rw[i] = 0;
  }
}

/** The median of |r| as the paper's programme takes it: the mean of order statistics n/2 + 1 and n - n/2 (1-based). May reorder its argument. Unchecked. */
export function medianOfAbs(r: Float64Array): number {
  const n = r.length;
  r.sort();
  const m1 = Math.floor(n / 2) + 1;
  const m2 = n - m1 + 1;
  return 0.5 * (r[m1 - 1] + r[m2 - 1]);
}

/** Resolved STL parameters (the paper's n_p, n_s, n_t, n_l, degrees, jumps, n_i). Unchecked. */
export interface StlParameters {
  period: number;
  seasonalWindow: number;
  seasonalDegree: number;
  seasonalJump: number;
  trendWindow: number;
  trendDegree: number;
  trendJump: number;
  lowPassWindow: number;
  lowPassDegree: number;
  lowPassJump: number;
  inner: number;
}

/**
 * The inner loop (the paper's `stp`), `inner` passes: detrend, smooth the
 * cycle-subseries, low-pass filter them (moving averages of lengths P, P, 3,
 * then LOESS), take the seasonal as the difference, deseasonalise, smooth the
 * trend. Updates season and trend in place. Unchecked.
 */
export function stlInner(y: Float64Array, n: number, p: StlParameters, rw: Float64Array | null, season: Float64Array, trend: Float64Array): void {
  const P = p.period;
  const L = n + 2 * P;
  const work = [0, 1, 2, 3, 4].map(() => new Float64Array(L));
  const sub = [0, 1, 2, 3].map(() => new Float64Array(L));
  for (let it = 0; it < p.inner; it++) {
    const w1 = work[0], w2 = work[1], w3 = work[2], w4 = work[3], w5 = work[4];
    for (let i = 0; i < n; i++) w1[i] = y[i] - trend[i];
    cycleSubseries(w1, n, P, p.seasonalWindow, p.seasonalDegree, p.seasonalJump, rw, w2, sub);
    // low-pass: three moving averages of the n + 2P values, then LOESS
    movingAverage(w2, L, P, w3);
    movingAverage(w3, L - P + 1, P, w1);
    movingAverage(w1, L - 2 * P + 2, 3, w3);
    loessSmooth(w3, 0, n, p.lowPassWindow, p.lowPassDegree, p.lowPassJump, null, 0, w1, 0, w5);
    for (let i = 0; i < n; i++) season[i] = w2[P + i] - w1[i];
    for (let i = 0; i < n; i++) w1[i] = y[i] - season[i];
    loessSmooth(w1, 0, n, p.trendWindow, p.trendDegree, p.trendJump, rw, 0, trend, 0, w4);
  }
}
