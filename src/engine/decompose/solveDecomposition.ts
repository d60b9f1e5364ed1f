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
 * (theta, o) solve, a composition of a projection and a soft threshold), so the map
 * F(t) = the exact trend-filtering fit of y - s*(t) - o*(t) is a proximal-gradient step
 * of unit length, i.e. block coordinate descent over t and (theta, o) (P. Tseng,
 * J. Optim. Theory Appl. 109 (2001) 475-494), whose fixed points are the minimisers.
 * Its fixed-point iteration is slow when the trend and a smooth season trade off
 * (a yearly Fourier season against a trend with knots), so it is accelerated by
 * Anderson mixing of the last 5 steps (D. G. Anderson, J. ACM 12 (1965) 547-560; as a
 * safeguarded scheme for such maps, J. Zhang, B. O'Donoghue and S. Boyd, SIAM J. Optim.
 * 30 (2020) 3170-3197): the step from a mixed point is kept only when it does not raise
 * the objective above the last kept one; otherwise the memory is cleared and a plain step
 * taken from that one (plain steps never raise the objective, so this cannot cycle).
 * The (theta, o) block for a given trend is a Huber regression of y - t on the season
 * (seasonDesign.ts, fitSeasonAndSpikes: Newton on the active set, exact), the spikes then
 * o_i = sign(e_i) max(0, |e_i| - rho / w_i) of its residual e. The trend step is solved exactly by the trend-filtering solver, its
 * refinement seeded with the previous knots.
 * These steps find the knots and spikes long before their values settle (the trend and a smooth
 * season trade off slowly), so an active-set method on the joint problem (polishDecomposition.ts:
 * exact solves on a guessed set of knots and spikes, the set corrected from the optimality
 * conditions) is started from the given knots (the penalty search's) and then from each new set of
 * knots and spikes (the first 3, later only a set a step left unchanged); a solution meeting the
 * optimality conditions becomes the next point, and the plain step from it decides convergence as
 * for any other point.
 * Works in scaled units (x to unit spacing, y to sd 1, w to mean 1). Unchecked.
 */
import type { SolverStatus } from '../types';
import { solveTrend, seedOf, KnotSeed, TrendFit, TrendProblem } from '../smoothers/trend/solveTrend';
import { SeasonDesign, fitSeasonAndSpikes } from './seasonDesign';
import { differenceOperator } from '../linalg/difference';
import { basisCache } from '../basis/discreteBSplines';
import { activeSetDecomposition } from './polishDecomposition';
import { smallSpdSolve } from '../linalg/smallSpdSolve';
import { maxAbsDifference } from '../linalg/maxAbsDifference';

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

export const DECOMPOSITION_RULE = 'block coordinate descent on the trend and (season, spikes), Anderson-accelerated (memory 5, safeguarded by the objective), with an exact active-set solve on the knots and spikes found, taken as the next point where the optimality conditions hold: each step an exact trend-filtering solve after the exact (season, spikes) block (a Huber regression on the season); stops when a plain step changes the trend by at most the tolerance times the sd of y; returns the last exact trend step with the season and spikes it was taken for';

/**
 * Largest relative violation of the optimality conditions at which an exact solve on the current knots
 * and spikes is taken as the next point. It only proposes the point: the plain step taken from it decides
 * convergence. Loose enough for the precision of the recovered dual on long series (about 3e-9 at n = 20,000).
 */
export const POLISH_VIOLATION = 1e-6;

/** Number of first steps after which the active-set method is tried whatever the knots and spikes did; afterwards only when a step left them unchanged. */
export const POLISH_EAGER = 3;

/** Rounds of the active-set method started from a step's knots and spikes. */
export const ACTIVE_SET_ROUNDS = 12;

/** Anderson memory (number of past steps mixed). */
export const ANDERSON_MEMORY = 5;

/** Starting values and settings of {@link solveDecomposition}. Unchecked. */
export interface DecompositionStart {
  trend?: Float64Array;
  season?: Float64Array;
  spikes?: Float64Array;
  /** Knot rows and signs of a trend near the answer (the penalty search's fit): the active-set method starts from them. */
  knots?: KnotSeed;
}

/**
 * Solves the scaled problem. `lambda` and `rho` are in scaled units; `design` null
 * means no season (trend and spikes only). `tolerance` bounds the largest change of
 * the trend in a plain step (scaled units: sd of y = 1). Unchecked.
 */
export function solveDecomposition(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, rho: number, design: SeasonDesign | null,
  tolerance: number, maxCycles: number, start: DecompositionStart = {}, onCycle?: (cycle: number) => void, tryPolish = true): DecompositionFit {
  const n = x.length;
  let t: Float64Array = start.trend ? Float64Array.from(start.trend) : new Float64Array(n);
  const s = start.season ? Float64Array.from(start.season) : new Float64Array(n);
  const o = start.spikes ? Float64Array.from(start.spikes) : new Float64Array(n);
  const parts = design ? design.terms.map(() => new Float64Array(n)) : [];
  const theta = { value: new Float64Array(design ? design.q : 0) };
  const z = new Float64Array(n);
  const work = { r: new Float64Array(n), s: new Float64Array(n) };
  let prob: TrendProblem | undefined;
  let fit: TrendFit | undefined;
  let cycles = 0;
  let change = Infinity;
  let trendIterations = 0;
  let trendOk = true;
  let resets = 0;
  let polishes = 0, jumps = 0, polishRounds = 0;
  // active set (knot rows and signs, spike points and signs) of the last plain step, and those already polished
  let lastKey = '';
  const tried = new Set<string>();
  const cache = basisCache();
  // knots of an exact solution found by the active-set method: the next trend step starts from them
  let seedNext: KnotSeed | undefined;
  const spikeSet = (): { rows: number[]; signs: number[] } => {
    const rows: number[] = [], signs: number[] = [];
    for (let i = 0; i < n; i++) if (o[i] !== 0) { rows.push(i); signs.push(Math.sign(o[i])); }
    return { rows, signs };
  };
  // the map F: trend -> exact trend step after the exact (season, spikes) step
  const F = (tIn: Float64Array): Float64Array => {
    seasonAndSpikes(y, tIn, w, rho, design, s, o, parts, theta, work, tolerance * 0.01);
    for (let i = 0; i < n; i++) z[i] = y[i] - s[i] - o[i];
    // operator and scaled x depend on x and w only: carried over; the polynomial fit depends on y and is rebuilt
    prob = { x, y: Float64Array.from(z), w, k, op: prob?.op, x01: prob?.x01, admmRows: prob?.admmRows };
    fit = solveTrend(prob, lambda, { tolerance: TREND_STEP_TOLERANCE, maxIterations: 400, warm: fit, refine: true, seed: seedNext ?? (fit ? seedOf(fit) : undefined) });
    seedNext = undefined;
    trendIterations += fit.status.iterations;
    trendOk = fit.status.converged;
    return Float64Array.from(fit.b);
  };
  const sw = Float64Array.from(w, Math.sqrt);
  const dG: Float64Array[] = [], dF: Float64Array[] = [];
  let gPrev: Float64Array | null = null, fPrev: Float64Array | null = null;
  let best: { g: Float64Array; J: number } | null = null;
  const objective = (tr: Float64Array): number => {
    let J = 0;
    for (let i = 0; i < n; i++) {
      const r = y[i] - tr[i] - s[i] - o[i];
      J += 0.5 * w[i] * r * r + (o[i] !== 0 ? rho * Math.abs(o[i]) : 0);
    }
    const d = differenceOperator(x, k + 1, tr);
    for (let j = 0; j < d.length; j++) J += lambda * Math.abs(d[j]);
    return J;
  };
  if (k >= 1 && tryPolish && start.knots && start.knots.rows.length) {
    // the active-set method from the given knots and the spikes of the exact (season, spikes) step at the start trend
    seasonAndSpikes(y, t, w, rho, design, s, o, parts, theta, work, 0);
    const sp = spikeSet();
    polishes++;
    const pol = activeSetDecomposition(x, y, w, k, lambda, rho, design, start.knots.rows.slice(), start.knots.signs.slice(), sp.rows, sp.signs, ACTIVE_SET_ROUNDS, POLISH_VIOLATION, cache);
    if (pol) {
      polishRounds += pol.rounds;
      jumps++;
      theta.value = Float64Array.from(pol.theta);
      t = pol.trend;
      seedNext = { rows: pol.rows, signs: pol.signs };
    }
  }
  // whether the point the last plain step started from was a mixed one (then the answer needs one more plain step)
  let mixedInput = false;
  while (cycles < maxCycles) {
    cycles++;
    onCycle?.(cycles);
    const inputMixed = mixedInput;
    mixedInput = false;
    const g = F(t);
    const J = objective(g);
    if (best && J > best.J * (1 + 1e-12) + 1e-300) {
      // safeguard: the mixed point did worse than the last accepted one; drop the memory and take a
      // plain step from that one (plain steps never increase the objective, so this cannot cycle)
      dG.length = 0;
      dF.length = 0;
      gPrev = null;
      fPrev = null;
      resets++;
      t = best.g;
      continue;
    }
    best = { g, J };
    const f = new Float64Array(n);
    let fmax = 0;
    for (let i = 0; i < n; i++) {
      f[i] = g[i] - t[i];
      fmax = Math.max(fmax, Math.abs(f[i]));
    }
    change = fmax;
    if (change <= tolerance) { t = g; mixedInput = inputMixed; break; }
    // once a step leaves the knots and spikes as they were, solve exactly on them: when the optimality
    // conditions hold there, jump to that point (the next plain step then confirms it)
    if (k >= 1 && tryPolish) {
      const seed = seedOf(fit!);
      const { rows: spikeRows, signs: spikeSigns } = spikeSet();
      const key = `${seed.rows.join(',')}|${seed.signs.join(',')}|${spikeRows.join(',')}|${spikeSigns.join(',')}`;
      if (!tried.has(key) && (polishes < POLISH_EAGER || key === lastKey)) {
        tried.add(key);
        polishes++;
        const pol = activeSetDecomposition(x, y, w, k, lambda, rho, design, seed.rows, seed.signs, spikeRows, spikeSigns, ACTIVE_SET_ROUNDS, POLISH_VIOLATION, cache);
        if (pol) polishRounds += pol.rounds;
        if (pol) {
          jumps++;
          dG.length = 0;
          dF.length = 0;
          gPrev = null;
          fPrev = null;
          theta.value = Float64Array.from(pol.theta);
          t = pol.trend;
          seedNext = { rows: pol.rows, signs: pol.signs };
          lastKey = key;
          continue;
        }
      }
      lastKey = key;
    }
    if (gPrev && fPrev) {
      dG.push(Float64Array.from(g, (v, i) => v - gPrev![i]));
      dF.push(Float64Array.from(f, (v, i) => v - fPrev![i]));
      if (dG.length > ANDERSON_MEMORY) { dG.shift(); dF.shift(); }
    }
    gPrev = g;
    fPrev = f;
    const m = dF.length;
    if (m === 0) { t = g; continue; }
    // gamma = argmin || W^1/2 (f - dF gamma) ||: normal equations with a small ridge for stability
    const M = new Float64Array(m * m), b = new Float64Array(m);
    for (let a = 0; a < m; a++) {
      for (let c = 0; c <= a; c++) {
        let v = 0;
        for (let i = 0; i < n; i++) v += sw[i] * dF[a][i] * sw[i] * dF[c][i];
        M[a * m + c] = v;
        M[c * m + a] = v;
      }
      let v = 0;
      for (let i = 0; i < n; i++) v += w[i] * dF[a][i] * f[i];
      b[a] = v;
    }
    let tr = 0;
    for (let a = 0; a < m; a++) tr += M[a * m + a];
    for (let a = 0; a < m; a++) M[a * m + a] += 1e-10 * tr / m;
    const gamma = smallSpdSolve(M, b, m);
    const next = Float64Array.from(g);
    for (let a = 0; a < m; a++) for (let i = 0; i < n; i++) next[i] -= gamma[a] * dG[a][i];
    t = next;
    mixedInput = true;
  }
  if (change <= tolerance && mixedInput) {
    // plain steps from the converged point until one moves the trend by at most the tolerance
    // (the point reached by mixing is close to, but not itself, a plain step's output)
    for (let extra = 0; extra < 20; extra++) {
      const g = F(t);
      const d = maxAbsDifference(g, t, n);
      change = d;
      t = g;
      cycles++;
      if (d <= tolerance) break;
    }
  }
  // returned: the last exact trend step and the season and spikes it was taken for, so that the
  // trend's optimality conditions hold exactly and those of the season and spikes within the
  // last step's change of the trend (reported as `achieved`)
  t = Float64Array.from(fit!.b);
  const converged = change <= tolerance && trendOk;
  return {
    trend: t, season: s, parts, spikes: o, theta: theta.value, trendFit: fit!,
    status: { converged, iterations: cycles, tolerance, achieved: change, stoppingRule: `${DECOMPOSITION_RULE}; ${trendIterations} trend-solver iterations, ${resets} memory resets, ${polishes} exact solves on the knots and spikes of a step (${jumps} taken, ${polishRounds} rounds) in all` },
  };
}

/** The (theta, o) block for trend t: exact Huber regression (with a season) or soft threshold (without). Updates s, o, parts, theta. Unchecked. */
function seasonAndSpikes(y: Float64Array, t: Float64Array, w: Float64Array, rho: number, design: SeasonDesign | null, s: Float64Array, o: Float64Array,
  parts: Float64Array[], theta: { value: Float64Array }, work: { r: Float64Array; s: Float64Array }, tol: number): void {
  const n = y.length;
  const { r } = work;
  void tol;
  for (let i = 0; i < n; i++) r[i] = y[i] - t[i];
  if (design) {
    theta.value = fitSeasonAndSpikes(design, r, w, rho, theta.value, s, o, parts);
    return;
  }
  for (let i = 0; i < n; i++) {
    const th = rho / w[i];
    o[i] = r[i] > th ? r[i] - th : r[i] < -th ? r[i] + th : 0;
  }
}
