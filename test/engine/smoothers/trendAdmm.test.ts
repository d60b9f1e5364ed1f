/**
 * The ADMM of Ramdas and Tibshirani (JCGS 2016) for trend filtering, checked
 * against the independent optimality conditions of trendKkt.ts (dense divided
 * differences, dense QR) and against a duality gap recomputed here from the
 * returned primal and dual vectors.
 */
import { trendAdmm, scaledDifferenceRows } from '../../../src/engine/smoothers/trend/trendAdmm';
import { trendScaling } from '../../../src/engine/smoothers/trend/trendScaling';
import { trendLambdaMax } from '../../../src/engine/smoothers/trend/trendLambdaMax';
import { differenceOperator } from '../../../src/engine/linalg/difference';
import { seriesFromArrays } from '../../../src/engine/series';
import { checkTrendKkt, denseDifference } from './trendKkt';
import { seededNormal } from './trendTestFunctions';

function problem(n: number, k: number, seed: number) {
  const rn = seededNormal(seed);
  const x: number[] = [], y: number[] = [], w: number[] = [];
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.3 + Math.abs(rn()); x.push(c); }
  for (let i = 0; i < n; i++) { y.push(Math.sin(x[i] / 6) * 2 + 0.3 * rn()); w.push(0.5 + Math.abs(rn())); }
  const sc = trendScaling(seriesFromArrays(x, y, w), k);
  return { x: sc.xs, y: sc.ys, w: sc.ws, lmax: trendLambdaMax(sc.xs, sc.ys, sc.ws, k) };
}

/** P(b) - G(u) recomputed densely: G(u) = y.g - 1/2 sum g^2 / w with g = D^T u (D from the divided-difference formula). */
function denseGap(x: Float64Array, y: Float64Array, w: Float64Array, k: number, lambda: number, b: Float64Array, u: Float64Array): { gap: number; objective: number; boxExcess: number } {
  const n = x.length;
  const D = denseDifference(x, k + 1);
  const g = new Float64Array(n);
  let l1 = 0, boxExcess = -Infinity;
  for (let r = 0; r < D.length; r++) {
    let db = 0;
    for (let i = 0; i < n; i++) { g[i] += D[r][i] * u[r]; db += D[r][i] * b[i]; }
    l1 += Math.abs(db);
    boxExcess = Math.max(boxExcess, Math.abs(u[r]) / lambda - 1);
  }
  let rss = 0, yg = 0, gg = 0;
  for (let i = 0; i < n; i++) { rss += 0.5 * w[i] * (y[i] - b[i]) ** 2; yg += y[i] * g[i]; gg += (g[i] * g[i]) / w[i]; }
  const objective = rss + lambda * l1;
  return { gap: objective - (yg - 0.5 * gg), objective, boxExcess };
}

describe('trendAdmm', () => {
  test.each([
    [1, 0.3], [1, 0.02], [2, 0.3], [2, 0.02], [3, 0.3], [3, 0.02],
  ])('order %i at %p lambda_max reaches relative gap 1e-10 and meets the optimality conditions', (k, frac) => {
    const { x, y, w, lmax } = problem(80, k, 100 + k);
    const lam = frac * lmax;
    const r = trendAdmm(x, y, w, k, lam, 1e-10, 20000);
    expect(r.status.converged).toBe(true);
    expect(r.achieved).toBeLessThanOrEqual(1e-10);
    const kkt = checkTrendKkt(x, y, w, r.b, k, lam, 1e-5);
    // ||b - b*||_W <= sqrt(2 gap): at gap 1e-10 P the dual from the residual is within ~1e-4 of the box
    expect(kkt.boxExcess).toBeLessThan(1e-3);
    expect(kkt.stationarity).toBeLessThan(1e-8);
  });

  test.each([1, 2, 3])('order %i: the reported gap is a true duality gap, recomputed densely from b and the returned dual', (k) => {
    const { x, y, w, lmax } = problem(60, k, 7 + k);
    const lam = 0.05 * lmax;
    for (const iters of [20, 200, 5000]) {
      const r = trendAdmm(x, y, w, k, lam, 1e-12, iters);
      const d = denseGap(x, y, w, k, lam, r.b, r.u);
      // the dual is feasible and the gap is what the solver says, to rounding
      expect(d.boxExcess).toBeLessThanOrEqual(1e-12);
      expect(d.gap).toBeGreaterThan(-1e-9 * d.objective);
      expect(Math.abs(d.gap / d.objective - r.achieved)).toBeLessThan(1e-8 + 1e-6 * r.achieved);
    }
  });

  test('a warm start from a nearby penalty needs fewer iterations than a cold one', () => {
    const { x, y, w, lmax } = problem(150, 1, 3);
    const a = trendAdmm(x, y, w, 1, 0.02 * lmax, 1e-9, 20000);
    const cold = trendAdmm(x, y, w, 1, 0.018 * lmax, 1e-9, 20000);
    const warm = trendAdmm(x, y, w, 1, 0.018 * lmax, 1e-9, 20000, a.state);
    expect(cold.status.converged && warm.status.converged).toBe(true);
    expect(warm.status.iterations).toBeLessThan(cold.status.iterations);
  });

  test('the split operator T satisfies D(x, k+1) = D1 T', () => {
    const { x, y } = problem(30, 3, 1);
    for (const k of [1, 2, 3]) {
      const T = scaledDifferenceRows(x, k);
      const tb = new Float64Array(30 - k);
      for (let r = 0; r < tb.length; r++) for (let c = 0; c <= k; c++) tb[r] += T[r * (k + 1) + c] * y[r + c];
      const want = differenceOperator(x, k + 1, y);
      for (let r = 0; r < want.length; r++) expect(tb[r + 1] - tb[r]).toBeCloseTo(want[r], 10);
    }
  });
});
