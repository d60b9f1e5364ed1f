/**
 * CPOP: exact L0-penalised continuous piecewise-linear fit (changes in slope).
 */

/** Module-level aliases: hot loops avoid global lookups (slow inside sandboxed contexts). */
const INF = 1 / 0;
const { abs, sqrt, min } = Math;

import { brokenLineFit, brokenLineRss, suffixLowerBound } from './slopeBounds';

/** Result of {@link cpop}. */
export interface SlopeSegmentation {
  /** Point indices of the kinks, increasing, excluding the two end points. */
  changes: number[];
  /** Fitted values at the knots: [first point, ...kinks, last point]. */
  knotValues: number[];
  /** Minimised residual cost sum w (y - f)^2 (in the units of the y given). */
  cost: number;
  /** cost + penalty * changes.length. */
  penalisedCost: number;
  /** Quadratic pieces evaluated over all steps. */
  evaluations: number;
  /** Most candidate pieces held at one step. */
  maxCandidates: number;
  /** Mean candidate pieces per step. */
  meanCandidates: number;
  /** True when the result is proven optimal; false when the work budget ran out first. */
  exact: boolean;
}

/** Growable store of quadratics a phi^2 + b phi + c with back-pointers. */
class QuadStore {
  a: Float64Array = new Float64Array(1024);
  b: Float64Array = new Float64Array(1024);
  c: Float64Array = new Float64Array(1024);
  parent: Int32Array = new Int32Array(1024);
  /** Back-map of the value at the parent's point: phi_parent = alpha + gamma * phi. */
  alpha: Float64Array = new Float64Array(1024);
  gamma: Float64Array = new Float64Array(1024);
  time: Int32Array = new Int32Array(1024);
  die: Float64Array = new Float64Array(1024);
  size = 0;
  push(a: number, b: number, c: number, parent: number, alpha: number, gamma: number, time: number): number {
    if (this.size === this.a.length) this.grow();
    const i = this.size++;
    this.a[i] = a; this.b[i] = b; this.c[i] = c; this.parent[i] = parent;
    this.alpha[i] = alpha; this.gamma[i] = gamma; this.time[i] = time; this.die[i] = INF;
    return i;
  }
  private grow(): void {
    const n = this.a.length * 2;
    const f = (o: Float64Array): Float64Array => { const r = new Float64Array(n); r.set(o); return r; };
    const g = (o: Int32Array): Int32Array => { const r = new Int32Array(n); r.set(o); return r; };
    this.a = f(this.a); this.b = f(this.b); this.c = f(this.c); this.parent = g(this.parent);
    this.alpha = f(this.alpha); this.gamma = f(this.gamma); this.time = g(this.time); this.die = f(this.die);
  }
}

/**
 * Smallest phi > from at which quadratic o (coefficients a2, a1, a0 of o - cur) becomes
 * lower than cur; Infinity when it never does. Unchecked.
 */
function crossing(d2: number, d1: number, d0: number, from: number): number {
  const scale = abs(d2) + abs(d1) + abs(d0);
  if (scale === 0) return INF;
  if (abs(d2) <= 1e-14 * scale) {
    if (d1 >= 0) return INF;
    const r = -d0 / d1;
    return r > from ? r : INF;
  }
  const disc = d1 * d1 - 4 * d2 * d0;
  if (disc <= 0) return INF;
  const sq = sqrt(disc);
  const qq = -0.5 * (d1 + (d1 >= 0 ? sq : -sq));
  let r1 = qq / d2;
  let r2 = qq !== 0 ? d0 / qq : r1;
  if (r1 > r2) { const t = r1; r1 = r2; r2 = t; }
  // d2 > 0: o - cur < 0 on (r1, r2), entered at r1; d2 < 0: negative beyond r2
  const r = d2 > 0 ? r1 : r2;
  return r > from ? r : INF;
}

/** Minimum of d2 phi^2 + d1 phi + d0 over [lo, hi] (ends may be infinite; -Infinity when unbounded below). Unchecked. */
function minOnInterval(d2: number, d1: number, d0: number, lo: number, hi: number): number {
  const at = (p: number): number => (d2 * p + d1) * p + d0;
  if (d2 > 0) {
    const v = -d1 / (2 * d2);
    if (v >= lo && v <= hi) return d0 - (d1 * d1) / (4 * d2);
    return v < lo ? at(lo) : at(hi);
  }
  if (d2 < 0) return lo === -INF || hi === INF ? -INF : min(at(lo), at(hi));
  if (d1 > 0) return lo === -INF ? -INF : at(lo);
  if (d1 < 0) return hi === INF ? -INF : at(hi);
  return d0;
}

/**
 * Exact minimiser of the L0-penalised change-in-slope criterion
 *
 *   sum_i w_i (y_i - f(x_i))^2 + beta * (number of kinks),
 *
 * over continuous piecewise-linear f with kinks at data points, by CPOP (Fearnhead,
 * Maidstone & Letchford 2019, "Detecting changes in slope with an L0 penalty", JCGS
 * 28:265-275). The state is the fitted value phi at the latest kink: f_t(phi) is the
 * best penalised cost of points 0..t with a knot at t of value phi, a minimum of
 * quadratics in phi, one per kink history:
 *
 *   f_0(phi) = w_0 (y_0 - phi)^2 - beta,
 *   f_t(phi) = min_{s < t} min_{phi'} [ f_s(phi') + C(s, t, phi', phi) ] + beta,
 *
 * where C is the residual sum of squares of the points in (s, t] about the line from
 * (x_s, phi') to (x_t, phi): a quadratic in (phi', phi) from running sums. Minimising a
 * quadratic piece over phi' gives a quadratic in phi (coefficient of phi^2 stays > 0).
 * Functional pruning: only the pieces on the lower envelope of f_s (those optimal for
 * some phi) are extended. Inequality pruning: a piece from s is dropped at t when
 * q(phi) >= f_t(phi) + beta for every phi, because a kink at t through the same value
 * is then at least as good for every future point (takes effect after `minSegment`
 * steps). Bound: a relaxation without continuity (free line per segment, PELT run
 * backwards, {@link suffixLowerBound}) bounds the cost after t from below by G(t); with
 * a ceiling UB, values with f_t(phi) > UB - G(t) cannot be on a path costing UB or less
 * and are discarded. UB is found by iterative deepening from the relaxation's total:
 * a search whose solution costs no more than its UB is optimal (everything discarded
 * cost more); otherwise UB grows by half and the search repeats, ending at the cost of
 * a feasible broken line at the latest. All rules keep the search exact (the tests
 * compare against brute force and against the search without the bound).
 * The functional pruning is CPOP's; the inequality and bound rules are this engine's
 * exact variants of PELT-style pruning (CPOP's published inequality pruning differs).
 * Cost: grows faster than linearly in n when the relaxation is loose (many segments
 * ahead); see the benchmark.
 *
 * x must be strictly increasing (merge tied x first, carrying sum w y^2 in `wyy`).
 * Running sums are kept per candidate relative to its own x, so no cancellation
 * grows with the position in the series.
 *
 * Stopping rule: each pass is one sweep over the points (lower envelopes are built by a
 * sweep that ends after at most 2K - 1 pieces for K quadratics); the passes stop at the
 * first whose solution is within its UB (at most a few dozen; the last uses a feasible UB).
 *
 * @param x - strictly increasing positions (scaled to order 1 for accuracy)
 * @param y - weighted mean of y at each position
 * @param w - total weight at each position
 * @param wyy - sum of w y^2 at each position (w y^2 when not merged)
 * @param penalty - beta >= 0 on the scale of sum w (y - f)^2
 * @param minSegment - fewest positions strictly after a knot up to and including the next (>= 1)
 * @param useBound - use the relaxation bound and iterative deepening (default true; false: one unbounded pass, for checks)
 * @param budget - most candidate evaluations over all passes (default {@link CPOP_WORK_BUDGET}); when spent,
 *   the best feasible broken line found is returned with `exact: false` (fronts report converged false)
 * @example
 * ```ts
 * const r = cpop(x, y, w, wyy, 2 * Math.log(n), 1);
 * r.changes; // kink indices
 * ```
 */
export function cpop(x: Float64Array, y: Float64Array, w: Float64Array, wyy: Float64Array, penalty: number, minSegment: number, useBound = true, budget = CPOP_WORK_BUDGET): SlopeSegmentation {
  const n = x.length;
  if (!useBound || n <= 2) return cpopSearch(x, y, w, wyy, penalty, minSegment, null, INF)!;  // exact, no budget
  const beta = penalty;
  // G(t): relaxation bound on the cost after t; UB: the cost of feasible broken lines
  const rel = suffixLowerBound(x, y, w, wyy, beta);
  const kinks: number[] = [];
  let prev = 0;
  for (const c of rel.starts) if (c - prev >= minSegment && n - 1 - c >= minSegment) { kinks.push(c); prev = c; }
  const fit = brokenLineFit(x, y, w, wyy, [0, ...kinks, n - 1]);
  const line = brokenLineFit(x, y, w, wyy, [0, n - 1]);
  let feasible = Math.min(fit.rss + beta * kinks.length, line.rss);
  // Iterative deepening on the bound: search with a guessed UB = LB + delta, where
  // LB = G(0) + min f_0 bounds the optimum from below. Every discarded path costs more
  // than the guess, so a solution found at or under the guess is optimal; otherwise
  // the guess was too low and delta grows. The feasible cost ends the sequence.
  const lowerTotal = rel.lower[0] - beta;
  let delta = Math.max(beta, 1) / 2;
  let evaluations = 0;
  let best: SlopeSegmentation = {
    changes: kinks, knotValues: Array.from(fit.values), cost: fit.rss, penalisedCost: fit.rss + beta * kinks.length,
    evaluations: 0, maxCandidates: 0, meanCandidates: 0, exact: false,
  };
  if (line.rss < best.penalisedCost) best = { ...best, changes: [], knotValues: Array.from(line.values), cost: line.rss, penalisedCost: line.rss };
  for (;;) {
    let guess = lowerTotal + delta;
    const last = guess >= feasible;
    if (last) guess = feasible;
    const upper = guess + 1e-9 * (1 + Math.abs(guess));
    const r = cpopSearch(x, y, w, wyy, beta, minSegment, rel.lower, upper, budget - evaluations);
    if (!r) {
      // work budget spent: the best line found so far, not proven optimal
      best.evaluations = Math.max(evaluations, budget);
      best.exact = false;
      return best;
    }
    evaluations += r.evaluations;
    if (r.penalisedCost < best.penalisedCost) best = r;
    if (last || r.penalisedCost <= upper) { r.evaluations = evaluations; r.exact = true; return r; }
    // a solution over the guess is still feasible: a tighter ceiling for the sequence
    if (r.penalisedCost < feasible) feasible = r.penalisedCost;
    delta *= 1.5;
  }
}

/**
 * Most candidate pieces {@link cpop} evaluates in all (about 10-30 s of work); past it
 * the best line found is returned with `exact: false`.
 */
export const CPOP_WORK_BUDGET = 2e8;

/**
 * One CPOP pass. With `lower` (G) and `upper` (UB), fitted values with
 * f_t(phi) > UB - G(t) are discarded: no path through them costs UB or less.
 * When nothing is under the ceiling at a step, the best piece is kept, so the pass ends
 * in a feasible line (optimal when its cost is within UB). Returns null when the work
 * budget (candidate evaluations) runs out. Unchecked.
 */
function cpopSearch(x: Float64Array, y: Float64Array, w: Float64Array, wyy: Float64Array, penalty: number, minSegment: number, lower: Float64Array | null, upper: number, budget = INF): SlopeSegmentation | null {
  const n = x.length;
  const beta = penalty;
  const lowerBound: Float64Array = lower ?? new Float64Array(n);
  const Q = new QuadStore();
  // per start point s: running sums over (s, t] with d = x_i - x_s
  const S0 = new Float64Array(n), S1 = new Float64Array(n), S2 = new Float64Array(n);
  const T0 = new Float64Array(n), T1 = new Float64Array(n), U = new Float64Array(n);
  const qStart = new Int32Array(n), qCount = new Int32Array(n);
  let active: Int32Array = new Int32Array(64);
  let na = 0;
  // root: f_0
  qStart[0] = Q.push(w[0], -2 * w[0] * y[0], wyy[0] - beta, -1, 0, 0, 0);
  qCount[0] = 1;
  active[na++] = 0;
  // temporary candidates at one step
  let ta: Float64Array = new Float64Array(256), tb: Float64Array = new Float64Array(256), tc: Float64Array = new Float64Array(256);
  let tpar: Int32Array = new Int32Array(256), tal: Float64Array = new Float64Array(256), tga: Float64Array = new Float64Array(256);
  let onEnv: Uint8Array = new Uint8Array(256);
  let live: Int32Array = new Int32Array(256);
  const envIdx: number[] = [];
  const envLo: number[] = [];
  const envHi: number[] = [];
  let evaluations = 0;
  let maxCandidates = 1;
  let sumCandidates = 0;
  let finalBest = -1;
  let finalValue = INF;
  for (let t = 1; t < n; t++) {
    const xt = x[t], wt = w[t], wyt = w[t] * y[t], uyt = wyy[t];
    let K = 0;
    let keep = 0;
    for (let ai = 0; ai < na; ai++) {
      const s = active[ai];
      // drop dead pieces of s; drop s when none is left
      let alive = 0;
      const q0 = qStart[s], qn = qCount[s];
      for (let j = q0; j < q0 + qn; j++) if (Q.die[j] > t) alive++;
      if (alive === 0) continue;
      active[keep++] = s;
      const d = xt - x[s];
      S0[s] += wt; S1[s] += wt * d; S2[s] += wt * d * d;
      T0[s] += wyt; T1[s] += wyt * d; U[s] += uyt;
      if (t - s < minSegment) continue;
      const L = d;
      const B = S2[s] / (L * L);
      const Dm = S1[s] / L - B;
      const A = S0[s] - 2 * (S1[s] / L) + B;
      const Fy = T1[s] / L;
      const Ey = T0[s] - Fy;
      const G = U[s];
      for (let j = q0; j < q0 + qn; j++) {
        if (Q.die[j] <= t) continue;
        // Q(a, b) = M a^2 + 2 D a b + B b^2 + P a - 2 F b + Kc, minimised over a
        const M = Q.a[j] + A;
        const P = Q.b[j] - 2 * Ey;
        const Kc = Q.c[j] + G;
        if (K === ta.length) {
          const g = (o: Float64Array): Float64Array => { const r = new Float64Array(K * 2); r.set(o); return r; };
          ta = g(ta); tb = g(tb); tc = g(tc); tal = g(tal); tga = g(tga);
          const p2 = new Int32Array(K * 2); p2.set(tpar); tpar = p2;
          onEnv = new Uint8Array(K * 2);
        }
        ta[K] = B - (Dm * Dm) / M;
        tb[K] = -2 * Fy - (Dm * P) / M;
        tc[K] = Kc - (P * P) / (4 * M) + beta;
        tal[K] = -P / (2 * M);
        tga[K] = -Dm / M;
        tpar[K] = j;
        K++;
      }
    }
    na = keep;
    evaluations += K;
    if (evaluations > budget) return null;
    sumCandidates += K;
    if (K > maxCandidates) maxCandidates = K;
    if (K === 0) { qCount[t] = 0; continue; }
    if (t === n - 1) {
      for (let k = 0; k < K; k++) {
        const v = tc[k] - (tb[k] * tb[k]) / (4 * ta[k]);
        if (v < finalValue) { finalValue = v; finalBest = k; }
      }
      break;
    }
    // cap: values where f_t exceeds it cannot be on an optimal path
    const cap = upper - lowerBound[t];
    // lower envelope by a left-to-right sweep, over candidates whose minimum is under the cap
    envIdx.length = 0; envLo.length = 0; envHi.length = 0;
    if (live.length < K) live = new Int32Array(2 * K);
    let nl = 0;
    let cur = -1;
    for (let k = 0; k < K; k++) {
      if (tc[k] - (tb[k] * tb[k]) / (4 * ta[k]) > cap) continue;
      live[nl++] = k;
      if (cur < 0 || ta[k] < ta[cur] || (ta[k] === ta[cur] && (tb[k] > tb[cur] || (tb[k] === tb[cur] && tc[k] < tc[cur])))) cur = k;
    }
    let capT = cap;
    if (cur < 0) {
      // nothing under the cap (the ceiling is below the optimum): keep the best piece so
      // the pass still ends in a feasible line; the caller's check decides optimality
      let vmin = INF;
      for (let k = 0; k < K; k++) {
        const v = tc[k] - (tb[k] * tb[k]) / (4 * ta[k]);
        if (v < vmin) { vmin = v; cur = k; }
      }
      live[nl++] = cur;
      capT = vmin;
    }
    // a candidate with no crossing below the current piece ahead of pos lies on or above
    // the envelope from pos on, so it is dropped from the sweep (as in CPOP's pruning)
    let pos = -INF;
    { let k2 = 0; for (let i = 0; i < nl; i++) if (live[i] !== cur) live[k2++] = live[i]; nl = k2; }
    for (let step = 0; step < 2 * K + 1; step++) {
      let best = INF;
      let arg = -1;
      let argAt = -1;
      const a0 = ta[cur], b0 = tb[cur], c0 = tc[cur];
      let keepL = 0;
      for (let i = 0; i < nl; i++) {
        const k = live[i];
        const r = crossing(ta[k] - a0, tb[k] - b0, tc[k] - c0, pos);
        if (r < INF) {
          if (r < best) { best = r; arg = k; argAt = keepL; }
          live[keepL++] = k;
        }
      }
      nl = keepL;
      envIdx.push(cur); envLo.push(pos);
      if (arg < 0) { envHi.push(INF); break; }
      envHi.push(best);
      live[argAt] = cur; // the old piece may come back lower further right
      pos = best;
      cur = arg;
    }
    // store the envelope's pieces as f_t
    for (let k = 0; k < K; k++) onEnv[k] = 0;
    for (let p = 0; p < envIdx.length; p++) {
      const e = envIdx[p];
      if (minOnInterval(ta[e], tb[e], tc[e] - capT, envLo[p], envHi[p]) <= 0) onEnv[e] = 1;
    }
    qStart[t] = Q.size;
    let cnt = 0;
    for (let k = 0; k < K; k++) {
      if (onEnv[k]) { Q.push(ta[k], tb[k], tc[k], tpar[k], tal[k], tga[k], t); cnt++; }
    }
    qCount[t] = cnt;
    // inequality pruning: q - f_t >= beta on every envelope piece
    const P = envIdx.length;
    // the envelope's minimiser: a quick first test that rejects most candidates
    let phiStar = 0, fStar = INF, pStar = 0;
    for (let p = 0; p < P; p++) {
      const e = envIdx[p];
      let v = -tb[e] / (2 * ta[e]);
      if (v < envLo[p]) v = envLo[p];
      if (v > envHi[p]) v = envHi[p];
      const fv = (ta[e] * v + tb[e]) * v + tc[e];
      if (fv < fStar) { fStar = fv; phiStar = v; pStar = p; }
    }
    // a piece is dropped when, wherever q - beta is under the cap (the interval I_q),
    // it is at least f_t: then a kink at t does as well, or the path cannot beat UB
    const top = capT + beta;
    for (let k = 0; k < K; k++) {
      const j = tpar[k];
      if (Q.die[j] !== INF) continue;
      const a2 = ta[k], a1 = tb[k], a0 = tc[k];
      const qmin = a0 - (a1 * a1) / (4 * a2);
      let prune = true;
      if (qmin < top) {
        if (P === 0) continue;
        if ((a2 * phiStar + a1) * phiStar + a0 - fStar < beta && (a2 * phiStar + a1) * phiStar + a0 < top) continue;
        // I_q = (r1, r2): roots of q - top
        const h = Math.sqrt((a1 * a1 - 4 * a2 * (a0 - top))) / (2 * a2);
        const v = -a1 / (2 * a2);
        const r1 = v - h, r2 = v + h;
        for (let p = 0; p < P; p++) {
          const q = (p + pStar) % P;
          const lo = envLo[q] > r1 ? envLo[q] : r1, hi = envHi[q] < r2 ? envHi[q] : r2;
          if (lo >= hi) continue;
          const e = envIdx[q];
          if (minOnInterval(a2 - ta[e], a1 - tb[e], a0 - tc[e] - beta, lo, hi) < 0) { prune = false; break; }
        }
      }
      if (prune) Q.die[j] = t + minSegment;
    }
    if (na === active.length) { const a2 = new Int32Array(na * 2); a2.set(active); active = a2; }
    if (cnt > 0) active[na++] = t;
  }
  if (n === 1) {
    return { changes: [], knotValues: [y[0]], cost: wyy[0] - w[0] * y[0] * y[0], penalisedCost: wyy[0] - w[0] * y[0] * y[0], evaluations: 0, maxCandidates: 1, meanCandidates: 1, exact: true };
  }
  if (finalBest < 0) return null;
  // backtrack from the best final piece
  const k = finalBest;
  let phi = -tb[k] / (2 * ta[k]);
  const knots: number[] = [n - 1];
  const values: number[] = [phi];
  let j = tpar[k];
  phi = tal[k] + tga[k] * phi;
  while (j >= 0) {
    knots.push(Q.time[j]);
    values.push(phi);
    const pj = Q.parent[j];
    phi = Q.alpha[j] + Q.gamma[j] * phi;
    j = pj;
  }
  knots.reverse(); values.reverse();
  const changes = knots.slice(1, -1);
  // residual sum of squares of the broken line, recomputed from the data (the DP's
  // value carries beta in its constants, which costs digits when beta is large)
  const cost = brokenLineRss(x, y, w, wyy, knots, values);
  return { changes, knotValues: values, cost, penalisedCost: cost + beta * changes.length, evaluations, maxCandidates, meanCandidates: sumCandidates / Math.max(1, n - 1), exact: lower === null };
}
