/**
 * Benchmark of trend filtering: one JSON record per measurement.
 *
 * - single penalty (1e-3 lambda_max, penalty given) for k = 1 and 3 at n = 1e3 .. 1e6:
 *   time of the first call and median of 3 repeats (n <= 1e5), iterations (interior-point iterations + ADMM iterations + refinement rounds),
 *   relative duality gap reached, knots, heap growth;
 * - full 5-fold cross-validation over 30 penalties with warm starts at n = 1e3, 1e4, orders 1 to 3
 *   (with how many of the curve's full-data fits converged);
 * - SciPy bvls on the dual against fitTrend on the same data (small n);
 * - MSE against the truth versus df for trend filtering (Doppler: k = 1, 3; Blocks: k = 0, 1) and the cubic
 *   smoothing spline ('spline') on the Doppler and Blocks functions of
 *   D. L. Donoho and I. M. Johnstone, "Ideal spatial adaptation by wavelet
 *   shrinkage", Biometrika 81 (1994) 425-455.
 * Data: seeded (Park-Miller generator below), smoothness changing along x.
 * `quick` keeps n <= 1e4 (CI smoke).
 */
import { fitTrend, trendPenaltyMax } from '../../src/engine/smoothers/trend';
import { fitSpline } from '../../src/engine/smoothers/spline';
import { seriesFromArrays, Series } from '../../src/engine/series';
import { doppler, blocks, seededNormal, noisyTestFunction } from '../engine/smoothers/trendTestFunctions';
import { execFileSync } from 'child_process';

declare const process: { memoryUsage(): { heapUsed: number; arrayBuffers: number } } | undefined;

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

function memory(): number {
  if (typeof process === 'undefined' || !process.memoryUsage) return NaN;
  const m = process.memoryUsage();
  return m.heapUsed + m.arrayBuffers;
}

/** Series with smoothness changing along x: a chirp plus a kinked ramp, uneven spacing, noise sd 0.2. */
export function benchSeries(n: number, seed: number): Series {
  const rnorm = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n);
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.5 + Math.abs(rnorm()) * 0.6; x[i] = c; }
  for (let i = 0; i < n; i++) {
    const t = (x[i] - x[0]) / (x[n - 1] - x[0]);
    y[i] = Math.sin(2 * Math.PI * 3 * t * t * t) + (t > 0.6 ? 2 * (t - 0.6) : 0) + 0.2 * rnorm();
  }
  return seriesFromArrays(x, y);
}

/** MSE against the truth versus df, trend filtering and the spline, on one test function. */
export function adaptivityTable(name: 'doppler' | 'blocks', n: number, dfs: number[], seed: number, orders: number[]): Record<string, unknown>[] {
  const f = name === 'doppler' ? doppler : blocks;
  const { x, y, truth, sigma } = noisyTestFunction(f, n, seed);
  const s = seriesFromArrays(x, y);
  const mse = (fit: Float64Array) => { let e = 0; for (let i = 0; i < n; i++) e += (fit[i] - truth[i]) ** 2; return e / n; };
  const spline = { fit: fitSpline };
  const rows: Record<string, unknown>[] = [];
  for (const df of dfs) {
    const row: Record<string, unknown> = { bench: 'trend-adaptivity', function: name, n, sigma, targetDf: df };
    for (const k of orders) {
      const r = fitTrend(s, { order: k, df });
      row[`trendK${k}Df`] = r.df;
      row[`trendK${k}Mse`] = mse(r.fitted);
    }
    const sp = spline.fit(s, { df });
    row.splineDf = sp.df;
    row.splineMse = mse(sp.fitted);
    rows.push(row);
  }
  return rows;
}

/**
 * Reference timing on the same machine: SciPy's bounded-variable least squares
 * (scipy.optimize.lsq_linear, method 'bvls') on the trend-filtering dual, the
 * solver of test/reference/gen_trend.py, against fitTrend on the same data.
 * No dedicated trend-filtering library is installed here, so this is the
 * reference we have; it is dense, so only small n.
 */
export function scipyReference(n: number, k: number): Record<string, unknown> | null {
  const s = benchSeries(n, 4242 + n);
  const lam = 1e-2 * trendPenaltyMax(s, { order: k });
  const code = [
    'import sys, json, math, time', 'import numpy as np', 'from scipy.optimize import lsq_linear',
    'd = json.load(sys.stdin); x = np.array(d["x"]); y = np.array(d["y"]); k = d["k"]; lam = d["lam"]; q = k + 1; n = len(x)',
    'D = np.zeros((n - q, n))',
    'for r in range(n - q):',
    '    z = x[r:r + q + 1]',
    '    for j in range(q + 1):',
    '        den = np.prod([z[j] - z[l] for l in range(q + 1) if l != j])',
    '        D[r, r + j] = math.factorial(k) * (z[-1] - z[0]) / den',
    't = time.perf_counter(); res = lsq_linear(D.T, y, bounds=(-lam, lam), method="bvls", tol=1e-12); t = time.perf_counter() - t',
    'b = y - D.T @ res.x',
    'obj = 0.5 * np.sum((y - b) ** 2) + lam * np.sum(np.abs(D @ b))',
    'print(json.dumps({"seconds": t, "fitted": b.tolist(), "status": int(res.status), "objective": float(obj)}))',
  ].join('\n');
  let out: { seconds: number; fitted: number[]; status: number; objective: number };
  try {
    out = JSON.parse(execFileSync('/usr/bin/python3', ['-c', code], { input: JSON.stringify({ x: Array.from(s.x), y: Array.from(s.y), k, lam }), encoding: 'utf8', maxBuffer: 1 << 26 }));
  } catch {
    return null;
  }
  const t0 = now();
  const r = fitTrend(s, { order: k, penalty: lam });
  const t1 = now();
  let diff = 0;
  for (let i = 0; i < n; i++) diff = Math.max(diff, Math.abs(r.fitted[i] - out.fitted[i]));
  let obj = 0;
  for (let i = 0; i < n; i++) obj += 0.5 * (s.y[i] - r.fitted[i]) ** 2;
  for (const kn of r.knots) obj += lam * Math.abs(kn.change);
  // scipy status 0 means bvls hit its iteration limit (it does on ill-conditioned duals, e.g. n = 400, k = 2)
  return {
    bench: 'trend-vs-scipy-bvls', order: k, n, seconds: (t1 - t0) / 1000, scipySeconds: out.seconds, ratioScipyOverOurs: out.seconds / ((t1 - t0) / 1000),
    maxAbsDifference: diff, converged: r.solver.converged, scipyStatus: out.status, scipyObjective: out.objective, objective: obj,
  };
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  for (const [n, k] of (quick ? [[100, 1]] : [[100, 1], [200, 1], [150, 2], [400, 2]]) as [number, number][]) {
    const rec = scipyReference(n, k);
    if (rec) emit(rec);
  }
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  for (const k of [1, 3]) {
    for (const n of sizes) {
      const s = benchSeries(n, 1000 + n);
      const lam = 1e-3 * trendPenaltyMax(s, { order: k });
      const m0 = memory();
      const t0 = now();
      let r: ReturnType<typeof fitTrend>;
      try {
        r = fitTrend(s, { order: k, penalty: lam });
      } catch (e) {
        // a fit the engine refuses (no reliable optimum reached) is a result of the benchmark too
        emit({ bench: 'trend-single-penalty', order: k, n, penalty: lam, penaltyOverLambdaMax: 1e-3, seconds: (now() - t0) / 1000, error: (e as Error).message });
        continue;
      }
      const t1 = now();
      const m1 = memory();
      // the first call includes compiling the solver; repeats (up to n = 1e5) give the steady time
      const repeats: number[] = [];
      for (let rep = 0; rep < (n <= 1e5 ? 3 : 0); rep++) {
        const ta = now();
        fitTrend(s, { order: k, penalty: lam });
        repeats.push((now() - ta) / 1000);
      }
      repeats.sort((a, b) => a - b);
      emit({
        bench: 'trend-single-penalty', order: k, n, penalty: lam, penaltyOverLambdaMax: 1e-3,
        seconds: (t1 - t0) / 1000, medianRepeatSeconds: repeats.length ? repeats[1] : null, iterations: r.solver.iterations, converged: r.solver.converged,
        tolerance: r.solver.tolerance, achieved: r.solver.achieved, knots: r.knots.length,
        heapGrowthBytes: m1 - m0, bytesPerPoint: (m1 - m0) / n,
      });
    }
  }
  for (const n of quick ? [1e3] : [1e3, 1e4]) {
    for (const k of quick ? [1] : [1, 2, 3]) {
      const s = benchSeries(n, 77 + n);
      const t0 = now();
      const r = fitTrend(s, { order: k, select: 'cv', folds: 5, gridSize: 30 });
      const t1 = now();
      // the repeat (steady time, after compiling) only where it is cheap
      let repeatSeconds: number | null = null;
      if (k === 1) {
        const ta = now();
        fitTrend(s, { order: k, select: 'cv', folds: 5, gridSize: 30 });
        repeatSeconds = (now() - ta) / 1000;
      }
      const converged = r.criterion.curve!.filter((p) => p.converged).length;
      emit({ bench: 'trend-cv', order: k, n, folds: 5, gridSize: 30, seconds: (t1 - t0) / 1000, repeatSeconds, curvePointsConverged: converged, chosenPenalty: r.penalty, df: r.df, atEdge: r.criterion.atEdge, converged: r.solver.converged });
    }
  }
  const dfs = quick ? [10, 30] : [15, 25, 40, 60, 80, 100, 130, 160];
  for (const row of adaptivityTable('doppler', quick ? 512 : 1024, dfs, 31, [1, 3])) emit(row);
  for (const row of adaptivityTable('blocks', quick ? 512 : 1024, dfs, 32, [0, 1])) emit(row);
}
