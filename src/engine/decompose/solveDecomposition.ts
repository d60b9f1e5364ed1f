/**
 * Solver of the adaptive decomposition (trend filtering + season + spikes as one
 * convex problem; S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, "l1 trend
 * filtering", SIAM Review 51 (2009) 339-360, section 6 extensions):
 *
 *   minimise 1/2 sum_i w_i (y_i - t_i - s_i - o_i)^2 + lambda ||D(x, k+1) t||_1 + rho ||o||_1
 *   over t, o in R^n and s = A theta (seasonDesign.ts), each cycle of s summing to zero.
 *
 * With theta and o minimised out, the objective is H(t) + lambda ||D t||_1 with H convex
 * and its gradient -W r*(t) 1-Lipschitz in the W-norm (r* is the residual of the exact
 * (theta, o) solve, a composition of a projection and a soft threshold), so the exact
 * trend-filtering step on y - s*(v) - o*(v) is a proximal-gradient step of unit length.
 * Accelerated by FISTA (A. Beck and M. Teboulle, SIAM J. Imaging Sci. 2 (2009) 183-202)
 * with the gradient restart of B. O'Donoghue and E. Candes (Found. Comput. Math. 15
 * (2015) 715-732); without momentum this is block coordinate descent over t and
 * (theta, o) (P. Tseng, J. Optim. Theory Appl. 109 (2001) 475-494).
 * The (theta, o) block for a given trend: the weighted least-squares season and the
 * soft-threshold of the spikes o_i = sign(r_i) max(0, |r_i| - rho / w_i), alternated
 * until they settle (block coordinate descent on a problem whose non-smooth part is
 * separable). The trend step is solved exactly by the trend-filtering solver, its
 * refinement seeded with the previous knots.
 * Works in scaled units (x to unit spacing, y to sd 1, w to mean 1). Unchecked.
 */
import type { SolverStatus } from '../types';
import { solveTrend, seedOf, TrendFit, TrendProblem } from '../smoothers/trend/solveTrend';
import { SeasonDesign, fitSeason } from './seasonDesign';

/** Solution of {@link solveDecomposition} in the scaled units it was given. */
export interface DecompositionFit {
  trend: Float64Array;
  season: Float64Array;
  /** Season per term. */
  parts: Float64Array[];
  spikes: Float64Array;
  theta: Float64Array;
  /** The last trend-filtering fit (knot rows, exact differences at the knots, dual). */
  trendFit: TrendFit;
  status: SolverStatus;
}

/** Relative duality gap asked of each trend step: an exact active-set refinement (seeded with the last knots) certifies at this level in a round or two. */
export const TREND_STEP_TOLERANCE = 1e-10;

export const DECOMPOSITION_RULE = 'accelerated proximal gradient on the trend (FISTA with gradient restart), each step an exact trend-filtering solve after the season (weighted least squares) and the spikes (soft threshold) are alternated until they settle; stops when one step changes the trend by at most the tolerance times the sd of y, the season and spikes then solved exactly for the final trend';

/** Starting values and settings of {@link solveDecomposition}. Unchecked. */
export interface DecompositionStart {
  trend?: Float64Array;
  season?: Float64Array;
  spikes?: Float64Array;
}

/**
 * Solves the scaled problem. `lambda` and `rho` are in scaled units; `design` null
 * means no season (trend and spikes only). `tolerance` bounds the largest change of
 * the trend in a step (scaled units: sd of y = 1). Unchecked.
 */
export function solveDecomposition(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rho: number, design: SeasonDesign | null,
  tolerance: number, maxCycles: number, start: DecompositionStart = {}): DecompositionFit {
  const n = x.length;
  let t = start.trend ? Float64Array.from(start.trend) : new Float64Array(n);
  let tPrev = Float64Array.from(t);
  const s = start.season ? Float64Array.from(start.season) : new Float64Array(n);
  const o = start.spikes ? Float64Array.from(start.spikes) : new Float64Array(n);
  const parts = design ? design.terms.map(() => new Float64Array(n)) : [];
  const theta = { value: new Float64Array(design ? design.q : 0) };
  const v = new Float64Array(n);
  const z = new Float64Array(n);
  const work = { r: new Float64Array(n), s: new Float64Array(n) };
  let prob: TrendProblem | undefined;
  let fit: TrendFit | undefined;
  let cycles = 0;
  let change = Infinity;
  let trendIterations = 0;
  let trendOk = true;
  let mom = 1;
  let restarts = 0;
  while (cycles < maxCycles) {
    cycles++;
    const momNext = (1 + Math.sqrt(1 + 4 * mom * mom)) / 2;
    const beta = (mom - 1) / momNext;
    for (let i = 0; i < n; i++) v[i] = t[i] + beta * (t[i] - tPrev[i]);
    seasonAndSpikes(y, v, w, rho, design, s, o, parts, theta, work, tolerance * 0.01);
    for (let i = 0; i < n; i++) z[i] = y[i] - s[i] - o[i];
    // operator and scaled x depend on x and w only: carried over; the polynomial fit depends on y and is rebuilt
    prob = { x, y: Float64Array.from(z), w, k, op: prob?.op, x01: prob?.x01, admmRows: prob?.admmRows };
    fit = solveTrend(prob, lambda, TREND_STEP_TOLERANCE, 400, fit, true, fit ? seedOf(fit) : undefined);
    trendIterations += fit.status.iterations;
    trendOk = fit.status.converged;
    const tNew = fit.b;
    let dt = 0;
    let dot = 0;
    for (let i = 0; i < n; i++) {
      dt = Math.max(dt, Math.abs(tNew[i] - t[i]));
      dot += w[i] * (v[i] - tNew[i]) * (tNew[i] - t[i]);
    }
    // gradient restart: momentum is dropped when the step goes against it
    if (dot > 0) { mom = 1; restarts++; } else mom = momNext;
    tPrev = t;
    t = Float64Array.from(tNew);
    change = dt;
    if (change <= tolerance) break;
  }
  // the season and spikes exactly for the final trend
  seasonAndSpikes(y, t, w, rho, design, s, o, parts, theta, work, tolerance * 0.01);
  const converged = change <= tolerance && trendOk;
  return {
    trend: t, season: s, parts, spikes: o, theta: theta.value, trendFit: fit!,
    status: { converged, iterations: cycles, tolerance, achieved: change, stoppingRule: `${DECOMPOSITION_RULE}; ${trendIterations} trend-solver iterations and ${restarts} momentum restarts in all` },
  };
}

/** The (theta, o) block for trend t: season and spikes alternated until neither moves by more than tol. Updates s, o, parts, theta. Unchecked. */
function seasonAndSpikes(y: Float64Array, t: Float64Array, w: Float64Array, rho: number, design: SeasonDesign | null, s: Float64Array, o: Float64Array,
  parts: Float64Array[], theta: { value: Float64Array }, work: { r: Float64Array; s: Float64Array }, tol: number): void {
  const n = y.length;
  const { r, s: sNew } = work;
  for (let inner = 0; inner < 10000; inner++) {
    let d = 0;
    if (design) {
      for (let i = 0; i < n; i++) r[i] = y[i] - t[i] - o[i];
      theta.value = Float64Array.from(fitSeason(design, r, w, sNew, parts));
      for (let i = 0; i < n; i++) { d = Math.max(d, Math.abs(sNew[i] - s[i])); s[i] = sNew[i]; }
    }
    for (let i = 0; i < n; i++) {
      const ri = y[i] - t[i] - s[i];
      const th = rho / w[i];
      const val = ri > th ? ri - th : ri < -th ? ri + th : 0;
      d = Math.max(d, Math.abs(val - o[i]));
      o[i] = val;
    }
    if (d <= tol || !design) break;
  }
}
