/**
 * The seasonal part of the adaptive decomposition as a linear model s = A theta:
 * per-phase effects of whole-number cycles (weekday, month, quarter, a given
 * period), each summing to zero over its phases, and Fourier terms for cycles
 * that are not a whole number of steps (a year of 52.18 weeks or 365.24 days):
 * sum_{j=1..K} a_j cos(2 pi j x / L) + b_j sin(2 pi j x / L).
 */

/** One seasonal term. `phase[i]` is the phase of point i (from x, so gaps keep their phase); a Fourier term's `length` is in x units, or in grid steps when `onGrid`. */
export type SeasonTerm =
  | { kind: 'cycle'; label: string; period: number; phase: Int32Array }
  | { kind: 'fourier'; label: string; length: number; harmonics: number; onGrid: boolean };

/** A factored weighted least-squares fit onto the span of the season terms. Unchecked. */
export interface SeasonDesign {
  terms: SeasonTerm[];
  /** Number of coefficients. */
  q: number;
  /** Column offset of each term. */
  offset: number[];
  /** For cycle terms: whether each phase has data (phases without data get no effect). */
  present: (Uint8Array | null)[];
  /** Fourier columns, point-major (n x 2K per Fourier term, in term order). */
  fourier: (Float64Array | null)[];
  /** LU factors of the bordered normal equations and pivots. */
  lu: Float64Array;
  piv: Int32Array;
  /** Size of the bordered system. */
  size: number;
  n: number;
}

/** Builds and factors the season design for points x with weights w. Unchecked. */
export function seasonDesign(x: Float64Array, grid: Int32Array, w: Float64Array, terms: SeasonTerm[]): SeasonDesign {
  const n = x.length;
  const offset: number[] = [];
  let q = 0;
  const present: (Uint8Array | null)[] = [];
  const fourier: (Float64Array | null)[] = [];
  for (const t of terms) {
    offset.push(q);
    if (t.kind === 'cycle') {
      const pr = new Uint8Array(t.period);
      for (let i = 0; i < n; i++) if (w[i] > 0) pr[t.phase[i]] = 1;
      present.push(pr);
      fourier.push(null);
      q += t.period;
    } else {
      const K = t.harmonics;
      const f = new Float64Array(n * 2 * K);
      for (let i = 0; i < n; i++) {
        const a = (2 * Math.PI * (t.onGrid ? grid[i] : x[i])) / t.length;
        for (let j = 0; j < K; j++) {
          f[i * 2 * K + 2 * j] = Math.cos((j + 1) * a);
          f[i * 2 * K + 2 * j + 1] = Math.sin((j + 1) * a);
        }
      }
      present.push(null);
      fourier.push(f);
      q += 2 * K;
    }
  }
  const nCycle = terms.filter((t) => t.kind === 'cycle').length;
  const size = q + nCycle;
  const M = borderedNormal(terms, offset, present, fourier, n, q, size, w);
  const piv = new Int32Array(size);
  luFactor(M, size, piv);
  return { terms, q, offset, present, fourier, lu: M, piv, size, n };
}

/** The normal equations A^T diag(v) A bordered by the zero-sum constraints (absent phases fixed at 0). Unchecked. */
function borderedNormal(terms: SeasonTerm[], offset: number[], present: (Uint8Array | null)[], fourier: (Float64Array | null)[], n: number, q: number, size: number, v: Float64Array): Float64Array {
  const M = new Float64Array(size * size);
  const cols: number[] = [];
  const vals: number[] = [];
  for (let i = 0; i < n; i++) {
    const wi = v[i];
    if (wi === 0) continue;
    cols.length = 0;
    vals.length = 0;
    rowOf(terms, offset, fourier, i, cols, vals);
    for (let a = 0; a < cols.length; a++) {
      const ra = cols[a] * size;
      const va = wi * vals[a];
      for (let b = 0; b < cols.length; b++) M[ra + cols[b]] += va * vals[b];
    }
  }
  let c = q;
  for (let tIdx = 0; tIdx < terms.length; tIdx++) {
    const t = terms[tIdx];
    if (t.kind !== 'cycle') continue;
    const pr = present[tIdx]!;
    for (let p = 0; p < t.period; p++) {
      const col = offset[tIdx] + p;
      if (pr[p]) {
        M[c * size + col] = 1;
        M[col * size + c] = 1;
      } else M[col * size + col] = 1;
    }
    c++;
  }
  return M;
}

/**
 * The (season, spikes) block exactly: theta and o minimising
 *   1/2 sum w_i (r_i - (A theta)_i - o_i)^2 + rho sum |o_i|,  each cycle summing to zero,
 * i.e. a Huber regression of r on A (threshold rho / w_i), by iteratively reweighted least squares
 * (points inside the threshold weigh w_i, those outside rho / |e_i|: each step minimises a quadratic
 * majorant, so the Huber objective never rises; P. J. Huber, Robust Statistics, 1981, section 7.8),
 * until theta moves by less than 1e-14 of its size; then o_i = sign(e_i) max(0, |e_i| - rho / w_i),
 * e = r - A theta. Starts from `theta0`.
 * Writes the season into `out` (and per term into `parts`). Returns theta. Unchecked.
 */
export function fitSeasonAndSpikes(d: SeasonDesign, r: Float64Array, w: Float64Array, rho: number, theta0: Float64Array, out: Float64Array, o: Float64Array, parts?: Float64Array[]): Float64Array {
  const { n, q, size } = d;
  let theta = Float64Array.from(theta0);
  const e = new Float64Array(n);
  const huber = (th: Float64Array): number => {
    evaluateSeason(d, th, out);
    let J = 0;
    for (let i = 0; i < n; i++) {
      const ei = r[i] - out[i];
      const c = rho / w[i];
      const a = Math.abs(ei);
      J += a <= c ? 0.5 * w[i] * ei * ei : rho * a - 0.5 * rho * c;
    }
    return J;
  };
  let J = huber(theta);
  const vq = new Float64Array(n);
  const psi = new Float64Array(n);
  for (let it = 0; it < 1000; it++) {
    evaluateSeason(d, theta, out);
    for (let i = 0; i < n; i++) {
      e[i] = r[i] - out[i];
      const c = rho / w[i];
      const inside = Math.abs(e[i]) <= c;
      // outside the threshold the Huber loss is majorised by a quadratic of weight rho / |e_i|
      // (iteratively reweighted least squares, a majorise-minimise step: never uphill)
      vq[i] = inside ? w[i] : rho / Math.abs(e[i]);
      psi[i] = inside ? w[i] * e[i] : rho * Math.sign(e[i]);
    }
    const g = seasonGradient(d, psi);
    const M = borderedNormal(d.terms, d.offset, d.present, d.fourier, n, q, size, vq);
    // a small ridge keeps phases whose every point is outside the threshold solvable
    let tr = 0;
    for (let a = 0; a < q; a++) tr += M[a * size + a];
    for (let a = 0; a < q; a++) M[a * size + a] += 1e-12 * (tr / q || 1);
    const rhs = new Float64Array(size);
    for (let a = 0; a < q; a++) rhs[a] = g[a];
    for (let t = 0; t < d.terms.length; t++) {
      const term = d.terms[t];
      if (term.kind === 'cycle') for (let p = 0; p < term.period; p++) if (!d.present[t]![p]) rhs[d.offset[t] + p] = 0;
    }
    const piv = new Int32Array(size);
    luFactor(M, size, piv);
    luSolve(M, size, piv, rhs);
    let step = 1;
    let next = theta;
    let Jn = J;
    for (let h = 0; h < 40; h++) {
      next = Float64Array.from(theta, (v, a) => v + step * rhs[a]);
      Jn = huber(next);
      if (Jn <= J) break;
      step /= 2;
    }
    let dmax = 0;
    for (let a = 0; a < q; a++) dmax = Math.max(dmax, Math.abs(step * rhs[a]));
    const improved = Jn <= J;
    if (improved) { theta = next; J = Jn; }
    let tmax = 0;
    for (let a = 0; a < q; a++) tmax = Math.max(tmax, Math.abs(theta[a]));
    if (!improved || dmax <= 1e-14 * (1 + tmax)) break;
  }
  evaluateSeason(d, theta, out, parts);
  for (let i = 0; i < n; i++) {
    const ei = r[i] - out[i];
    const c = rho / w[i];
    o[i] = ei > c ? ei - c : ei < -c ? ei + c : 0;
  }
  return theta;
}

/** Nonzero columns of point i's design row. Unchecked. */
function rowOf(terms: SeasonTerm[], offset: number[], fourier: (Float64Array | null)[], i: number, cols: number[], vals: number[]): void {
  for (let t = 0; t < terms.length; t++) {
    const term = terms[t];
    if (term.kind === 'cycle') {
      cols.push(offset[t] + term.phase[i]);
      vals.push(1);
    } else {
      const K2 = 2 * term.harmonics;
      const f = fourier[t]!;
      for (let j = 0; j < K2; j++) { cols.push(offset[t] + j); vals.push(f[i * K2 + j]); }
    }
  }
}

/**
 * The weighted least-squares season of r: theta minimising sum w_i (r_i - (A theta)_i)^2
 * subject to each cycle summing to zero over its phases with data. Writes the season per
 * point into `out` (and per term into `parts` when given). Returns theta. Unchecked.
 */
export function fitSeason(d: SeasonDesign, r: Float64Array, w: Float64Array, out: Float64Array, parts?: Float64Array[]): Float64Array {
  const { terms, offset, fourier, n, size } = d;
  const rhs = new Float64Array(size);
  for (let i = 0; i < n; i++) {
    const v = w[i] * r[i];
    for (let t = 0; t < terms.length; t++) {
      const term = terms[t];
      if (term.kind === 'cycle') rhs[offset[t] + term.phase[i]] += v;
      else {
        const K2 = 2 * term.harmonics;
        const f = fourier[t]!;
        for (let j = 0; j < K2; j++) rhs[offset[t] + j] += v * f[i * K2 + j];
      }
    }
  }
  // absent phases: rhs 0 (their row is the identity)
  for (let t = 0; t < terms.length; t++) {
    const term = terms[t];
    if (term.kind === 'cycle') for (let p = 0; p < term.period; p++) if (!d.present[t]![p]) rhs[offset[t] + p] = 0;
  }
  luSolve(d.lu, size, d.piv, rhs);
  evaluateSeason(d, rhs, out, parts);
  return rhs.subarray(0, d.q);
}

/** s = A theta per point (and per term). Unchecked. */
export function evaluateSeason(d: SeasonDesign, theta: Float64Array, out: Float64Array, parts?: Float64Array[]): void {
  const { terms, offset, fourier, n } = d;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let t = 0; t < terms.length; t++) {
      const term = terms[t];
      let v = 0;
      if (term.kind === 'cycle') v = theta[offset[t] + term.phase[i]];
      else {
        const K2 = 2 * term.harmonics;
        const f = fourier[t]!;
        for (let j = 0; j < K2; j++) v += theta[offset[t] + j] * f[i * K2 + j];
      }
      if (parts) parts[t][i] = v;
      s += v;
    }
    out[i] = s;
  }
}

/** A^T v: the gradient of the season's least-squares term (zero at the optimum, given the zero-sum constraints). Unchecked. */
export function seasonGradient(d: SeasonDesign, v: Float64Array): Float64Array {
  const { terms, offset, fourier, n } = d;
  const g = new Float64Array(d.q);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < terms.length; t++) {
      const term = terms[t];
      if (term.kind === 'cycle') g[offset[t] + term.phase[i]] += v[i];
      else {
        const K2 = 2 * term.harmonics;
        const f = fourier[t]!;
        for (let j = 0; j < K2; j++) g[offset[t] + j] += v[i] * f[i * K2 + j];
      }
    }
  }
  return g;
}

/** In-place LU with partial pivoting of a dense size x size matrix (small: the season's coefficients). Unchecked. */
function luFactor(a: Float64Array, n: number, piv: Int32Array): void {
  for (let k = 0; k < n; k++) {
    let p = k, mx = Math.abs(a[k * n + k]);
    for (let i = k + 1; i < n; i++) { const v = Math.abs(a[i * n + k]); if (v > mx) { mx = v; p = i; } }
    piv[k] = p;
    if (p !== k) for (let j = 0; j < n; j++) { const t = a[k * n + j]; a[k * n + j] = a[p * n + j]; a[p * n + j] = t; }
    const d = a[k * n + k];
    if (d === 0) continue;
    for (let i = k + 1; i < n; i++) {
      const f = (a[i * n + k] /= d);
      if (f !== 0) for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j];
    }
  }
}

function luSolve(a: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
  for (let k = 0; k < n; k++) { const p = piv[k]; if (p !== k) { const t = b[k]; b[k] = b[p]; b[p] = t; } }
  for (let i = 0; i < n; i++) { let s = b[i]; for (let j = 0; j < i; j++) s -= a[i * n + j] * b[j]; b[i] = s; }
  for (let i = n - 1; i >= 0; i--) { let s = b[i]; for (let j = i + 1; j < n; j++) s -= a[i * n + j] * b[j]; const d = a[i * n + i]; b[i] = d === 0 ? 0 : s / d; }
}
