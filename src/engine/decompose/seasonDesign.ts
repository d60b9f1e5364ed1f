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
  /** The bordered normal equations A^T W A (with the zero-sum constraints), unfactored: the start of every Huber Newton step. */
  gram: Float64Array;
  /** LU factors of the bordered normal equations and pivots. */
  lu: Float64Array;
  piv: Int32Array;
  /** Size of the bordered system. */
  size: number;
  n: number;
  /** Non-zero entries per design row (one per cycle term, 2K per Fourier term). */
  nnz: number;
  /** Start of each term's entries within a row (length terms + 1). */
  termStart: Int32Array;
  /** Row i's columns and values at i * nnz .. (i + 1) * nnz - 1, in term order. */
  rowCols: Int32Array;
  rowVals: Float64Array;
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
  // the rows in compressed form: every point has the same number of entries
  const termStart = new Int32Array(terms.length + 1);
  terms.forEach((t, j) => { termStart[j + 1] = termStart[j] + (t.kind === 'cycle' ? 1 : 2 * t.harmonics); });
  const nnz = termStart[terms.length];
  const rowCols = new Int32Array(n * nnz), rowVals = new Float64Array(n * nnz);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < terms.length; t++) {
      const term = terms[t], at = i * nnz + termStart[t];
      if (term.kind === 'cycle') { rowCols[at] = offset[t] + term.phase[i]; rowVals[at] = 1; } else {
        const K2 = 2 * term.harmonics, f = fourier[t]!;
        for (let j = 0; j < K2; j++) { rowCols[at + j] = offset[t] + j; rowVals[at + j] = f[i * K2 + j]; }
      }
    }
  }
  const d: SeasonDesign = { terms, q, offset, present, fourier, gram: new Float64Array(0), lu: new Float64Array(0), piv: new Int32Array(size), size, n, nnz, termStart, rowCols, rowVals };
  const M = borderedNormal(d, w);
  d.gram = Float64Array.from(M);
  luFactor(M, size, d.piv);
  d.lu = M;
  return d;
}

/** The normal equations A^T diag(v) A bordered by the zero-sum constraints (absent phases fixed at 0). Unchecked. */
function borderedNormal(d: SeasonDesign, v: Float64Array): Float64Array {
  const { terms, offset, present, n, q, size } = d;
  const M = new Float64Array(size * size);
  for (let i = 0; i < n; i++) if (v[i] !== 0) addRowOuter(d, M, i, v[i]);
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

/** M += scale a_i a_i^T for design row i (M is size x size). Unchecked. */
export function addRowOuter(d: SeasonDesign, M: Float64Array, i: number, scale: number): void {
  const { nnz, rowCols, rowVals, size } = d;
  const o = i * nnz;
  for (let a = 0; a < nnz; a++) {
    const ra = rowCols[o + a] * size, va = scale * rowVals[o + a];
    for (let b = 0; b < nnz; b++) M[ra + rowCols[o + b]] += va * rowVals[o + b];
  }
}

/**
 * The (season, spikes) block exactly: theta and o minimising
 *   1/2 sum w_i (r_i - (A theta)_i - o_i)^2 + rho sum |o_i|,  each cycle summing to zero,
 * i.e. a Huber regression of r on A (threshold c_i = rho / w_i; P. J. Huber, Robust Statistics,
 * 1981, section 7.8), by Newton's method on the active set: with the points outside the threshold
 * fixed, the Huber loss is quadratic (weight w_i inside, the linear term rho sign(e_i) outside),
 * and one Newton step (Hessian A^T W_inside A, bordered by the constraints) reaches its minimiser;
 * a backtracking line search on the Huber objective keeps every step downhill. Where that Hessian is
 * singular (a phase whose every point is outside) or its step finds no descent, the step is that of
 * the quadratic majorant instead (outside points weigh rho / |e_i|: iteratively reweighted least
 * squares, never uphill). It stops when a full Newton step leaves the set of outside points
 * unchanged (then theta is the exact minimiser), or when theta moves by less than 1e-14 of its size. The Hessian is the design's A^T W A less the outside points'
 * rank-one terms (few: the spikes), so a step costs O(n q + (outside points) q^2 + q^3).
 * Then o_i = sign(e_i) max(0, |e_i| - rho / w_i), e = r - A theta. Starts from `theta0`.
 * Writes the season into `out` (and per term into `parts`). Returns theta. Unchecked.
 */
export function fitSeasonAndSpikes(d: SeasonDesign, r: Float64Array, w: Float64Array, rho: number, theta0: Float64Array, out: Float64Array, o: Float64Array, parts?: Float64Array[]): Float64Array {
  const { n, q, size } = d;
  let theta = Float64Array.from(theta0);
  const trial = new Float64Array(n);
  const huber = (s: Float64Array): number => {
    let J = 0;
    for (let i = 0; i < n; i++) {
      const ei = r[i] - s[i];
      const c = rho / w[i];
      const a = Math.abs(ei);
      J += a <= c ? 0.5 * w[i] * ei * ei : rho * a - 0.5 * rho * c;
    }
    return J;
  };
  evaluateSeason(d, theta, out);
  let J = huber(out);
  const psi = new Float64Array(n);
  const pattern = new Int8Array(n), lastPattern = new Int8Array(n);
  const M = new Float64Array(size * size);
  const rhs = new Float64Array(size);
  const piv = new Int32Array(size);
  let fullStep = false;
  let majorise = false;
  for (let it = 0; it < 200; it++) {
    let same = true;
    for (let i = 0; i < n; i++) {
      const ei = r[i] - out[i];
      const c = rho / w[i];
      const p = ei > c ? 1 : ei < -c ? -1 : 0;
      pattern[i] = p;
      if (p !== lastPattern[i]) same = false;
      psi[i] = p === 0 ? w[i] * ei : rho * p;
    }
    // a full Newton step for this set of outside points was taken and the set did not change: exact
    if (it > 0 && fullStep && same) break;
    lastPattern.set(pattern);
    const g = seasonGradient(d, psi);
    // Newton's Hessian (outside points weigh 0) when it is well posed; else, or after a Newton step
    // that found no descent, the majorant's (outside points weigh rho / |e_i|: iteratively reweighted
    // least squares, a majorise-minimise step that never goes uphill)
    let newton: boolean = !majorise;
    for (let attempt = 0; attempt < 2; attempt++) {
      M.set(d.gram);
      for (let i = 0; i < n; i++) {
        if (pattern[i] === 0 || !(w[i] > 0)) continue;
        const ei = Math.abs(r[i] - out[i]);
        addRowOuter(d, M, i, newton ? -w[i] : rho / ei - w[i]);
      }
      // a small ridge keeps phases whose every point is outside the threshold solvable
      let tr = 0;
      for (let a = 0; a < q; a++) tr += M[a * size + a];
      for (let a = 0; a < q; a++) M[a * size + a] += 1e-12 * (tr / q || 1);
      luFactor(M, size, piv);
      if (!newton) break;
      // a direction in which no point is inside leaves Newton's model unbounded: take the majorant's step
      let pmin = Infinity, pmax = 0;
      for (let a = 0; a < size; a++) { const v = Math.abs(M[a * size + a]); pmin = Math.min(pmin, v); pmax = Math.max(pmax, v); }
      if (pmin > 1e-8 * pmax) break;
      newton = false;
    }
    rhs.fill(0);
    for (let a = 0; a < q; a++) rhs[a] = g[a];
    for (let t = 0; t < d.terms.length; t++) {
      const term = d.terms[t];
      if (term.kind === 'cycle') for (let p = 0; p < term.period; p++) if (!d.present[t]![p]) rhs[d.offset[t] + p] = 0;
    }
    luSolve(M, size, piv, rhs);
    let step = 1;
    let next = theta;
    let Jn = J;
    for (let h = 0; h < 40; h++) {
      next = Float64Array.from(theta, (v, a) => v + step * rhs[a]);
      evaluateSeason(d, next, trial);
      Jn = huber(trial);
      if (Jn <= J) break;
      step /= 2;
    }
    let dmax = 0;
    for (let a = 0; a < q; a++) dmax = Math.max(dmax, Math.abs(step * rhs[a]));
    const improved = Jn <= J;
    if (improved) { theta = next; J = Jn; out.set(trial); }
    fullStep = improved && step === 1 && newton;
    // a Newton step that found no descent is followed by the majorant's step
    majorise = newton && !improved;
    if (majorise) continue;
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

/**
 * Solves a bordered system shaped like the design's normal equations (size x size: the q
 * coefficients, then one zero-sum constraint per cycle term; absent phases fixed at 0) for the
 * right-hand side `rhs` of the q coefficients (the rest is set here). Returns theta. Unchecked.
 */
export function solveBordered(d: SeasonDesign, M: Float64Array, rhs: Float64Array): Float64Array {
  const { size, q } = d;
  const b = new Float64Array(size);
  for (let a = 0; a < q; a++) b[a] = rhs[a];
  for (let t = 0; t < d.terms.length; t++) {
    const term = d.terms[t];
    if (term.kind === 'cycle') for (let p = 0; p < term.period; p++) if (!d.present[t]![p]) b[d.offset[t] + p] = 0;
  }
  const lu = Float64Array.from(M);
  const piv = new Int32Array(size);
  luFactor(lu, size, piv);
  luSolve(lu, size, piv, b);
  return b.subarray(0, q);
}

/**
 * The weighted least-squares season of r: theta minimising sum w_i (r_i - (A theta)_i)^2
 * subject to each cycle summing to zero over its phases with data. Writes the season per
 * point into `out` (and per term into `parts` when given). Returns theta. Unchecked.
 */
export function fitSeason(d: SeasonDesign, r: Float64Array, w: Float64Array, out: Float64Array, parts?: Float64Array[]): Float64Array {
  const v = new Float64Array(d.n);
  for (let i = 0; i < d.n; i++) v[i] = w[i] * r[i];
  const g = seasonGradient(d, v);
  const rhs = new Float64Array(d.size);
  rhs.set(g);
  // absent phases: rhs 0 (their row is the identity)
  for (let t = 0; t < d.terms.length; t++) {
    const term = d.terms[t];
    if (term.kind === 'cycle') for (let p = 0; p < term.period; p++) if (!d.present[t]![p]) rhs[d.offset[t] + p] = 0;
  }
  luSolve(d.lu, d.size, d.piv, rhs);
  evaluateSeason(d, rhs, out, parts);
  return rhs.subarray(0, d.q);
}

/** s = A theta per point (and per term). Unchecked. */
export function evaluateSeason(d: SeasonDesign, theta: Float64Array, out: Float64Array, parts?: Float64Array[]): void {
  const { n, nnz, rowCols, rowVals, termStart } = d;
  const T = d.terms.length;
  for (let i = 0; i < n; i++) {
    const o = i * nnz;
    if (!parts) {
      let s = 0;
      for (let a = 0; a < nnz; a++) s += theta[rowCols[o + a]] * rowVals[o + a];
      out[i] = s;
      continue;
    }
    let s = 0;
    for (let t = 0; t < T; t++) {
      let v = 0;
      for (let a = termStart[t]; a < termStart[t + 1]; a++) v += theta[rowCols[o + a]] * rowVals[o + a];
      parts[t][i] = v;
      s += v;
    }
    out[i] = s;
  }
}

/** A^T v: the gradient of the season's least-squares term (zero at the optimum, given the zero-sum constraints). Unchecked. */
export function seasonGradient(d: SeasonDesign, v: Float64Array): Float64Array {
  const { n, nnz, rowCols, rowVals } = d;
  const g = new Float64Array(d.q);
  for (let i = 0; i < n; i++) {
    const vi = v[i];
    if (vi === 0) continue;
    const o = i * nnz;
    for (let a = 0; a < nnz; a++) g[rowCols[o + a]] += vi * rowVals[o + a];
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
