/**
 * The exact solution of the adaptive decomposition for a guessed active set: the trend's
 * knot rows A with the signs of D t there, and the spike points S with their signs.
 * With both fixed the problem
 *
 *   minimise 1/2 sum w_i (y_i - t_i - s_i - o_i)^2 + lambda ||D(x, k+1) t||_1 + rho ||o||_1
 *
 * is a quadratic one: t = B c in the discrete B-splines with knots A ({@link discreteBSplines}),
 * s = A_s theta (seasonDesign.ts, each cycle summing to zero), and at a spike point the loss after
 * minimising over o_i is linear, rho tau_i (y_i - t_i - s_i) (o_i = y_i - t_i - s_i - tau_i rho / w_i).
 * Its normal equations
 *
 *   [B^T W' B    B^T W' A_s] [c    ]   [B^T (W' y + rho tau_S) - lambda (D_A B)^T sigma]
 *   [A_s^T W' B  A_s^T W' A_s] [theta] = [A_s^T (W' y + rho tau_S)                    ]
 *
 * (W' = W without the spike points; theta bordered by the zero-sum constraints) are solved by
 * block elimination: the banded Cholesky factor of B^T W' B (half-bandwidth k), q banded solves for
 * the season's columns, and the small bordered Schur complement: O(n k r + q^2 p + q^3), with r the
 * non-zeros of a season row, p = k + 1 + (knots) and q the season's coefficients.
 *
 * The result is the optimum when the guessed sets are right, which is checked here from the
 * optimality conditions themselves (not from the solve): with v = W (y - t - s - o),
 * |v_i| <= rho off S and o_i of sign tau_i on S; the dual u of D^T u = v (dualFromResidual.ts)
 * within lambda everywhere; D t of sign sigma on A. This is how an active-set method finishes the
 * first-order scheme in solveDecomposition.ts once it has found the knots and spikes (as the
 * trend's own refinement does for trend filtering alone). Unchecked; k in 1..3.
 */
import { discreteBSplines, BasisCache } from '../basis/discreteBSplines';
import { bandedCholesky, bandedCholeskySolve } from '../linalg/bandedCholesky';
import { dualFromResidual } from '../linalg/dualFromResidual';
import { SeasonDesign, evaluateSeason, seasonGradient, addRowOuter, solveBordered } from './seasonDesign';

/** The exact solution for one active set and how well it meets the optimality conditions. */
export interface PolishedDecomposition {
  trend: Float64Array;
  season: Float64Array;
  parts: Float64Array[];
  spikes: Float64Array;
  theta: Float64Array;
  /**
   * Largest violation of the conditions the active set does not impose, relative to lambda or rho:
   * max |u| / lambda - 1, max over points off S of |v_i| / rho - 1, and the sign conditions
   * (a wrong sign counts as 1). At most 0 (up to rounding) when the guess is the optimum.
   */
  violation: number;
  /** Dual of the trend (D^T u = v) and v = W (y - t - s - o). */
  u: Float64Array;
  v: Float64Array;
  /** D t at the knot rows (from the coefficients). */
  knotChanges: Float64Array;
}

/**
 * Solves the decomposition with knots `rows` (signs `signs`) and spikes `spikeRows` (signs
 * `spikeSigns`) fixed; null when the system is singular. Unchecked.
 */
export function polishDecomposition(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rho: number, design: SeasonDesign | null,
  rows: ArrayLike<number>, signs: ArrayLike<number>, spikeRows: ArrayLike<number>, spikeSigns: ArrayLike<number>, cache?: BasisCache): PolishedDecomposition | null {
  const n = x.length;
  const B = discreteBSplines(x, k, rows, cache);
  if (!B) return null;
  const { p, first, values, penalty } = B;
  const wd = k + 1;
  // W' and the data side W' y + rho tau_S
  const wp = Float64Array.from(w);
  const g = new Float64Array(n);
  for (let i = 0; i < n; i++) g[i] = w[i] * y[i];
  for (let j = 0; j < spikeRows.length; j++) {
    const i = spikeRows[j];
    wp[i] = 0;
    g[i] = rho * spikeSigns[j];
  }
  const band = new Float64Array(p * wd);
  const rc = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const e0 = first[i], o = i * wd, wi = wp[i];
    for (let a = 0; a <= k && e0 + a < p; a++) {
      const va = values[o + a];
      if (va === 0) continue;
      rc[e0 + a] += va * g[i];
      if (wi !== 0) for (let c = 0; c <= a; c++) band[(e0 + a) * wd + (a - c)] += wi * va * values[o + c];
    }
  }
  const K = rows.length;
  for (let j = 0; j < K; j++) {
    const ls = lambda * signs[j];
    for (let l = 0; l <= k + 1; l++) {
      const e = j + k + 1 - l;
      if (e >= 0 && e < p) rc[e] -= ls * penalty[e * (k + 2) + l];
    }
  }
  if (bandedCholesky(band, p, k) >= 0) return null;
  const q = design ? design.q : 0;
  let theta: Float64Array = new Float64Array(q);
  const c = Float64Array.from(rc);
  bandedCholeskySolve(band, p, k, c);
  if (design) {
    const size = design.size;
    // BA = B^T W' A_s, gathered basis-function-major (p x q: the writes of one point are contiguous),
    // then turned season-column-major (q x p) for the banded solves; and A_s^T g
    const BP = new Float64Array(p * q);
    const rt = new Float64Array(size);
    rt.set(seasonGradient(design, g));
    const M = Float64Array.from(design.gram);
    const { nnz, rowCols, rowVals } = design;
    for (let i = 0; i < n; i++) {
      // a spike point leaves the season's normal equations
      if (wp[i] !== w[i]) addRowOuter(design, M, i, -w[i]);
      const wi = wp[i];
      if (wi === 0) continue;
      const e0 = first[i], o = i * wd, ro = i * nnz;
      for (let a = 0; a <= k && e0 + a < p; a++) {
        const va = wi * values[o + a];
        if (va === 0) continue;
        const eq = (e0 + a) * q;
        for (let b = 0; b < nnz; b++) BP[eq + rowCols[ro + b]] += va * rowVals[ro + b];
      }
    }
    const BA = new Float64Array(q * p);
    for (let e = 0; e < p; e++) for (let a = 0; a < q; a++) BA[a * p + e] = BP[e * q + a];
    // Schur complement: M -= BA^T G^-1 BA, rhs -= BA^T G^-1 rc
    const Z = new Float64Array(q * p);
    for (let a = 0; a < q; a++) {
      const za = Z.subarray(a * p, (a + 1) * p);
      za.set(BA.subarray(a * p, (a + 1) * p));
      bandedCholeskySolve(band, p, k, za);
    }
    for (let a = 0; a < q; a++) {
      const oa = a * p;
      let s = 0;
      for (let e = 0; e < p; e++) s += BA[oa + e] * c[e];
      rt[a] -= s;
      for (let b = 0; b <= a; b++) {
        const ob = b * p;
        let v = 0;
        for (let e = 0; e < p; e++) v += BA[oa + e] * Z[ob + e];
        M[a * size + b] -= v;
        if (b !== a) M[b * size + a] -= v;
      }
    }
    theta = solveBordered(design, M, rt);
    for (let a = 0; a < q; a++) {
      const ta = theta[a], oa = a * p;
      if (ta !== 0) for (let e = 0; e < p; e++) c[e] -= ta * Z[oa + e];
    }
  }
  const trend = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const e0 = first[i], o = i * wd;
    let s = 0;
    for (let a = 0; a <= k && e0 + a < p; a++) s += values[o + a] * c[e0 + a];
    trend[i] = s;
  }
  const season = new Float64Array(n);
  const parts = design ? design.terms.map(() => new Float64Array(n)) : [];
  if (design) evaluateSeason(design, theta, season, parts);
  // the conditions the active set does not impose
  let violation = 0;
  const spikes = new Float64Array(n);
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) v[i] = w[i] * (y[i] - trend[i] - season[i]);
  for (let j = 0; j < spikeRows.length; j++) {
    const i = spikeRows[j], tau = spikeSigns[j];
    const oi = y[i] - trend[i] - season[i] - (tau * rho) / w[i];
    if (!(oi * tau > 0)) violation = Math.max(violation, 1);
    spikes[i] = oi;
    v[i] = rho * tau;
  }
  for (let i = 0; i < n; i++) if (spikes[i] === 0 && Number.isFinite(rho)) violation = Math.max(violation, Math.abs(v[i]) / rho - 1);
  const { u } = dualFromResidual(x, k + 1, v);
  for (let r = 0; r < u.length; r++) violation = Math.max(violation, Math.abs(u[r]) / lambda - 1);
  const knotChanges = new Float64Array(K);
  for (let j = 0; j < K; j++) {
    let s = 0;
    for (let l = 0; l <= k + 1; l++) {
      const e = j + k + 1 - l;
      if (e >= 0 && e < p) s += penalty[e * (k + 2) + l] * c[e];
    }
    knotChanges[j] = s;
    if (!(s * signs[j] > 0)) violation = Math.max(violation, 1);
  }
  if (!Number.isFinite(violation)) return null;
  return { trend, season, parts, spikes, theta, violation, u, v, knotChanges };
}

/**
 * Active-set rounds from a guessed active set (a primal-dual active set method, as in
 * M. Hintermueller, K. Ito and K. Kunisch, SIAM J. Optim. 13 (2003) 865-888, for the l1 terms):
 * each round solves exactly on the current set ({@link polishDecomposition}), then drops the knots
 * and spikes whose sign came out wrong, adds in each run of consecutive rows where |u| > lambda the
 * row of the largest |u| (sign of u), and adds the points where |v| > rho (sign of v). Stops with the
 * first solution that meets the optimality conditions (violation <= `within`), or after `rounds`
 * rounds, or when the set repeats. Returns the certified solution or null. Unchecked.
 */
export function activeSetDecomposition(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rho: number, design: SeasonDesign | null,
  rows: number[], signs: number[], spikeRows: number[], spikeSigns: number[], rounds: number, within: number, cache?: BasisCache): (PolishedDecomposition & { rounds: number; rows: number[]; signs: number[] }) | null {
  const seen = new Set<string>();
  for (let round = 1; round <= rounds; round++) {
    const key = `${rows.join(',')}|${signs.join(',')}|${spikeRows.join(',')}|${spikeSigns.join(',')}`;
    if (seen.has(key)) return null;
    seen.add(key);
    const pol = polishDecomposition(x, y, w, k, lambda, rho, design, rows, signs, spikeRows, spikeSigns, cache);
    if (!pol) return null;
    if (pol.violation <= within) return { ...pol, rounds: round, rows, signs };
    const { u, v, knotChanges } = pol;
    const m = u.length;
    // kept knots (sign as guessed and as D t came out) and their signs
    const keep = new Int8Array(m);
    for (let j = 0; j < rows.length; j++) if (knotChanges[j] * signs[j] > 0) keep[rows[j]] = signs[j] > 0 ? 1 : -1;
    const nr: number[] = [], ns: number[] = [];
    const cand: number[] = [];
    const tol = lambda * (1 + within);
    for (let r = 0; r < m; ) {
      if (keep[r]) { nr.push(r); ns.push(keep[r]); r++; continue; }
      if (!(Math.abs(u[r]) > tol)) { r++; continue; }
      // a run of violating rows outside the set: its largest joins
      let best = r, e = r;
      while (e < m && !keep[e] && Math.abs(u[e]) > tol) { if (Math.abs(u[e]) > Math.abs(u[best])) best = e; e++; }
      cand.push(best);
      r = e;
    }
    // at most a quarter of the knots (and at least 2) join per round, the largest violations first:
    // adding every violating run at once was seen to make the set swing instead of settle
    cand.sort((a, b) => Math.abs(u[b]) - Math.abs(u[a]));
    for (const r of cand.slice(0, Math.max(2, Math.ceil(rows.length / 4)))) { nr.push(r); ns.push(u[r] > 0 ? 1 : -1); }
    const order = nr.map((_, j) => j).sort((a, b) => nr[a] - nr[b]);
    const nrs = order.map((j) => nr[j]), nss = order.map((j) => ns[j]);
    nr.length = 0; ns.length = 0; nr.push(...nrs); ns.push(...nss);
    const spikeAt = new Int8Array(y.length);
    for (let j = 0; j < spikeRows.length; j++) spikeAt[spikeRows[j]] = spikeSigns[j] > 0 ? 1 : -1;
    const sr: number[] = [], ss: number[] = [];
    for (let i = 0; i < y.length; i++) {
      const tau = spikeAt[i];
      if (tau !== 0) {
        if (pol.spikes[i] * tau > 0) { sr.push(i); ss.push(tau); }
      } else if (Number.isFinite(rho) && Math.abs(v[i]) > rho * (1 + within)) { sr.push(i); ss.push(v[i] > 0 ? 1 : -1); }
    }
    rows = nr; signs = ns; spikeRows = sr; spikeSigns = ss;
  }
  return null;
}
