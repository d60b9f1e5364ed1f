/**
 * ADMM for the mixed-smoothness trend (S. Boyd, N. Parikh, E. Chu, B. Peleato and J. Eckstein,
 * "Distributed optimization and statistical learning via the alternating direction method of
 * multipliers", Found. Trends Mach. Learn. 3 (2011), sections 3 and 6.4.1):
 *
 *   minimise 1/2 ||y - a - c||_W^2 + lambda1 ||z1||_1 + lambda3 ||z3||_1  s.t.  D(x, 2) a = z1, D(x, 4) c = z3.
 *
 * The (a, c) step solves one symmetric positive definite system, banded with half-bandwidth 8
 * when a and c are interleaved (O(n) per solve; the factor is kept while the step sizes rho1,
 * rho3 stay); the z step is a soft threshold; the multipliers are scaled (u = dual / rho). The
 * straight lines shared by both null spaces make the plain (a, c) system singular, so the c
 * part carries the proximal term delta/2 ||c - c_prev||_W^2 (proximal ADMM: the fixed points
 * are unchanged; W. Deng and W. Yin, J. Sci. Comput. 66 (2016) 889-916). rho1 and rho3 are
 * balanced against the residuals every 10 steps (Boyd et al., section 3.4.1: doubled or halved
 * when the primal and dual residuals differ by more than 10 times).
 *
 * Stopping rule (Boyd et al., section 3.3.1): primal residual ||D a - z|| <= sqrt(m) eps +
 * eps max(||D a||, ||z||) and dual residual ||rho D^T (z - z_prev)|| <= sqrt(n) eps + eps ||rho D^T u||,
 * each for both blocks, eps = `tolerance`. Works in scaled units. Unchecked.
 */
import type { SolverStatus } from '../../types';
import { KnotwiseError, showNumber } from '../../errors';
import { differenceRows } from '../../linalg/differenceRows';
import { bandedCholesky, bandedCholeskySolve } from '../../linalg/bandedCholesky';
import { weightedPolynomialFit } from '../../linalg/weightedPolynomialFit';
import { applyRows } from '../../linalg/applyRows';
import { applyRowsTransposed } from '../../linalg/applyRowsTransposed';

/** Iterates carried from one penalty to the next (warm start). */
export interface MixedAdmmState {
  z1: Float64Array;
  u1: Float64Array;
  z3: Float64Array;
  u3: Float64Array;
  c: Float64Array;
  rho1: number;
  rho3: number;
}

export interface MixedAdmmResult {
  kinks: Float64Array;
  bends: Float64Array;
  /** Rows of D(x, 2) and D(x, 4) where the thresholded z is non-zero (exact zeros elsewhere). */
  kinkRows: number[];
  bendRows: number[];
  state: MixedAdmmState;
  status: SolverStatus;
}

/** Operators of one set of points, built once. Unchecked. */
export interface MixedOperators {
  x: Float64Array;
  w: Float64Array;
  r2: Float64Array;
  r4: Float64Array;
}

export function mixedOperators(x: Float64Array, w: Float64Array): MixedOperators {
  return { x, w, r2: differenceRows(x, 2), r4: differenceRows(x, 4) };
}

export const MIXED_ADMM_RULE = 'ADMM (scaled multipliers, proximal term on the bends, residual balancing of both step sizes): stops when the primal and dual residuals of both blocks are within sqrt(size) eps + eps times their scale (Boyd et al. 2011, section 3.3.1)';

const P = 8;

/** The banded factor of [[W + rho1 D2'D2, W], [W, (1 + delta) W + rho3 D4'D4]] with a and c interleaved. */
function factor(ops: MixedOperators, rho1: number, rho3: number, delta: number): Float64Array | null {
  const { w, r2, r4 } = ops;
  const n = w.length, N = 2 * n, wd = P + 1;
  const band = new Float64Array(N * wd);
  const add = (i: number, j: number, v: number) => { if (i < j) { const t = i; i = j; j = t; } band[i * wd + (i - j)] += v; };
  for (let i = 0; i < n; i++) { add(2 * i, 2 * i, w[i]); add(2 * i + 1, 2 * i + 1, (1 + delta) * w[i]); add(2 * i + 1, 2 * i, w[i]); }
  for (let r = 0; r < n - 2; r++) for (let p = 0; p < 3; p++) for (let q = 0; q <= p; q++) add(2 * (r + p), 2 * (r + q), rho1 * r2[r * 3 + p] * r2[r * 3 + q]);
  for (let r = 0; r < n - 4; r++) for (let p = 0; p < 5; p++) for (let q = 0; q <= p; q++) add(2 * (r + p) + 1, 2 * (r + q) + 1, rho3 * r4[r * 5 + p] * r4[r * 5 + q]);
  return bandedCholesky(band, N, P) >= 0 ? null : band;
}

/**
 * Runs the ADMM at (lambda1, lambda3). Unchecked: n >= 6, scaled units.
 */
export function mixedAdmm(ops: MixedOperators, y: Float64Array, lambda1: number, lambda3: number, tolerance: number, maxIterations: number, warm?: MixedAdmmState): MixedAdmmResult {
  const { w, r2, r4 } = ops;
  const n = w.length, m2 = n - 2, m4 = n - 4;
  // step sizes start near the penalties (Ramdas & Tibshirani 2016 take rho = lambda for trend filtering), within
  // 1e-3 .. 1e3 on the scaled problem, and stay within 1e-5 .. 1e5, where the system keeps its precision
  const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
  let rho1 = warm?.rho1 ?? clamp(lambda1, 1e-3, 1e3), rho3 = warm?.rho3 ?? clamp(lambda3 / 16, 1e-3, 1e3);
  const z1 = warm ? Float64Array.from(warm.z1) : new Float64Array(m2), u1 = warm ? Float64Array.from(warm.u1) : new Float64Array(m2);
  const z3 = warm ? Float64Array.from(warm.z3) : new Float64Array(m4), u3 = warm ? Float64Array.from(warm.u3) : new Float64Array(m4);
  let c = warm ? Float64Array.from(warm.c) : new Float64Array(n);
  const a = new Float64Array(n);
  let delta = 1e-3;
  // a factor that fails (rounding at extreme step sizes) is rebuilt with a larger proximal weight
  const refactor = (): Float64Array => {
    for (;;) {
      const f = factor(ops, rho1, rho3, delta);
      if (f) return f;
      delta *= 10;
      if (!(delta <= 1e3)) throw new KnotwiseError('numerical', `the mixed trend's linear system lost its precision (step sizes ${showNumber(rho1)} and ${showNumber(rho3)}); give a larger penalty or use trend filtering of one order.`);
    }
  };
  let L = refactor();
  const rhs = new Float64Array(2 * n);
  const t2 = new Float64Array(m2), t4 = new Float64Array(m4), v2 = new Float64Array(n), v4 = new Float64Array(n);
  const d2 = new Float64Array(m2), d4 = new Float64Array(m4);
  const z1o = new Float64Array(m2), z3o = new Float64Array(m4);
  let it = 0, converged = false, achieved = Infinity;
  const cNew = new Float64Array(n);
  for (it = 1; it <= maxIterations; it++) {
    for (let r = 0; r < m2; r++) t2[r] = z1[r] - u1[r];
    for (let r = 0; r < m4; r++) t4[r] = z3[r] - u3[r];
    applyRowsTransposed(r2, 3, t2, t2.length, v2);
    applyRowsTransposed(r4, 5, t4, t4.length, v4);
    for (let i = 0; i < n; i++) { rhs[2 * i] = w[i] * y[i] + rho1 * v2[i]; rhs[2 * i + 1] = w[i] * y[i] + rho3 * v4[i] + delta * w[i] * c[i]; }
    bandedCholeskySolve(L, 2 * n, P, rhs);
    let cChange = 0;
    for (let i = 0; i < n; i++) { a[i] = rhs[2 * i]; cNew[i] = rhs[2 * i + 1]; cChange += w[i] * (cNew[i] - c[i]) ** 2; }
    c.set(cNew);
    applyRows(r2, 3, a, d2);
    applyRows(r4, 5, c, d4);
    z1o.set(z1); z3o.set(z3);
    const k1 = lambda1 / rho1, k3 = lambda3 / rho3;
    let pr1 = 0, pr3 = 0, nd1 = 0, nd3 = 0, nz1 = 0, nz3 = 0;
    for (let r = 0; r < m2; r++) {
      const v = d2[r] + u1[r];
      z1[r] = v > k1 ? v - k1 : v < -k1 ? v + k1 : 0;
      const e = d2[r] - z1[r];
      u1[r] += e;
      pr1 += e * e; nd1 += d2[r] * d2[r]; nz1 += z1[r] * z1[r];
    }
    for (let r = 0; r < m4; r++) {
      const v = d4[r] + u3[r];
      z3[r] = v > k3 ? v - k3 : v < -k3 ? v + k3 : 0;
      const e = d4[r] - z3[r];
      u3[r] += e;
      pr3 += e * e; nd3 += d4[r] * d4[r]; nz3 += z3[r] * z3[r];
    }
    // dual residuals rho D^T (z - z_old), and the scale rho D^T u
    for (let r = 0; r < m2; r++) t2[r] = z1[r] - z1o[r];
    for (let r = 0; r < m4; r++) t4[r] = z3[r] - z3o[r];
    applyRowsTransposed(r2, 3, t2, t2.length, v2); applyRowsTransposed(r4, 5, t4, t4.length, v4);
    let s1 = 0, s3 = 0;
    for (let i = 0; i < n; i++) { s1 += (rho1 * v2[i]) ** 2; s3 += (rho3 * v4[i]) ** 2; }
    s3 += delta * delta * cChange;
    applyRowsTransposed(r2, 3, u1, u1.length, v2); applyRowsTransposed(r4, 5, u3, u3.length, v4);
    let su1 = 0, su3 = 0;
    for (let i = 0; i < n; i++) { su1 += (rho1 * v2[i]) ** 2; su3 += (rho3 * v4[i]) ** 2; }
    const e1p = Math.sqrt(m2) * tolerance + tolerance * Math.sqrt(Math.max(nd1, nz1));
    const e3p = Math.sqrt(m4) * tolerance + tolerance * Math.sqrt(Math.max(nd3, nz3));
    const e1d = Math.sqrt(n) * tolerance + tolerance * Math.sqrt(su1);
    const e3d = Math.sqrt(n) * tolerance + tolerance * Math.sqrt(su3);
    const R1 = Math.sqrt(pr1), R3 = Math.sqrt(pr3), S1 = Math.sqrt(s1), S3 = Math.sqrt(s3);
    achieved = Math.max(R1 / e1p, R3 / e3p, S1 / e1d, S3 / e3d) * tolerance;
    if (R1 <= e1p && R3 <= e3p && S1 <= e1d && S3 <= e3d) { converged = true; break; }
    if (it % 10 === 0) {
      // residual balancing; the scaled multipliers u = dual / rho follow the step size
      const n1 = clamp(R1 / e1p > 10 * (S1 / e1d) ? 2 * rho1 : S1 / e1d > 10 * (R1 / e1p) ? rho1 / 2 : rho1, 1e-5, 1e5);
      const n3 = clamp(R3 / e3p > 10 * (S3 / e3d) ? 2 * rho3 : S3 / e3d > 10 * (R3 / e3p) ? rho3 / 2 : rho3, 1e-5, 1e5);
      const changed = n1 !== rho1 || n3 !== rho3;
      for (let r = 0; r < m2; r++) u1[r] *= rho1 / n1;
      for (let r = 0; r < m4; r++) u3[r] *= rho3 / n3;
      rho1 = n1; rho3 = n3;
      if (changed) L = refactor();
    }
  }
  // fitted components: the ones whose differences are the thresholded z up to the primal residual;
  // straight lines moved from the bends to the kinks (weighted projection), which changes neither penalty
  const line = weightedPolynomialFit(ops.x, c, w, 1);
  const bends = Float64Array.from(c, (v, i) => v - line[i]);
  const kinks = Float64Array.from(a, (v, i) => v + line[i]);
  const kinkRows: number[] = [], bendRows: number[] = [];
  for (let r = 0; r < m2; r++) if (z1[r] !== 0) kinkRows.push(r);
  for (let r = 0; r < m4; r++) if (z3[r] !== 0) bendRows.push(r);
  return {
    kinks, bends, kinkRows, bendRows,
    state: { z1, u1, z3, u3, c: bends, rho1, rho3 },
    status: { converged, iterations: Math.min(it, maxIterations), tolerance, achieved, stoppingRule: MIXED_ADMM_RULE },
  };
}
