/**
 * solveTrend's entry points that the path relies on: rebuilding an exact fit from its
 * knots (a path point's seed), and cross-validation solves that do not stop at a stalled
 * interior point. Optimality is checked by the dense KKT checker of trendKkt.ts.
 */
import * as solveTrendModule from '../../../src/engine/smoothers/trend/solveTrend';
import { solveTrend, seedOf, TrendProblem, KnotSeed, WARM_RULE, HALVED_RULE, solveTrendOverHalvedStep, WARM_REFINED_DIRECTLY, DUAL_RECOVERY_LIMIT } from '../../../src/engine/smoothers/trend/solveTrend';
import { trendDualInteriorPoint, trendOperator } from '../../../src/engine/smoothers/trend/trendDualInteriorPoint';
import { trendScaling } from '../../../src/engine/smoothers/trend/trendScaling';
import { dualFromResidualByLevel } from '../../../src/engine/linalg/dualFromResidual';
import * as activeSetNewtonModule from '../../../src/engine/smoothers/trend/activeSetNewton';
import { trendPath, CV_TOLERANCE, ORDER2_SWITCH_BELOW } from '../../../src/engine/smoothers/trend/trendPath';
import { seriesFromArrays } from '../../../src/engine/series';
import { activeSetNewton } from '../../../src/engine/smoothers/trend/activeSetNewton';
import { trendLambdaMax } from '../../../src/engine/smoothers/trend/trendLambdaMax';
import { checkTrendKkt, denseDifference } from './trendKkt';
import { doppler, blocks, seededNormal } from './trendTestFunctions';
import { kinksAndWave } from '../../helpers/autoBenchShapes';

const realSolveTrend = solveTrend;

function problem(n: number, k: number, seed: number): TrendProblem {
  const rn = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.5 + Math.abs(rn()); x[i] = c; }
  const span = x[n - 1] - x[0];
  for (let i = 0; i < n; i++) {
    const t = (x[i] - x[0]) / span;
    y[i] = Math.sin(7 * t * t) + (t > 0.5 ? 3 * (t - 0.5) : 0) + 0.1 * rn();
    w[i] = 1 + (i % 2);
  }
  // unit mean spacing, as solveTrend expects
  const h = span / (n - 1);
  return { x: Float64Array.from(x, (v) => (v - x[0]) / h), y, w, k };
}

/**
 * solveTrend with its call of the Newton rounds from a converged interior point watched (the call
 * of activeSetNewton with 8 rounds, NEWTON_ROUNDS): the fit, and that call's arguments and result
 * when it was made.
 */
function solveWatchingNewtonRounds(prob: TrendProblem, lambda: number, opt: { tolerance: number; maxIterations: number }): { fit: ReturnType<typeof solveTrend>; newton?: { call: Parameters<typeof activeSetNewton>; result: ReturnType<typeof activeSetNewton> } } {
  const spy = jest.spyOn(activeSetNewtonModule, 'activeSetNewton');
  try {
    const fit = solveTrend(prob, lambda, opt);
    const j = spy.mock.calls.findIndex((c) => c[7] === 8);
    return { fit, newton: j >= 0 ? { call: spy.mock.calls[j], result: spy.mock.results[j].value as ReturnType<typeof activeSetNewton> } : undefined };
  } finally {
    spy.mockRestore();
  }
}

describe('solveTrend', () => {
  test.each([1, 2, 3])('order %i: a seed (knots and signs of an exact fit) rebuilds that fit in at most two rounds', (k) => {
    const p = problem(200, k, 40 + k);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const fit = solveTrend(p, lam, { tolerance: 1e-10, maxIterations: 200 });
    expect(fit.status.converged).toBe(true);
    expect(fit.knotRows.length).toBeGreaterThan(2);
    const again = solveTrend({ x: p.x, y: p.y, w: p.w, k }, lam, { tolerance: 1e-10, maxIterations: 200, seed: seedOf(fit) });
    expect(again.status.iterations).toBeLessThanOrEqual(2);
    expect(again.knotRows).toEqual(fit.knotRows);
    let diff = 0;
    for (let i = 0; i < fit.b.length; i++) diff = Math.max(diff, Math.abs(again.b[i] - fit.b[i]));
    expect(diff).toBeLessThan(1e-9);
  });

  test('a seed that is wrong is not trusted: the solve goes on and still meets the KKT conditions', () => {
    const k = 2;
    const p = problem(150, k, 51);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const r = solveTrend(p, lam, { tolerance: 1e-10, maxIterations: 200, seed: { rows: [10, 70, 120], signs: [1, 1, 1] } });
    expect(r.status.converged).toBe(true);
    const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, k, lam);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
  });

  test('without refinement, an interior point stopped short (here by its iteration limit) goes on to the refinement', () => {
    const k = 1;
    const p = problem(300, k, 61);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const r = solveTrend(p, lam, { tolerance: 1e-8, maxIterations: 3, refine: false });
    expect(r.status.converged).toBe(true);
    expect(r.status.achieved).toBeLessThanOrEqual(1e-8);
    const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, k, lam);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
  });

  test.each([1, 2, 3])('order %i: the active-set Newton method keeps an optimal knot set and finds it again within 8 rounds from one with a knot missing', (k) => {
    const p = problem(200, k, 70 + k);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const fit = solveTrend(p, lam, { tolerance: 1e-10, maxIterations: 200 });
    expect(fit.status.converged).toBe(true);
    const n = p.x.length;
    // on x mapped to [0, 1], as the refinement works: D(x01) = N^k D(x)
    const N = p.x[n - 1] - p.x[0];
    const x01 = Float64Array.from(p.x, (v) => (v - p.x[0]) / N);
    const lam01 = lam / Math.pow(N, k);
    const rows = fit.knotRows, signs = rows.map((r) => Math.sign(fit.u[r]));
    const same = activeSetNewton(x01, p.y, p.w, k, lam01, rows, signs, 8);
    expect(same.settled).toBe(true);
    expect(same.rounds).toBe(1);
    expect(same.rows).toEqual(rows);
    // a nearly right set: the middle knot missing (with a spurious knot as well, orders 2 and 3
    // need more than 8 rounds here: the method is kept for nearly right starts)
    const mid = rows.length >> 1;
    const rows2 = rows.filter((_, j) => j !== mid);
    const signs2 = rows2.map((r) => Math.sign(fit.u[r]));
    const again = activeSetNewton(x01, p.y, p.w, k, lam01, rows2, signs2, 8);
    expect(again.settled).toBe(true);
    expect(again.rows).toEqual(rows);
    expect(again.signs).toEqual(signs);
  });

  test.each([1, 2, 3])('order %i: with knots sliding, the active-set Newton method finds the optimal set from knots displaced 1 to 3 rows, in no more rounds than without sliding', (k) => {
    // displaced knots are what a path step or a cross-validation fold starts from; without sliding, orders 2
    // and 3 cycle from some of these starts (an active set repeats) and the monotone refinement must finish
    const p = problem(400, k, 70 + k);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const fit = solveTrend(p, lam, { tolerance: 1e-10, maxIterations: 200 });
    const n = p.x.length;
    const N = p.x[n - 1] - p.x[0];
    const x01 = Float64Array.from(p.x, (v) => (v - p.x[0]) / N);
    const lam01 = lam / Math.pow(N, k);
    const rows = fit.knotRows, signs = rows.map((r) => Math.sign(fit.u[r]));
    for (const shift of [1, 2, 3]) {
      const r2: number[] = [], s2: number[] = [];
      rows.forEach((r, j) => { const v = Math.max(0, r - shift); if (!r2.length || r2[r2.length - 1] < v) { r2.push(v); s2.push(signs[j]); } });
      const sliding = activeSetNewton(x01, p.y, p.w, k, lam01, r2, s2, 60, undefined, 0, true, Infinity, true);
      const plain = activeSetNewton(x01, p.y, p.w, k, lam01, r2, s2, 60, undefined, 0, true, Infinity, false);
      expect(sliding.settled).toBe(true);
      expect(sliding.rows).toEqual(rows);
      expect(sliding.signs).toEqual(signs);
      if (plain.settled) expect(sliding.rounds).toBeLessThanOrEqual(plain.rounds);
    }
  });

  test('order 1 along a path: the active-set method from the previous penalty\'s knots meets the KKT conditions at each penalty, with its gap certified', () => {
    const k = 1;
    const p = problem(300, k, 81);
    const lmax = trendLambdaMax(p.x, p.y, p.w, k);
    let warm = solveTrend(p, 1e-2 * lmax, { tolerance: 1e-8, maxIterations: 200 });
    let warmStarted = 0;
    for (const ratio of [6e-3, 3e-3, 1.5e-3, 7e-4]) {
      const lam = ratio * lmax;
      const r = solveTrend(p, lam, { tolerance: 1e-8, maxIterations: 200, warm });
      if (r.status.stoppingRule === WARM_RULE) warmStarted++;
      expect(r.status.converged).toBe(true);
      expect(r.status.achieved).toBeLessThanOrEqual(1e-8);
      const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, k, lam);
      expect(kkt.boxExcess).toBeLessThan(1e-6);
      expect(kkt.signError).toBeLessThan(1e-6);
      expect(kkt.stationarity).toBeLessThan(1e-8);
      warm = r;
    }
    // the strategy under test ran (not only the interior point behind it)
    expect(warmStarted).toBeGreaterThan(0);
  });

  test('order 1 with a guess of the knots (a fold started from the full-data fit): a wrong guess still ends at the optimum', () => {
    const k = 1;
    const p = problem(250, k, 91);
    const lam = 2e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    for (const guess of [{ rows: [5, 100, 200], signs: [1, -1, 1] }, { rows: [], signs: [] }]) {
      const r = solveTrend(p, lam, { tolerance: 1e-5, maxIterations: 200, refine: false, guess });
      expect(r.status.converged).toBe(true);
      expect(r.status.achieved).toBeLessThanOrEqual(1e-5);
      // the certified gap bounds the distance to the optimum: ||b - b*||_W <= sqrt(2 gap), gap = achieved P(b)
      const exact = solveTrend(p, lam, { tolerance: 1e-12, maxIterations: 200 });
      const D = denseDifference(p.x, k + 1);
      let d2 = 0, P = 0;
      for (let i = 0; i < p.y.length; i++) { d2 += p.w[i] * (r.b[i] - exact.b[i]) ** 2; P += 0.5 * p.w[i] * (p.y[i] - r.b[i]) ** 2; }
      for (const row of D) P += lam * Math.abs(row.reduce((acc, v, i) => acc + v * r.b[i], 0));
      expect(Math.sqrt(d2)).toBeLessThanOrEqual(Math.sqrt(2 * r.status.achieved * P) * 1.01 + 1e-9);
    }
  });

  test('from a converged interior point, the Newton rounds stop at the first repeated active set (a cycle never settles) and the interior point\'s certified answer stands', () => {
    // seeded: a sine on x with four gaps of 500 spacings, weights 0.2 to 4.2, order 3 at 1e-9 of
    // lambda_max; the dual recovered from the interior point's own fit is within DUAL_RECOVERY_LIMIT
    // of lambda here, so the rounds run, and they cycle from this start
    const n = 1000, k = 3;
    const rn = seededNormal(n + k + 7);
    const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
    let c = 0;
    for (let i = 0; i < n; i++) { c += i % Math.floor(n / 4) === 0 && i > 0 ? 500 : 1; x[i] = c; w[i] = 0.2 + (i % 5); }
    for (let i = 0; i < n; i++) y[i] = Math.sin(x[i] / 300) + 0.3 * rn();
    const sc = trendScaling(seriesFromArrays(x, y, w), k);
    const lam = 1e-9 * trendLambdaMax(sc.xs, sc.ys, sc.ws, k);
    const { fit, newton } = solveWatchingNewtonRounds({ x: sc.xs, y: sc.ys, w: sc.ws, k }, lam, { tolerance: 1e-8, maxIterations: 200 });
    expect(newton).toBeDefined();
    const { call, result } = newton!;
    expect(result.settled).toBe(false);
    expect(result.rounds).toBeLessThan(8);
    // the same start without the rule, for 60 rounds: it does not settle either, so nothing was lost
    const long = activeSetNewton(call[0], call[1], call[2], call[3], call[4], call[5], call[6], 60);
    expect(long.settled).toBe(false);
    expect(long.changes.slice(0, result.rounds)).toEqual(result.changes);
    expect(fit.status.converged).toBe(true);
    expect(fit.status.achieved).toBeLessThanOrEqual(1e-8);
  });

  test('from a converged interior point whose own fit gives its dual back only to more than DUAL_RECOVERY_LIMIT of lambda, no Newton round runs and its certified answer comes back (no round could have certified the exact fit there)', () => {
    // a chirp plus a kinked ramp with noise (seeded), order 3 with dense knots
    const n = 5000, k = 3, lam = 0.01;
    const rn = seededNormal(1);
    const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n).fill(1);
    for (let i = 0; i < n; i++) { const t = i / (n - 1); x[i] = i; y[i] = Math.sin(2 * Math.PI * 3 * t * t * t) + (t > 0.6 ? 2 * (t - 0.6) : 0) + 0.2 * rn(); }
    const opt = { tolerance: 1e-8, maxIterations: 200 };
    // the interior point on its own, as the solve starts it
    const ip = trendDualInteriorPoint(trendOperator(x, w, k), y, lam, opt.tolerance, opt.maxIterations);
    expect(ip.status.converged).toBe(true);
    // the dual recovered from its fit by the level-by-level reference recursion, on x in [0, 1]
    // (lambda and u scale by f = (x_n - x_1)^k there)
    const N = x[n - 1] - x[0], f = Math.pow(N, k);
    const x01 = Float64Array.from(x, (v) => (v - x[0]) / N);
    const g = Float64Array.from(y, (v, i) => w[i] * (v - ip.b[i]));
    const rec = dualFromResidualByLevel(x01, k + 1, g).u;
    let err = 0;
    for (let r = 0; r < rec.length; r++) err = Math.max(err, Math.abs(rec[r] - ip.u[r] / f));
    expect(err / (lam / f)).toBeGreaterThan(10 * DUAL_RECOVERY_LIMIT);
    const { fit, newton } = solveWatchingNewtonRounds({ x, y, w, k }, lam, opt);
    expect(newton).toBeUndefined();
    // the interior point's answer, bit for bit, with its own iterations
    expect(Array.from(fit.b)).toEqual(Array.from(ip.b));
    expect(fit.status.iterations).toBe(ip.status.iterations);
    expect(fit.status.converged).toBe(true);
    expect(fit.status.achieved).toBe(ip.status.achieved);
    // the rounds from its knots, run anyway for 60 rounds: no certified fit at the tolerance
    const signs = fit.knotRows.map((r) => (fit.u[r] >= 0 ? 1 : -1));
    const long = activeSetNewton(x01, y, w, k, lam / f, fit.knotRows, signs, 60);
    expect(long.fit !== undefined && long.fit.achieved <= opt.tolerance).toBe(false);
  });

  test('from a converged interior point, a settled Newton round whose own certificate misses the tolerance is certified by the interior point\'s dual: the exact fit comes back, checked against P - G formed directly', () => {
    // seeded: Donoho and Johnstone's Blocks on 500 points of [0, 1] with unit noise, order 3 at 1e-8 of
    // lambda_max (174 knots); the settled round's own dual, recovered from its residual, misses by
    // more than the tolerance on the knot rows, the interior point's does not
    const n = 500, k = 3;
    const rn = seededNormal(n + k + 7);
    const x = new Float64Array(n), y = new Float64Array(n);
    for (let i = 0; i < n; i++) { x[i] = i / n; y[i] = (blocks(x[i]) * 7) / 4 + rn(); }
    const sc = trendScaling(seriesFromArrays(x, y), k);
    const lam = 1e-8 * trendLambdaMax(sc.xs, sc.ys, sc.ws, k);
    const opt = { tolerance: 1e-8, maxIterations: 200 };
    const { fit, newton } = solveWatchingNewtonRounds({ x: sc.xs, y: sc.ys, w: sc.ws, k }, lam, opt);
    expect(newton).toBeDefined();
    const { call, result } = newton!;
    expect(result.settled).toBe(true);
    // the same rounds with no outside dual: they settle too, with a certificate above the tolerance
    const own = activeSetNewton(call[0], call[1], call[2], call[3], call[4], call[5], call[6], 8, undefined, 0, true);
    expect(own.settled).toBe(true);
    expect(own.fit!.achieved).toBeGreaterThan(opt.tolerance);
    // the answer is that settled fit, carrying the interior point's dual
    const outside = call[13]!;
    expect(Array.from(result.fit!.u)).toEqual(Array.from(outside.v));
    expect(Array.from(fit.b)).toEqual(Array.from(own.fit!.b));
    expect(fit.status.converged).toBe(true);
    expect(fit.status.achieved).toBeLessThanOrEqual(opt.tolerance);
    // checked here in the solver's own units (x at unit mean spacing): |u| <= lambda, D b exactly
    // zero off the knots up to rounding, and the relative gap P(b) - G(u) formed directly from the
    // dense operator (G(u): the Lagrangian at b_u = y - W^-1 D^T u) within the tolerance
    const D = denseDifference(sc.xs, k + 1);
    let umax = 0;
    for (const v of fit.u) umax = Math.max(umax, Math.abs(v));
    expect(umax).toBeLessThanOrEqual(lam);
    const db = D.map((row) => row.reduce((s, c, i) => s + c * fit.b[i], 0));
    const dmax = Math.max(...db.map(Math.abs));
    const knots = new Set(fit.knotRows);
    // off the knots D b is rounding only: 4e-14 of its largest value here (measured), under a hundredth of the bound
    for (let r = 0; r < db.length; r++) if (!knots.has(r)) expect(Math.abs(db[r])).toBeLessThan(1e-11 * dmax);
    const bu = Float64Array.from(sc.ys, (yi, i) => yi - D.reduce((s, row, r) => s + row[i] * fit.u[r], 0) / sc.ws[i]);
    let primal = 0, dual = 0;
    for (let i = 0; i < n; i++) { primal += 0.5 * sc.ws[i] * (sc.ys[i] - fit.b[i]) ** 2; dual += 0.5 * sc.ws[i] * (sc.ys[i] - bu[i]) ** 2; }
    D.forEach((row, r) => { primal += lam * Math.abs(db[r]); dual += fit.u[r] * row.reduce((s, c, i) => s + c * bu[i], 0); });
    expect((primal - dual) / primal).toBeLessThanOrEqual(opt.tolerance);
    // and it is not the interior point's answer, whose D b has no exact zeros
    const ip = trendDualInteriorPoint(trendOperator(sc.xs, sc.ws, k), sc.ys, lam, opt.tolerance, opt.maxIterations);
    expect(Array.from(fit.b)).not.toEqual(Array.from(ip.b));
  });

  test('order 2: a Newton start whose fewest changed rows stalls for several rounds before it settles is still followed to the exact fit', () => {
    // why the rounds from a converged interior point stop on a repeated active set only, not on a lack of progress
    const p = problem(2000, 2, 1);
    const lam = 1e-6 * trendLambdaMax(p.x, p.y, p.w, 2);
    const { fit, newton } = solveWatchingNewtonRounds(p, lam, { tolerance: 1e-8, maxIterations: 200 });
    expect(newton).toBeDefined();
    const result = newton!.result;
    expect(result.settled).toBe(true);
    // the longest stretch of rounds without a new fewest count before it settled
    let fewest = Infinity, since = 0, longest = 0;
    for (const c of result.changes) { if (c < fewest) { fewest = c; since = 0; } else longest = Math.max(longest, ++since); }
    expect(longest).toBeGreaterThanOrEqual(3);
    expect(fit.status.converged).toBe(true);
    expect(fit.knotRows).toEqual(result.rows);
    const kkt = checkTrendKkt(p.x, p.y, p.w, fit.b, 2, lam);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
  });
});

describe('solveTrend, one shape for every fit', () => {
  test('fits made by every strategy (dynamic programming, the polynomial, the interior point, a seed, a warm start, a fold solve, a halved step) list the same fields in the same order, and so do their statuses', () => {
    // code that reads fits after a long loop is compiled for the shapes it has met (DEVELOPERS.md,
    // "Long loops and the first call"); a fit spread from another or missing an optional field had a shape of its own
    const p = problem(200, 2, 61);
    const lmax = trendLambdaMax(p.x, p.y, p.w, 2);
    const opt = { tolerance: 1e-10, maxIterations: 200 };
    const cold = solveTrend(p, 1e-2 * lmax, opt);
    const fits = [
      solveTrend({ ...problem(200, 0, 62) }, 0.5, opt),
      solveTrend(p, 2 * lmax, opt),
      cold,
      solveTrend({ x: p.x, y: p.y, w: p.w, k: 2 }, 1e-2 * lmax, { ...opt, seed: seedOf(cold) }),
      solveTrend(p, 0.7e-2 * lmax, { ...opt, warm: cold }),
      solveTrend(p, 0.7e-2 * lmax, { ...opt, refine: false, interiorFirst: true }),
      solveTrendOverHalvedStep(p, 0.5e-2 * lmax, { ...opt, warm: cold })!,
    ];
    const rules = new Set(fits.map((f) => f.status.stoppingRule));
    expect(rules.size).toBeGreaterThanOrEqual(5);
    for (const f of fits) {
      expect(Object.keys(f)).toEqual(Object.keys(fits[0]));
      expect(Object.keys(f.status)).toEqual(Object.keys(fits[0].status));
    }
  });
});

describe('solveTrend, orders 2 and 3 warm-started', () => {
  test.each([2, 3])('order %i along a path: the active set from the previous penalty\'s knots meets the KKT conditions at each penalty, with its gap certified', (k) => {
    const p = problem(300, k, 101 + k);
    const lmax = trendLambdaMax(p.x, p.y, p.w, k);
    let warm = solveTrend(p, 1e-2 * lmax, { tolerance: 1e-8, maxIterations: 200 });
    let warmStarted = 0;
    // steps of a factor of about 2, as on the default grids of orders 2 and 3 (30 points over 7 and 9 decades)
    for (const ratio of [5e-3, 2.5e-3, 1.2e-3, 6e-4, 3e-4, 1.5e-4]) {
      const lam = ratio * lmax;
      const r = solveTrend(p, lam, { tolerance: 1e-8, maxIterations: 200, warm });
      if (r.status.stoppingRule === WARM_RULE) warmStarted++;
      expect(r.status.converged).toBe(true);
      expect(r.status.achieved).toBeLessThanOrEqual(1e-8);
      const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, k, lam);
      expect(kkt.boxExcess).toBeLessThan(1e-6);
      expect(kkt.signError).toBeLessThan(1e-6);
      expect(kkt.stationarity).toBeLessThan(1e-8);
      warm = r;
    }
    expect(warmStarted).toBeGreaterThan(3);
  });

  test.each([2, 3])('order %i over a halved step: from the fit at a penalty 16 times larger the halved warm start ends at the optimum, its gap certified', (k) => {
    const p = problem(300, k, 131 + k);
    const lmax = trendLambdaMax(p.x, p.y, p.w, k);
    const warm = solveTrend(p, 4e-3 * lmax, { tolerance: 1e-8, maxIterations: 200 });
    const lam = 2.5e-4 * lmax;
    const r = solveTrendOverHalvedStep(p, lam, { tolerance: 1e-8, maxIterations: 200, warm });
    expect(r).toBeDefined();
    expect(r!.status.stoppingRule).toBe(HALVED_RULE);
    expect(r!.status.converged).toBe(true);
    expect(r!.status.achieved).toBeLessThanOrEqual(1e-8);
    const kkt = checkTrendKkt(p.x, p.y, p.w, r!.b, k, lam);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
    expect(kkt.stationarity).toBeLessThan(1e-8);
    // the same fit as a cold solve: the same knots, so the same restricted solve up to rounding
    const cold = solveTrend(p, lam, { tolerance: 1e-8, maxIterations: 200 });
    expect(r!.knotRows).toEqual(cold.knotRows);
    let diff = 0, scale = 0;
    for (let i = 0; i < cold.b.length; i++) { diff = Math.max(diff, Math.abs(r!.b[i] - cold.b[i])); scale = Math.max(scale, Math.abs(cold.b[i])); }
    expect(diff).toBeLessThan(1e-12 * scale);
    // the work of both halves is counted
    expect(r!.status.iterations).toBeGreaterThanOrEqual(2);
  });

  test.each([2, 3])('order %i: a fit warm-started from the previous penalty\'s fit is certified, the same optimum as a cold fit; order 3 goes straight to the refinement (no primal-dual rounds), order 2 runs them', (k) => {
    const p = problem(300, k, 151 + k);
    const lmax = trendLambdaMax(p.x, p.y, p.w, k);
    const prev = solveTrend(p, 2e-3 * lmax, { tolerance: 1e-10, maxIterations: 200 });
    expect(prev.status.converged).toBe(true);
    const spy = jest.spyOn(activeSetNewtonModule, 'activeSetNewton');
    let r: ReturnType<typeof solveTrend>;
    try {
      r = solveTrend(p, 1e-3 * lmax, { tolerance: 1e-10, maxIterations: 200, warm: prev });
      expect(spy.mock.calls.length).toBe(WARM_REFINED_DIRECTLY[k] ? 0 : 1);
    } finally {
      spy.mockRestore();
    }
    expect(WARM_REFINED_DIRECTLY[3]).toBe(true);
    expect(WARM_REFINED_DIRECTLY[2]).toBe(false);
    expect(r.status.converged).toBe(true);
    expect(r.status.stoppingRule).toBe(WARM_RULE);
    const cold = solveTrend(p, 1e-3 * lmax, { tolerance: 1e-10, maxIterations: 200 });
    expect(r.knotRows).toEqual(cold.knotRows);
    // both exact restricted solves on the same knots, refined from the data: they agree to rounding
    let diff = 0, scale = 0;
    for (let i = 0; i < cold.b.length; i++) { diff = Math.max(diff, Math.abs(r.b[i] - cold.b[i])); scale = Math.max(scale, Math.abs(cold.b[i])); }
    expect(diff).toBeLessThan(1e-10 * scale);
    const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, k, 1e-3 * lmax);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
  });

  test('the halved step needs a converged fit at a larger penalty', () => {
    const p = problem(200, 3, 141);
    const lmax = trendLambdaMax(p.x, p.y, p.w, 3);
    const smaller = solveTrend(p, 1e-4 * lmax, { tolerance: 1e-8, maxIterations: 200 });
    expect(solveTrendOverHalvedStep(p, 1e-3 * lmax, { tolerance: 1e-8, maxIterations: 200, warm: smaller })).toBeUndefined();
    expect(solveTrendOverHalvedStep(p, 1e-3 * lmax, { tolerance: 1e-8, maxIterations: 200 })).toBeUndefined();
    const stalled = { ...smaller, lambda: 1e-2 * lmax, status: { ...smaller.status, converged: false } };
    expect(solveTrendOverHalvedStep(p, 1e-3 * lmax, { tolerance: 1e-8, maxIterations: 200, warm: stalled })).toBeUndefined();
  });

  test.each([2, 3])('order %i with a guess of the knots (a fold), with and without the primal-dual rounds before the refinement: the gap accepted at the fold tolerance bounds the distance to the optimum', (k) => {
    const p = problem(250, k, 111 + k);
    const lam = 1e-3 * trendLambdaMax(p.x, p.y, p.w, k);
    const exact = solveTrend(p, lam, { tolerance: 1e-12, maxIterations: 200 });
    const near = seedOf(exact);
    // a guess with every knot moved by three rows, and an empty one
    const moved = { rows: near.rows.map((r) => Math.min(r + 3, p.x.length - k - 2)).filter((r, j, a) => j === 0 || r > a[j - 1]), signs: near.signs.slice() };
    moved.signs.length = moved.rows.length;
    const empty: KnotSeed = { rows: [], signs: [] };
    const cases: [KnotSeed, boolean][] = [[moved, false], [empty, false], [moved, true], [empty, true]];
    for (const [guess, refineGuessDirectly] of cases) {
      const r = solveTrend(p, lam, { tolerance: 1e-5, maxIterations: 200, refine: false, guess, refineGuessDirectly });
      expect(r.status.converged).toBe(true);
      expect(r.status.achieved).toBeLessThanOrEqual(1e-5);
      // weak duality: ||b - b*||_W^2 <= 2 (P(b) - P(b*)) <= 2 gap, gap = achieved P(b)
      const D = denseDifference(p.x, k + 1);
      let d2 = 0, P = 0;
      for (let i = 0; i < p.y.length; i++) { d2 += p.w[i] * (r.b[i] - exact.b[i]) ** 2; P += 0.5 * p.w[i] * (p.y[i] - r.b[i]) ** 2; }
      for (const row of D) P += lam * Math.abs(row.reduce((acc, v, i) => acc + v * r.b[i], 0));
      expect(Math.sqrt(d2)).toBeLessThanOrEqual(Math.sqrt(2 * r.status.achieved * P) * 1.01 + 1e-9);
    }
  });

  // 400 and 200 points keep the test within a minute under jest (the same runs take about 1 s in plain Node)
  test.each([[2, 400], [3, 200]])('order %i: cross-validation (5 folds x 30 penalties, %i points) converges at every penalty of the path and of every fold', (k, n) => {
    const statuses: { full: boolean; converged: boolean; achieved: number; tolerance: number }[] = [];
    const spy = jest.spyOn(solveTrendModule, 'solveTrend').mockImplementation((prob, lambda, opt) => {
      const fit = realSolveTrend(prob, lambda, opt);
      statuses.push({ full: opt.refine !== false, converged: fit.status.converged, achieved: fit.status.achieved, tolerance: opt.tolerance });
      return fit;
    });
    try {
      const rn = seededNormal(120 + k);
      const x = new Float64Array(n), y = new Float64Array(n);
      let c = 0;
      for (let i = 0; i < n; i++) { c += 0.5 + Math.abs(rn()) * 0.6; x[i] = c; }
      for (let i = 0; i < n; i++) {
        const t = (x[i] - x[0]) / (x[n - 1] - x[0]);
        y[i] = Math.sin(2 * Math.PI * 3 * t * t * t) + (t > 0.6 ? 2 * (t - 0.6) : 0) + 0.2 * rn();
      }
      const path = trendPath(seriesFromArrays(x, y), { order: k, gridSize: 30, folds: 5, relaxed: 0, tolerance: 1e-8, maxIterations: 200 });
      expect(path.points.length).toBe(30);
      expect(path.points.every((pt) => pt.status.converged && pt.status.achieved <= 1e-8)).toBe(true);
      // the full path (30) and five folds (30 each) went through solveTrend, each converged at its own tolerance
      expect(statuses.filter((s) => s.full).length).toBe(30);
      expect(statuses.filter((s) => !s.full).length).toBe(150);
      for (const s of statuses) {
        expect(s.converged).toBe(true);
        expect(s.achieved).toBeLessThanOrEqual(s.tolerance);
      }
    } finally {
      spy.mockRestore();
    }
  });
});

describe('solveTrend, interior point first (cross-validation folds of orders 2 and 3)', () => {
  test.each([2, 3])('order %i: where the interior point converges its answer is kept, where it stalls the active-set method finishes; the gap accepted bounds the distance to the optimum either way', (k) => {
    const p = problem(600, k, 121 + k);
    const lmax = trendLambdaMax(p.x, p.y, p.w, k);
    const D = denseDifference(p.x, k + 1);
    const seen = { converged: 0, stalled: 0 };
    for (const ratio of [1e-1, 1e-2, 1e-4, 1e-6]) {
      const lam = ratio * lmax;
      const r = solveTrend(p, lam, { tolerance: 1e-5, maxIterations: 200, refine: false, interiorFirst: true });
      expect(r.interior).toBeDefined();
      seen[r.interior!.converged ? 'converged' : 'stalled']++;
      expect(r.status.converged).toBe(true);
      expect(r.status.achieved).toBeLessThanOrEqual(1e-5);
      const exact = solveTrend(p, lam, { tolerance: 1e-12, maxIterations: 200 });
      let d2 = 0, P = 0;
      for (let i = 0; i < p.y.length; i++) { d2 += p.w[i] * (r.b[i] - exact.b[i]) ** 2; P += 0.5 * p.w[i] * (p.y[i] - r.b[i]) ** 2; }
      for (const row of D) P += lam * Math.abs(row.reduce((acc, v, i) => acc + v * r.b[i], 0));
      expect(Math.sqrt(d2)).toBeLessThanOrEqual(Math.sqrt(2 * r.status.achieved * P) * 1.01 + 1e-9);
    }
    // both branches ran on this sweep
    expect(seen.converged).toBeGreaterThan(0);
    expect(seen.stalled).toBeGreaterThan(0);
  });

  test('with refinement wanted the option is ignored: the exact certified fit comes back', () => {
    const p = problem(300, 3, 131);
    const lam = 1e-4 * trendLambdaMax(p.x, p.y, p.w, 3);
    const r = solveTrend(p, lam, { tolerance: 1e-8, maxIterations: 200, interiorFirst: true });
    expect(r.interior).toBeUndefined();
    expect(r.status.achieved).toBeLessThanOrEqual(1e-8);
    const kkt = checkTrendKkt(p.x, p.y, p.w, r.b, 3, lam);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
  });
});

describe('trendPath, fold fits switching to the interior point', () => {
  test.each([2, 3])('order %i: the switch is found in the first fold and leaves every score within 0.05 of its standard error of the active-set-only scores', (k) => {
    const rn = seededNormal(140 + k);
    const n = 300;
    const x = Array.from({ length: n }, (_, i) => i + 1);
    const y = x.map((t) => doppler(t / n) + 0.1 * rn());
    const series = seriesFromArrays(x, y);
    const settings = { order: k, gridSize: 12, folds: 5, relaxed: 0, tolerance: 1e-8, maxIterations: 200 };
    const switched = trendPath(series, settings);
    const plain = trendPath(series, { ...settings, foldInteriorPoint: false });
    expect(switched.foldInteriorFrom).toBeDefined();
    expect(plain.foldInteriorFrom).toBeUndefined();
    for (let j = 0; j < switched.points.length; j++) {
      const a = switched.points[j], b = plain.points[j];
      expect(a.df).toBe(b.df);
      expect(Math.abs(a.cv - b.cv)).toBeLessThanOrEqual(0.05 * b.cvSe);
    }
  });
});

describe('trendPath, fold switch by order and length', () => {
  test('order 2 from ORDER2_SWITCH_BELOW points: the fold fits never switch to the interior point', () => {
    const rn = seededNormal(150);
    const n = ORDER2_SWITCH_BELOW;
    const x = Array.from({ length: n }, (_, i) => i + 1);
    const y = x.map((t) => doppler(t / n) + 0.1 * rn());
    const path = trendPath(seriesFromArrays(x, y), { order: 2, gridSize: 8, folds: 5, relaxed: 0, tolerance: 1e-8, maxIterations: 200 });
    expect(path.foldInteriorFrom).toBeUndefined();
    expect(path.points.every((p) => Number.isFinite(p.cv))).toBe(true);
  });
});

/** An invented 2,000-point series: the automatic choice's kinks-and-wave shape with noise sd 0.3. */
function kinksSeries(seed: number) {
  const rn = seededNormal(seed);
  const n = 2000;
  const x = Array.from({ length: n }, (_, i) => i + 1);
  return seriesFromArrays(x, x.map((t) => kinksAndWave(t / n) + 0.3 * rn()));
}

/** 5-fold cross-validation over 15 penalties, as the automatic choice runs it from 2,000 points. */
const cvSettings = (k: number) => ({ order: k, gridSize: 15, folds: 5, relaxed: 0, tolerance: 1e-8, maxIterations: 200 });

/** Position of the lowest cross-validation score of a path. */
const argmin = (p: ReturnType<typeof trendPath>) => p.points.reduce((b, q, j) => (q.cv < p.points[b].cv ? j : b), 0);

describe('trendPath, fold fits at the looser gap of CV_TOLERANCE', () => {
  // What the choice depends on is the minimum and the scores near it (the one-standard-error rule): a score within 5
  // standard errors of the minimum may move by at most 0.05 of its standard error (measured: at most 0.044 on the
  // benchmark series, 0.02 here), any other by at most a tenth of its distance from the minimum, so that none can
  // come near being chosen (measured: up to 0.24 of a standard error, at the polynomial end of the path, about 48
  // standard errors above the minimum)
  test.each([1, 2, 3])('order %i: scores near the minimum within 0.05 of their standard error of the scores with fold fits at 1e-5, the others within a tenth of their distance from it, and the minimum at the same df', (k) => {
    const series = kinksSeries(150 + k);
    const settings = cvSettings(k);
    expect(CV_TOLERANCE).toBe(1e-3);
    const loose = trendPath(series, settings);
    const tight = trendPath(series, { ...settings, foldTolerance: 1e-5 });
    const best = tight.points[argmin(tight)];
    for (let j = 0; j < tight.points.length; j++) {
      const t = tight.points[j];
      expect(loose.points[j].df).toBe(t.df); // the full-data path is the same
      const moved = Math.abs(loose.points[j].cv - t.cv) / t.cvSe;
      const distance = (t.cv - best.cv) / best.cvSe;
      expect(moved).toBeLessThanOrEqual(distance <= 5 ? 0.05 : 0.1 * distance);
    }
    expect(loose.points[argmin(loose)].df).toBe(tight.points[argmin(tight)].df);
  }, 120000);
});

describe('trendPath, filling the grid near the best score (fillNearBest)', () => {
  test.each([1, 2, 3])('order %i: every other grid penalty, then the skipped ones beside the lowest score; the same lowest score and df as the whole grid, the shared scores within 0.05 of their standard error', (k) => {
    // its curve has one minimum
    const series = kinksSeries(160 + k);
    const settings = cvSettings(k);
    const whole = trendPath(series, settings);
    const filled = trendPath(series, { ...settings, fillNearBest: true });
    // the solved penalties: the whole grid's even positions (from the largest; both ends), plus at most two
    const index = filled.points.map((p) => whole.points.findIndex((q) => Math.abs(q.penalty / p.penalty - 1) < 1e-12));
    expect(index.every((i) => i >= 0)).toBe(true);
    const fromLargest = index.map((i) => whole.points.length - 1 - i);
    const evens = fromLargest.filter((j) => j % 2 === 0);
    expect(evens.length).toBe(8);
    expect(fromLargest.length - evens.length).toBeGreaterThanOrEqual(1);
    expect(fromLargest.length - evens.length).toBeLessThanOrEqual(2);
    // the skipped ones solved are the neighbours of the lowest score among the even ones
    const bestEven = evens.reduce((b, j) => (filled.points[fromLargest.indexOf(j)].cv < filled.points[fromLargest.indexOf(b)].cv ? j : b), evens[0]);
    for (const j of fromLargest.filter((v) => v % 2 === 1)) expect(Math.abs(j - bestEven)).toBe(1);
    expect(filled.scaledGrid.length).toBe(filled.points.length);
    expect(filled.points[argmin(filled)].df).toBe(whole.points[argmin(whole)].df);
    expect(filled.points[argmin(filled)].penalty).toBeCloseTo(whole.points[argmin(whole)].penalty, 9);
    filled.points.forEach((p, q) => {
      const w = whole.points[index[q]];
      expect(p.df).toBe(w.df); // exact full-data fits either way
      expect(Math.abs(p.cv - w.cv)).toBeLessThanOrEqual(0.05 * w.cvSe);
    });
  }, 120000);

  test('without cross-validation the setting changes nothing: the whole grid is solved', () => {
    const rn = seededNormal(170);
    const x = Array.from({ length: 200 }, (_, i) => i + 1);
    const y = x.map((t) => Math.sin(t / 20) + 0.2 * rn());
    const settings = { order: 2, gridSize: 12, folds: 0, relaxed: 0, tolerance: 1e-8, maxIterations: 200 };
    const p = trendPath(seriesFromArrays(x, y), { ...settings, fillNearBest: true });
    expect(p.points.length).toBe(12);
    expect(p.points.map((q) => q.df)).toEqual(trendPath(seriesFromArrays(x, y), settings).points.map((q) => q.df));
  });
});
