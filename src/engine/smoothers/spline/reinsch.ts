/**
 * The natural cubic smoothing spline from Reinsch's equations, solved in their
 * augmented (saddle-point) form.
 *
 * Minimise  sum_i w_i (y_i - f(x_i))^2 + lambda * integral f''(t)^2 dt  over
 * natural cubic splines with knots at every distinct x. With h_i = x_{i+1} - x_i,
 * Q (n x (n-2), tridiagonal: 1/h_{j-1}, -1/h_{j-1} - 1/h_j, 1/h_j) and
 * R ((n-2) x (n-2), tridiagonal: (h_{j-1} + h_j)/3, h_j/6), the fitted values g
 * and interior second derivatives gamma satisfy (Reinsch 1967)
 *
 *   W g + Q s = W y,     Q' g - (R / lambda) s = 0,     s = lambda * gamma.
 *
 * The classic route eliminates g and solves (R + lambda Q'W^{-1}Q) gamma = Q'y;
 * that matrix has condition number of order 1/h^4 and, measured against a
 * 50-digit solve at n = 300, loses eight digits of the fitted values. Here the
 * augmented system is kept: ordered as pairs (g_i, s_i) it is symmetric
 * block-tridiagonal with 2 x 2 blocks (the end blocks carry a dummy s = 0), and
 * its block LDL' factorisation gives the fitted values to about 1e-14 of the
 * range of y on the same test. The hat matrix is S = (K^{-1})_{gg} W, so its
 * diagonal h_ii = w_i (K^{-1})_{g_i g_i} comes from the diagonal blocks of the
 * inverse, exactly and in O(n) (Hutchinson & de Hoog 1985, block form).
 *
 * References: C. H. Reinsch, "Smoothing by spline functions", Numer. Math. 10
 * (1967) 177-183; P. J. Green and B. W. Silverman, "Nonparametric Regression and
 * Generalized Linear Models" (1994), section 2.3; M. F. Hutchinson and F. R. de
 * Hoog, Numer. Math. 47 (1985) 99-106.
 *
 * Everything here is unchecked: x strictly increasing, w > 0, n >= 3, lambda >= 0.
 */
import { BlockLDL2, blockInverseDiagonal2, blockLDL2, blockSolve2 } from '../../linalg/blockTridiagonal2';
import { FIRST_CALL_POINTS } from '../../linalg/firstCallPoints';

/** Precomputed pieces that do not depend on lambda. */
export interface ReinschSystem {
  n: number;
  h: Float64Array;
  w: Float64Array;
  y: Float64Array;
  /** Right-hand side (w_i y_i, 0) per block. */
  rhs: Float64Array;
  /** Workspace reused across lambdas: blocks, factor, solution, inverse diagonal. */
  work: { b: Float64Array; c: Float64Array; f: BlockLDL2; sol: Float64Array; s: Float64Array };
}

/** Builds the lambda-free parts of the system. Unchecked. */
export function reinschSystem(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>): ReinschSystem {
  const n = x.length;
  const h = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) h[i] = x[i + 1] - x[i];
  const ww = Float64Array.from(w);
  const yy = Float64Array.from(y);
  const rhs = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) rhs[2 * i] = ww[i] * yy[i];
  const work = {
    b: new Float64Array(4 * n), c: new Float64Array(4 * n),
    f: { m: n, dinv: new Float64Array(4 * n), l: new Float64Array(4 * n) },
    sol: new Float64Array(2 * n), s: new Float64Array(4 * n),
  };
  return { n, h, w: ww, y: yy, rhs, work };
}

/** The spline at one lambda. */
export interface ReinschSolution {
  /** Fitted values at the knots. */
  g: Float64Array;
  /** Second derivatives at all n knots (zero at both ends: the natural boundary). */
  gamma: Float64Array;
  /** Hat-matrix diagonal, when asked for. */
  leverage?: Float64Array;
  /** Trace of the hat matrix (equivalent degrees of freedom), when leverage was asked for; NaN otherwise. */
  df: number;
  /** Weighted residual sum of squares sum w_i (y_i - g_i)^2. */
  rss: number;
}

/**
 * Solves the system at one lambda (in the units of the x given to
 * {@link reinschSystem}). With `leverage` true also returns the exact hat
 * diagonal and its trace. lambda = 0 gives the interpolating spline. Unchecked.
 */
export function reinschSolve(sys: ReinschSystem, lambda: number, leverage: boolean): ReinschSolution {
  const { n, w, y } = sys;
  if (lambda === 0) return interpolate(sys, leverage);
  const il = 1 / lambda;
  const { f, sol } = factorAndSolve(sys, lambda);
  const g = new Float64Array(n);
  const gamma = new Float64Array(n);
  // each pass a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  const rss = splitSolution(sol, y, w, il, g, gamma);
  if (!leverage) return { g, gamma, df: NaN, rss };
  const s = blockInverseDiagonal2(f, sys.work.s);
  const lev = new Float64Array(n);
  const df = leveragesInto(w, s, lev);
  return { g, gamma, leverage: lev, df, rss };
}

/** g and gamma (second derivatives, times 1 / lambda) from the interleaved solution; returns sum w (y - g)^2. Unchecked. */
function splitSolution(sol: Float64Array, y: Float64Array, w: Float64Array, il: number, g: Float64Array, gamma: Float64Array): number {
  const n = g.length;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    g[i] = sol[2 * i];
    if (i >= 1 && i <= n - 2) gamma[i] = sol[2 * i + 1] * il;
    const r = y[i] - g[i];
    rss += w[i] * r * r;
  }
  return rss;
}

/** lev_i = w_i (A^{-1})_ii from the inverse's diagonal blocks; returns their sum (in row order). Unchecked. */
function leveragesInto(w: Float64Array, s: Float64Array, lev: Float64Array): number {
  let df = 0;
  for (let i = 0; i < lev.length; i++) {
    const hii = w[i] * s[4 * i];
    lev[i] = hii;
    df += hii;
  }
  return df;
}

/** Fills the blocks for one lambda, factorises and solves, in the system's workspace. Unchecked. */
function factorAndSolve(sys: ReinschSystem, lambda: number): { f: BlockLDL2; sol: Float64Array } {
  const { n, h, w } = sys;
  const il = 1 / lambda;
  // End blocks: (g, dummy s) with s = 0 decoupled.
  const b = sys.work.b, c = sys.work.c;
  b[0] = w[0]; b[3] = -1;
  const e = 4 * (n - 1);
  b[e] = w[n - 1]; b[e + 3] = -1;
  // each pass a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  diagonalBlocks(h, w, il, n, b);
  subdiagonalBlocks(h, il, n, c);
  const f = blockLDL2(b, c, sys.work.f);
  const sol = blockSolve2(f, sys.rhs, sys.work.sol);
  return { f, sol };
}

/** The interior diagonal blocks B_k = [w_k, q; q, -(h_{k-1} + h_k) / 3 / lambda], q = -1/h_{k-1} - 1/h_k, k = 1..n-2. Unchecked. */
function diagonalBlocks(h: Float64Array, w: Float64Array, il: number, n: number, b: Float64Array): void {
  for (let k = 1; k <= n - 2; k++) {
    const o = 4 * k;
    const q = -1 / h[k - 1] - 1 / h[k];
    b[o] = w[k]; b[o + 1] = q; b[o + 2] = q; b[o + 3] = -((h[k - 1] + h[k]) / 3) * il;
  }
}

/** The sub-diagonal blocks C_k (rows (g_k, s_k), columns (g_{k-1}, s_{k-1})), k = 1..n-1. Unchecked. */
function subdiagonalBlocks(h: Float64Array, il: number, n: number, c: Float64Array): void {
  for (let k = 1; k <= n - 1; k++) {
    const o = 4 * k;
    const q = 1 / h[k - 1];
    const sPrev = k - 1 >= 1; // s_{k-1} is a real unknown
    const sHere = k <= n - 2; // s_k is a real unknown
    c[o] = 0;
    c[o + 1] = sPrev ? q : 0; // g_k - s_{k-1}
    c[o + 2] = sHere ? q : 0; // s_k - g_{k-1}
    c[o + 3] = sPrev && sHere ? -(h[k - 1] / 6) * il : 0; // s_k - s_{k-1}
  }
}

/**
 * GCV ingredients at one lambda without building result arrays: weighted RSS
 * and the trace of the hat matrix. Unchecked.
 */
export function reinschScore(sys: ReinschSystem, lambda: number): { rss: number; df: number } {
  const { n, w, y } = sys;
  if (lambda === 0) return { rss: 0, df: n };
  const { f, sol } = factorAndSolve(sys, lambda);
  const s = blockInverseDiagonal2(f, sys.work.s);
  // over the first few points, then the rest, with the sums carried in st: every statement has run
  // before the loop is long (DEVELOPERS.md, "Long loops and the first call")
  const st = new Float64Array(2);
  const head = Math.min(n, FIRST_CALL_POINTS);
  scoreRows(y, w, sol, s, 0, head, st);
  scoreRows(y, w, sol, s, head, n, st);
  return { rss: st[0], df: st[1] };
}

/** Adds points from .. to - 1 to st = [rss, df]: w (y - g)^2 and w times the leverage. Unchecked. */
function scoreRows(y: Float64Array, w: Float64Array, sol: Float64Array, s: Float64Array, from: number, to: number, st: Float64Array): void {
  let rss = st[0], df = st[1];
  for (let i = from; i < to; i++) {
    const r = y[i] - sol[2 * i];
    rss += w[i] * r * r;
    df += w[i] * s[4 * i];
  }
  st[0] = rss; st[1] = df;
}

function interpolate(sys: ReinschSystem, leverage: boolean): ReinschSolution {
  // lambda = 0: the interpolating natural cubic spline; gamma solves R gamma = Q'y.
  const { n, h, y } = sys;
  const m = n - 2;
  // Thomas algorithm on the SPD tridiagonal R (diagonally dominant: stable).
  const diag = new Float64Array(m), rhs = new Float64Array(m);
  for (let c = 0; c < m; c++) {
    diag[c] = (h[c] + h[c + 1]) / 3;
    rhs[c] = (y[c + 2] - y[c + 1]) / h[c + 1] - (y[c + 1] - y[c]) / h[c];
  }
  for (let c = 1; c < m; c++) {
    const f = h[c] / 6 / diag[c - 1];
    diag[c] -= f * (h[c] / 6);
    rhs[c] -= f * rhs[c - 1];
  }
  const gamma = new Float64Array(n);
  for (let c = m - 1; c >= 0; c--) {
    const next = c + 1 < m ? gamma[c + 2] : 0;
    gamma[c + 1] = (rhs[c] - (h[c + 1] / 6) * next) / diag[c];
  }
  const out: ReinschSolution = { g: Float64Array.from(y), gamma, df: leverage ? n : NaN, rss: 0 };
  if (leverage) out.leverage = new Float64Array(n).fill(1);
  return out;
}
