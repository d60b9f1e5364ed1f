/**
 * Benchmark of trend filtering: one JSON record per measurement.
 *
 * - side by side with glmgen (R package of the authors of trend filtering, C ADMM; public
 *   repository glmgen/glmgen), when it is installed in the R library named by
 *   the environment variable KNOTWISE_GLMGEN_LIB (or found by R in its own libraries; skipped
 *   quietly when absent): x = 1..n,
 *   a chirp plus a kinked ramp with noise sd 0.2, orders 1 and 3, n = 1e3 .. 1e6, three
 *   penalties two decades apart (n/1000 x {1, 10, 100} for order 1, n/1e5 x {1, 10, 100} for
 *   order 3). Knotwise is timed in a fresh Node process per fit (first call, compilation
 *   included), glmgen by R's system.time around trendfilter() with its default control;
 *   medians of repeats, wall-clock and CPU seconds (the machine is shared: CPU time is the steadier
 *   measure), and the process's peak resident memory per point. Both objectives 1/2 sum (y - b)^2 + lambda sum |D b| are computed here
 *   from the fitted values by the same code, with their relative excess over the smaller, so
 *   a faster answer short of the optimum cannot pass for a win;
 * - the first-call floor ({@link firstCallFloor}): a plain interior point for order 1 with no engine
 *   code, timed like Knotwise's fits at n = 1e4 on the same series and penalties;
 * - single penalty (1e-3 lambda_max, penalty given, uneven x) for k = 1 and 3 at n = 1e3 .. 1e5:
 *   time of the first call and median of 3 repeats (n <= 1e5; 1e6 is in the side-by-side), iterations (interior-point iterations + ADMM iterations + refinement rounds),
 *   relative duality gap reached, knots, heap growth;
 * - full 5-fold cross-validation over 30 penalties with warm starts at n = 1e3, 1e4, orders 1 to 3,
 *   each run in a fresh process, medians of 3 (with the load average and how many of the curve's
 *   full-data fits converged);
 * - the fold fits' switch to the interior point (orders 2 and 3, {@link trendPath}): the same 5-fold
 *   cross-validation with and without it in one process, medians of 3 after a warm-up, on seeded series
 *   (a kinked line with a wave, a wave with level shifts, Doppler, a slow curve in AR(1) noise), with
 *   the largest change of a score in units of its standard error and the df at each curve's minimum;
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
import { minimalTrendInteriorPoint } from './firstCallFloor';
import { execFileSync, spawnSync } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { differenceOperator } from '../../src/engine/linalg/difference';
import { trendPath } from '../../src/engine/smoothers/trend/trendPath';
import { ar1Noise } from '../helpers/random';
import { kinksAndWave, shiftsAndWave } from '../helpers/autoBenchShapes';

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

function memory(): number {
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

/** The side-by-side data: x = 1..n, a chirp plus a kinked ramp with noise sd 0.2 (seeded). */
export function sideBySideSeries(n: number): { x: Float64Array; y: Float64Array } {
  const rnorm = seededNormal(1000 + n);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    x[i] = i + 1;
    y[i] = Math.sin(2 * Math.PI * 3 * t * t * t) + (t > 0.6 ? 2 * (t - 0.6) : 0) + 0.2 * rnorm();
  }
  return { x, y };
}

/** 1/2 sum (y - b)^2 + lambda sum |D(x, k+1) b|, from fitted values. */
export function trendObjective(x: Float64Array, y: Float64Array, b: ArrayLike<number>, k: number, lambda: number): number {
  let rss = 0;
  for (let i = 0; i < y.length; i++) rss += 0.5 * (y[i] - b[i]) ** 2;
  const d = differenceOperator(x, k + 1, b);
  let l1 = 0;
  for (let r = 0; r < d.length; r++) l1 += Math.abs(d[r]);
  return rss + lambda * l1;
}

/**
 * One fit in this (fresh) process, written to stdout as JSON: called by {@link knotwiseFresh}
 * through `node -e`, so that the time includes compiling the solver on the first call. Then, below
 * 1e6 points, the same fit `again` more times in the same process (compiled code, as in the pane's
 * warmed workers or a batch after its first column): `compiledSeconds` and `compiledCpuSeconds` are
 * their medians, and `compiledSame` says whether every repeat's fitted values equal the first fit's
 * bit for bit (the engine keeps no state between calls, so a repeat does no less work).
 */
export function childFit(n: number, k: number, lambda: number, again = 0): void {
  const { x, y } = sideBySideSeries(n);
  const s = seriesFromArrays(x, y);
  const fit = () => fitTrend(s, { order: k, penalty: lambda });
  const first = timed(fit);
  const r = first.value;
  // peak resident memory of the whole process (Node itself is about 40 MB), before the repeats
  const out: Record<string, unknown> = { seconds: first.seconds, cpuSeconds: first.cpuSeconds, maxRssBytes: process.resourceUsage().maxRSS * 1024, objective: trendObjective(x, y, r.fitted, k, lambda), achieved: r.solver.achieved, converged: r.solver.converged, iterations: r.solver.iterations, knots: r.knots.length };
  if (again > 0) {
    const repeats = Array.from({ length: again }, () => timed(fit));
    const same = repeats.every((a) => a.value.fitted.every((v, i) => Object.is(v, r.fitted[i])));
    Object.assign(out, { compiledSeconds: median(repeats.map((a) => a.seconds)), compiledCpuSeconds: median(repeats.map((a) => a.cpuSeconds)), compiledSame: same });
  }
  process.stdout.write(JSON.stringify(out) + '\n');
}

/** {@link childFit} in a fresh Node process; null when it fails or passes `timeoutSeconds`. */
function knotwiseFresh(n: number, k: number, lambda: number, timeoutSeconds: number, again = 0): { seconds: number; cpuSeconds: number; maxRssBytes: number; objective: number; achieved: number; converged: boolean; iterations: number; knots: number; compiledSeconds?: number; compiledCpuSeconds?: number; compiledSame?: boolean } | null {
  return inFreshProcess(`childFit(${n}, ${k}, ${lambda}, ${again})`, timeoutSeconds);
}

/**
 * The R library holding glmgen: KNOTWISE_GLMGEN_LIB when set, else '' when R finds glmgen in its own
 * libraries; null when it is not installed (or R is missing).
 */
export function glmgenLibrary(): string | null {
  const lib = process.env.KNOTWISE_GLMGEN_LIB;
  if (lib && !fs.existsSync(path.join(lib, 'glmgen', 'DESCRIPTION'))) return null;
  try {
    const probe = `${lib ? `.libPaths(c(${JSON.stringify(lib)}, .libPaths())); ` : ''}quit(status = if (requireNamespace("glmgen", quietly = TRUE)) 0 else 1)`;
    execFileSync('Rscript', ['-e', probe], { stdio: 'ignore' });
  } catch { return null; }
  return lib ?? '';
}

/**
 * glmgen's trendfilter() with its default control on x = 1..n (thinning off), `repeats` times in one
 * R process; returns the median elapsed seconds (system.time), the fitted values of the last
 * run and its iteration count, or null when R fails.
 */
function glmgenFit(lib: string, y: Float64Array, k: number, lambda: number, repeats: number, timeoutSeconds: number): { seconds: number; cpuSeconds: number; fitted: Float64Array; iterations: number; version: string } | null {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-glmgen-'));
  try {
    const yf = path.join(dir, 'y.txt'), bf = path.join(dir, 'b.txt');
    fs.writeFileSync(yf, Array.from(y, (v) => v.toPrecision(17)).join('\n'));
    const code = [
      lib ? `.libPaths(c(${JSON.stringify(lib)}, .libPaths()))` : '',
      'suppressMessages(library(glmgen))',
      `y <- scan(${JSON.stringify(yf)}, quiet = TRUE); x <- seq_along(y)`,
      `ts <- sapply(seq_len(${repeats}), function(i) { st <- system.time(f <<- suppressWarnings(trendfilter(x, y, k = ${k}, lambda = ${lambda}, thinning = FALSE))); c(st[["elapsed"]], st[["user.self"]] + st[["sys.self"]]) })`,
      `writeLines(format(as.numeric(f$beta), digits = 17), ${JSON.stringify(bf)})`,
      'cat(median(ts[1, ]), median(ts[2, ]), f$iter, as.character(packageVersion("glmgen")), "\\n")',
    ].join('\n');
    const out = execFileSync('Rscript', ['-e', code], { encoding: 'utf8', timeout: timeoutSeconds * 1000, stdio: ['ignore', 'pipe', 'ignore'], maxBuffer: 1 << 26 }).trim().split(/\s+/);
    const fitted = Float64Array.from(fs.readFileSync(bf, 'utf8').trim().split('\n'), Number);
    if (fitted.length !== y.length) return null;
    return { seconds: Number(out[0]), cpuSeconds: Number(out[1]), iterations: Number(out[2]), version: out[3], fitted };
  } catch {
    return null;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Median of a non-empty list. */
function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/** f() with its wall-clock and CPU seconds in this process (CPU of every thread: Node compiles and collects on others). */
function timed<T>(f: () => T): { value: T; seconds: number; cpuSeconds: number } {
  const c0 = process.cpuUsage();
  const t0 = now();
  const value = f();
  const seconds = (now() - t0) / 1000;
  const cu = process.cpuUsage(c0);
  return { value, seconds, cpuSeconds: (cu.user + cu.system) / 1e6 };
}

/**
 * `call` (an exported function of this file with its arguments, which writes one JSON line) in a
 * fresh Node process; its last line parsed, or null when the process fails, passes `timeoutSeconds`
 * or writes no JSON.
 */
function inFreshProcess<T>(call: string, timeoutSeconds: number): T | null {
  const code = `require(${JSON.stringify(__filename)}).${call}`;
  const r = spawnSync(process.execPath, ['--max-old-space-size=8192', '-e', code], { encoding: 'utf8', timeout: timeoutSeconds * 1000, maxBuffer: 1 << 20 });
  if (r.status !== 0) return null;
  try { return JSON.parse(r.stdout.trim().split('\n').pop()!) as T; } catch { return null; }
}

/**
 * {@link minimalTrendInteriorPoint} on the side-by-side series in this (fresh) process, first call
 * and then `again` more times, written to stdout as JSON: called by {@link firstCallFloor}.
 */
export function childFloor(n: number, lambda: number, again: number): void {
  const { x, y } = sideBySideSeries(n);
  const fit = () => minimalTrendInteriorPoint(y, lambda, 1e-8, 200);
  const first = timed(fit);
  const repeats = Array.from({ length: again }, () => timed(fit));
  const r = first.value;
  process.stdout.write(JSON.stringify({ seconds: first.seconds, cpuSeconds: first.cpuSeconds, compiledSeconds: median(repeats.map((a) => a.seconds)), compiledCpuSeconds: median(repeats.map((a) => a.cpuSeconds)), iterations: r.iterations, gap: r.gap, objective: trendObjective(x, y, r.b, 1, lambda) }) + '\n');
}

/**
 * The first-call floor beside the side-by-side rows of order 1 at n = 1e4 (the same series and
 * penalties): {@link minimalTrendInteriorPoint}, a plain interior point with no engine code, in 5
 * fresh processes per penalty (medians of its first call and of 5 more calls in each process), with
 * its relative duality gap and its objective's relative excess over the engine's fit of the same
 * problem (made in this process, untimed). Skipped when `quick`.
 */
export function firstCallFloor(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  if (quick) return;
  const n = 1e4;
  for (const lambda of [10, 100, 1000]) {
    type FloorRun = { seconds: number; cpuSeconds: number; compiledSeconds: number; compiledCpuSeconds: number; iterations: number; gap: number; objective: number };
    const runs: FloorRun[] = [];
    for (let rep = 0; rep < 5; rep++) {
      const r = inFreshProcess<FloorRun>(`childFloor(${n}, ${lambda}, ${COMPILED_REPEATS})`, 600);
      if (r) runs.push(r);
    }
    const rec: Record<string, unknown> = { bench: 'trend-first-call-floor', order: 1, n, penalty: lambda, repeats: 5, completed: runs.length };
    if (runs.length) {
      const { x, y } = sideBySideSeries(n);
      const ours = trendObjective(x, y, fitTrend(seriesFromArrays(x, y), { order: 1, penalty: lambda }).fitted, 1, lambda);
      const last = runs[runs.length - 1];
      Object.assign(rec, { seconds: median(runs.map((v) => v.seconds)), cpuSeconds: median(runs.map((v) => v.cpuSeconds)), compiledSeconds: median(runs.map((v) => v.compiledSeconds)), compiledCpuSeconds: median(runs.map((v) => v.compiledCpuSeconds)), iterations: last.iterations, gap: last.gap, excessOverEngine: (last.objective - ours) / ours });
    }
    emit(rec);
  }
}

/**
 * Repeats of each single fit in its fresh process after the first (below 1e6 points), for the
 * compiled code's time beside the first call's: glmgen's own time is a median of repeats in one R
 * process, its C code compiled ahead of time.
 */
const COMPILED_REPEATS = 5;

/** Knotwise beside glmgen: one record per (order, n, penalty); nothing when glmgen is not installed. `orders` and `only` (sizes) narrow a run by hand. */
export function sideBySide(emit: (record: Record<string, unknown>) => void, quick: boolean, orders = [1, 3], only?: number[]): void {
  const lib = glmgenLibrary();
  if (lib === null) return;
  const sizes = only ?? (quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6]);
  for (const k of orders) {
    for (const n of sizes) {
      const base = k === 1 ? n / 1000 : n / 1e5;
      for (const mult of n >= 1e6 ? [1] : [1, 10, 100]) {
        const lambda = base * mult;
        const repeats = quick || n >= 1e6 ? 1 : n >= 1e5 ? 3 : 5;
        const { x, y } = sideBySideSeries(n);
        const g = glmgenFit(lib, y, k, lambda, repeats, 1200);
        const ours: NonNullable<ReturnType<typeof knotwiseFresh>>[] = [];
        for (let r = 0; r < repeats; r++) {
          const o = knotwiseFresh(n, k, lambda, 1200, n >= 1e6 ? 0 : COMPILED_REPEATS);
          if (o) ours.push(o);
        }
        const rec: Record<string, unknown> = { bench: 'trend-vs-glmgen', order: k, n, penalty: lambda, repeats };
        if (ours.length) {
          const o = ours[ours.length - 1];
          Object.assign(rec, { seconds: median(ours.map((v) => v.seconds)), cpuSeconds: median(ours.map((v) => v.cpuSeconds)), secondsAll: ours.map((v) => v.seconds), maxRssBytesPerPoint: o.maxRssBytes / n, objective: o.objective, achieved: o.achieved, converged: o.converged, iterations: o.iterations, knots: o.knots });
          const compiled = ours.filter((v) => v.compiledCpuSeconds !== undefined);
          if (compiled.length) Object.assign(rec, { compiledSeconds: median(compiled.map((v) => v.compiledSeconds!)), compiledCpuSeconds: median(compiled.map((v) => v.compiledCpuSeconds!)), compiledSame: compiled.every((v) => v.compiledSame) });
        } else rec.error = 'Knotwise fit failed or timed out';
        if (g) {
          const gObj = trendObjective(x, y, g.fitted, k, lambda);
          Object.assign(rec, { glmgenVersion: g.version, glmgenSeconds: g.seconds, glmgenCpuSeconds: g.cpuSeconds, glmgenIterations: g.iterations, glmgenObjective: gObj });
          if (ours.length) {
            const best = Math.min(gObj, rec.objective as number);
            Object.assign(rec, { ratioOursOverGlmgen: (rec.seconds as number) / g.seconds, cpuRatioOursOverGlmgen: (rec.cpuSeconds as number) / g.cpuSeconds, excessOurs: ((rec.objective as number) - best) / best, excessGlmgen: (gObj - best) / best });
            if (rec.compiledCpuSeconds !== undefined) rec.compiledCpuRatioOursOverGlmgen = (rec.compiledCpuSeconds as number) / g.cpuSeconds;
          }
        } else rec.glmgenError = 'glmgen failed or timed out';
        emit(rec);
      }
    }
  }
}

/** The cross-validation the bench times: 5 folds x 30 penalties at order k. */
const CV_OPTIONS = (k: number) => ({ order: k, select: 'cv' as const, folds: 5, gridSize: 30 });

/**
 * One cross-validated fit (5 folds x 30 penalties) in this (fresh) process, written to stdout as
 * JSON: called by {@link cvBench} through `node -e`, so that each repeat pays compilation alike.
 */
export function childCv(n: number, k: number): void {
  const s = benchSeries(n, 77 + n);
  const first = timed(() => fitTrend(s, CV_OPTIONS(k)));
  const r = first.value;
  const curve = r.criterion.curve!;
  // the same fit again in the same process: compiled code, as in a pane or worksheet session after its first fit
  const again = timed(() => fitTrend(s, CV_OPTIONS(k)));
  process.stdout.write(JSON.stringify({ seconds: first.seconds, cpuSeconds: first.cpuSeconds, warmSeconds: again.seconds, warmSamePenalty: again.value.penalty === r.penalty, curvePointsConverged: curve.filter((p) => p.converged).length, curvePoints: curve.length, chosenPenalty: r.penalty, df: r.df, atEdge: r.criterion.atEdge, converged: r.solver.converged }) + '\n');
}

/**
 * Full 5-fold cross-validation over 30 penalties at n = 1e3, 1e4 (uneven x), orders 1 to 3: each
 * a fresh Node process, repeated (3 times; once when `quick`), with medians of wall-clock and CPU
 * seconds (the first call, compilation included), of the same fit run again in that process (`warmSeconds`), the load average of the machine before and after, and how many of the curve's
 * full-data fits converged.
 */
/** Seeded series of {@link foldSwitchBench}: x = 1..n. */
function switchSeries(n: number, shape: string, seed: number): Series {
  const z = seededNormal(seed);
  const e = ar1Noise(n, 0.6, seed + 1);
  const y = Array.from({ length: n }, (_, i) => {
    const u = (i + 1) / n;
    return shape === 'kinks-and-wave' ? kinksAndWave(u) + 0.3 * z()
      : shape === 'doppler' ? doppler(u) + 0.1 * z()
        : shape === 'ar1' ? Math.sin(3 * u) + 0.3 * e[i]
          : shiftsAndWave(u) + 0.4 * z();
  });
  return seriesFromArrays(Array.from({ length: n }, (_, i) => i + 1), y);
}

/** Cross-validation with and without the fold fits' switch to the interior point (see the file's comment). */
export function foldSwitchBench(quick: boolean): Record<string, unknown>[] {
  const cases: [number, number, number, string][] = quick ? [[500, 3, 15, 'doppler']]
    : [[1000, 3, 30, 'doppler'], [2000, 3, 30, 'ar1'], [2000, 2, 30, 'ar1'], [5000, 3, 15, 'kinks-and-wave'], [5000, 2, 15, 'shifts-and-wave'], [10000, 3, 30, 'kinks-and-wave'], [10000, 2, 30, 'shifts-and-wave']];
  const out: Record<string, unknown>[] = [];
  for (const [n, k, G, shape] of cases) {
    const series = switchSeries(n, shape, 17 + k);
    const settings = { order: k, gridSize: G, folds: 5, relaxed: 0, tolerance: 1e-8, maxIterations: 200 };
    const load0 = os.loadavg()[0];
    const time = (on: boolean) => {
      trendPath(series, { ...settings, foldInteriorPoint: on }); // warm-up: compiled code for both
      const t: number[] = [];
      let last!: ReturnType<typeof trendPath>;
      for (let r = 0; r < (quick ? 1 : 3); r++) { const t0 = now(); last = trendPath(series, { ...settings, foldInteriorPoint: on }); t.push((now() - t0) / 1000); }
      return { seconds: median(t), path: last };
    };
    const on = time(true), off = time(false);
    let worst = 0;
    on.path.points.forEach((p, j) => { const q = off.path.points[j]; if (q.cvSe > 0) worst = Math.max(worst, Math.abs(p.cv - q.cv) / q.cvSe); });
    const dfAtMin = (pts: typeof on.path.points) => pts.reduce((b, p) => (p.cv < b.cv ? p : b)).df;
    out.push({
      bench: 'trend-cv-fold-switch', order: k, n, shape, gridSize: G, folds: 5, seconds: on.seconds, secondsWithout: off.seconds, ratio: Number((on.seconds / off.seconds).toFixed(3)),
      switchFrom: on.path.foldInteriorFrom ?? null, largestScoreChangeInSe: Number(worst.toPrecision(3)), dfAtMinimum: dfAtMin(on.path.points), dfAtMinimumWithout: dfAtMin(off.path.points),
      loadAverageBefore: load0, loadAverageAfter: os.loadavg()[0],
    });
  }
  return out;
}

export function cvBench(quick: boolean, sizes = quick ? [1e3] : [1e3, 1e4], orders = quick ? [1] : [1, 2, 3], repeats = quick ? 1 : 3): Record<string, unknown>[] {
  const out: Record<string, unknown>[] = [];
  for (const n of sizes) {
    for (const k of orders) {
      const load0 = os.loadavg()[0];
      type CvRun = { seconds: number; cpuSeconds: number; warmSeconds: number; warmSamePenalty: boolean; curvePointsConverged: number; curvePoints: number; chosenPenalty: number; df: number; atEdge: boolean; converged: boolean };
      const runs: CvRun[] = [];
      for (let r = 0; r < repeats; r++) {
        // a failed run is reported by its absence
        const p = inFreshProcess<CvRun>(`childCv(${n}, ${k})`, 1200);
        if (p) runs.push(p);
      }
      const rec: Record<string, unknown> = { bench: 'trend-cv', order: k, n, folds: 5, gridSize: 30, repeats, completed: runs.length, loadAverageBefore: load0, loadAverageAfter: os.loadavg()[0] };
      if (runs.length) {
        const last = runs[runs.length - 1];
        Object.assign(rec, { seconds: median(runs.map((v) => v.seconds)), cpuSeconds: median(runs.map((v) => v.cpuSeconds)), warmSeconds: median(runs.map((v) => v.warmSeconds)), warmSamePenalty: runs.every((v) => v.warmSamePenalty), cpuSecondsAll: runs.map((v) => v.cpuSeconds), secondsAll: runs.map((v) => v.seconds), curvePointsConverged: Math.min(...runs.map((v) => v.curvePointsConverged)), curvePoints: last.curvePoints, chosenPenalty: last.chosenPenalty, df: last.df, atEdge: last.atEdge, converged: last.converged });
      }
      out.push(rec);
    }
  }
  return out;
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  sideBySide(emit, quick);
  firstCallFloor(emit, quick);
  for (const [n, k] of (quick ? [[100, 1]] : [[100, 1], [200, 1], [150, 2], [400, 2]]) as [number, number][]) {
    const rec = scipyReference(n, k);
    if (rec) emit(rec);
  }
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5];
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
  for (const rec of cvBench(quick)) emit(rec);
  for (const rec of foldSwitchBench(quick)) emit(rec);
  const dfs = quick ? [10, 30] : [15, 25, 40, 60, 80, 100, 130, 160];
  for (const row of adaptivityTable('doppler', quick ? 512 : 1024, dfs, 31, [1, 3])) emit(row);
  for (const row of adaptivityTable('blocks', quick ? 512 : 1024, dfs, 32, [0, 1])) emit(row);
}
