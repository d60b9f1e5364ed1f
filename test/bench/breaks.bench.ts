/**
 * Benchmark of changepoint segmentation: FPOP (mean model) and CPOP (slope model)
 * on seeded series with a change every ~1000 points, plus the fitted growth
 * exponent of time against n (least squares on log time vs log n); every model on a
 * full column (1,048,576 rows, 5 changes) with peak memory; FPOP against PELT where
 * PELT is slowest (no change).
 *
 * No changepoint library is among the installed reference packages (R's base
 * install has none, and Debian's python3-scipy/statsmodels have no PELT), so the
 * comparison in the same run is against exhaustive optimal partitioning
 * (Jackson et al. 2005) from this engine, the O(n^2) method PELT prunes.
 */
import { findBreaks } from '../../src/engine/breaks/findBreaks';
import { pelt } from '../../src/engine/breaks/pelt';
import { optimalPartitioning } from '../../src/engine/breaks/optimalPartitioning';
import { meanCost } from '../../src/engine/breaks/costMean';
import { prepareSeries, type Series } from '../../src/engine/series';
import { fpop } from '../../src/engine/breaks/fpop';
import type { BreaksModel } from '../../src/engine/breaks/types';
import { spawnSync } from 'child_process';
import * as path from 'path';
import { mulberry32, normalStream } from '../helpers/random';

const SPACING = 1000;

/** Piecewise-constant levels, a change every ~SPACING points (jittered), unit noise. */
function meanSeries(n: number, seed: number): { series: Series; truth: number[] } {
  const u = mulberry32(seed);
  const z = normalStream(seed + 1);
  const y = new Array<number>(n);
  const truth: number[] = [];
  let next = Math.round(SPACING * (0.4 + 0.2 * u()));
  let level = 0;
  for (let i = 0; i < n; i++) {
    if (i === next) { truth.push(i); level += (u() < 0.5 ? -1 : 1) * (1 + u()); next += Math.round(SPACING * (0.75 + 0.5 * u())); }
    y[i] = level + z();
  }
  return { series: prepareSeries(y, null, null, { ties: 'keep' }), truth };
}

/** Continuous trend with a slope change every ~SPACING points, unit noise. */
function slopeSeries(n: number, seed: number): { series: Series; truth: number[] } {
  const u = mulberry32(seed);
  const z = normalStream(seed + 1);
  const y = new Array<number>(n);
  const truth: number[] = [];
  let next = Math.round(SPACING * (0.4 + 0.2 * u()));
  let level = 0;
  let slope = 0.01;
  for (let i = 0; i < n; i++) {
    if (i === next) { truth.push(i); slope = -Math.sign(slope) * (0.005 + 0.01 * u()); next += Math.round(SPACING * (0.75 + 0.5 * u())); }
    level += slope;
    y[i] = level + z();
  }
  return { series: prepareSeries(y, null, null, { ties: 'keep' }), truth };
}

/** Share of true changes with a found change within `tol` points. */
function hitRate(found: number[], truth: number[], tol: number): number {
  if (!truth.length) return 1;
  let hits = 0;
  let j = 0;
  for (const t of truth) {
    while (j < found.length && found[j] < t - tol) j++;
    if (j < found.length && Math.abs(found[j] - t) <= tol) hits++;
  }
  return hits / truth.length;
}

/** Median wall time in seconds over `reps` runs. */
function time(fn: () => void, reps: number): number {
  const t: number[] = [];
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    fn();
    t.push((performance.now() - t0) / 1000);
  }
  t.sort((a, b) => a - b);
  return t[(t.length - 1) >> 1];
}

/** Slope of log(time) on log(n) by least squares. */
function exponent(ns: number[], ts: number[]): number {
  const lx = ns.map(Math.log), ly = ts.map(Math.log);
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length, my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < lx.length; i++) { sxy += (lx[i] - mx) * (ly[i] - my); sxx += (lx[i] - mx) ** 2; }
  return sxy / sxx;
}

/** A full column (1,048,576 rows) with 5 changes and a slow swing, for every model. */
function fullColumn(model: BreaksModel, n: number): Series {
  const z = normalStream(2024);
  const u = mulberry32(2025);
  const y = new Array<number>(n);
  const at = [0.15, 0.3, 0.5, 0.7, 0.85].map((f) => Math.round(f * n));
  let k = 0, level = 0, sd = 1;
  for (let i = 0; i < n; i++) {
    if (k < at.length && i === at[k]) { level += u() < 0.5 ? -2 : 2; sd = model === 'meanvar' ? 0.5 + u() : 1; k++; }
    const v = level + 0.5 * Math.sin(i / 40000) + sd * z();
    y[i] = model === 'poisson' ? Math.max(0, Math.round(10 + 2 * v)) : model === 'slope' ? v + 1e-5 * i : v;
  }
  return prepareSeries(y, null, null, { ties: 'keep' });
}

/** Peak resident memory of this process so far, MB (process.resourceUsage().maxRSS is in kB). */
const peakMb = (): number => process.resourceUsage().maxRSS / 1024;

/**
 * Every model on a full column: finished (time, breaks) or refused (time to the
 * refusal, message), with the process's peak resident memory before and after and the
 * heap in use after. Then a probe: the 'mean' search on a full column in a child
 * process whose heap is capped at 256 MB.
 */
function fullColumns(emit: (record: Record<string, unknown>) => void): void {
  const n = 1048576;
  for (const [model, extra] of [['mean', {}], ['mean', { robust: false }], ['mean', { minSegment: 5 }], ['meanvar', {}], ['poisson', {}], ['distribution', {}], ['slope', {}]] as [BreaksModel, Record<string, unknown>][]) {
    const series = fullColumn(model, n);
    const before = peakMb();
    const t0 = performance.now();
    let record: Record<string, unknown>;
    try {
      const r = findBreaks(series, { model, ...extra });
      record = { outcome: 'finished', breaks: r.breaks.length, spikes: r.spikes.length, algorithm: r.solver.algorithm, maxCandidates: r.solver.maxCandidates, meanCandidates: r.solver.meanCandidates };
    } catch (e) {
      record = { outcome: 'refused', message: (e as Error).message };
    }
    const seconds = (performance.now() - t0) / 1000;
    emit({ bench: 'breaks', measure: 'full-column', model, options: extra, n, seconds, ...record, peakRssMbBefore: Math.round(before), peakRssMbAfter: Math.round(peakMb()), heapUsedMbAfter: Math.round(process.memoryUsage().heapUsed / 2 ** 20), target: 'finish within 30 s with memory linear in n, or refuse at once' });
  }
  // heap-capped probe in a child process (this file, compiled, exports fullColumnProbe)
  const code = `const b = require(${JSON.stringify(path.join(__dirname, 'breaks.bench.js'))}); const t0 = Date.now(); const r = b.fullColumnProbe(); console.log(JSON.stringify({ seconds: (Date.now() - t0) / 1000, breaks: r, peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024) }));`;
  for (const heap of [256, 128]) {
    const out = spawnSync(process.execPath, [`--max-old-space-size=${heap}`, '-e', code], { encoding: 'utf8' });
    const line = out.stdout.trim().split('\n').pop() ?? '';
    emit({ bench: 'breaks', measure: 'full-column-heap-probe', model: 'mean', n, maxOldSpaceMb: heap, ok: out.status === 0, ...(out.status === 0 ? JSON.parse(line) : { error: out.stderr.split('\n').slice(0, 2).join(' ') }) });
  }
}

/** The 'mean' model at defaults on a full column: number of breaks (for the heap probe). */
export function fullColumnProbe(): number {
  return findBreaks(fullColumn('mean', 1048576), { model: 'mean' }).breaks.length;
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  if (!quick) fullColumns(emit);
  // FPOP against PELT on series with no change (PELT's slowest case): same result, time ratio
  for (const n of quick ? [5e3] : [1e4, 3e4, 1e5]) {
    const z = normalStream(n);
    const y = Float64Array.from({ length: n }, () => z());
    const w = new Float64Array(n).fill(1);
    const cost = meanCost(y, w, 1, 0);
    const beta = 2 * Math.log(n);
    let a = fpop(y, w, { kind: 'square' }, beta, 1), b = pelt(cost, beta, 1);
    const tf = time(() => { a = fpop(y, w, { kind: 'square' }, beta, 1); }, 3);
    const tp = time(() => { b = pelt(cost, beta, 1); }, n > 3e4 ? 1 : 3);
    const tr = time(() => fpop(y, w, { kind: 'biweight', K: 3 }, beta, 1), 3);
    emit({ bench: 'breaks', model: 'mean', measure: 'fpop-vs-pelt-no-change', n, fpopSeconds: tf, fpopBiweightSeconds: tr, peltSeconds: tp, speedup: tp / tf, sameChanges: JSON.stringify(a.changes) === JSON.stringify(b.changes), fpopMeanPieces: a.meanCandidates, peltMeanCandidates: b.meanCandidates });
  }
  const meanSizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  const slopeSizes = quick ? [1e3, 3e3] : [1e3, 3e3, 1e4];
  const meanTimes: number[] = [];
  for (const n of meanSizes) {
    const { series, truth } = meanSeries(n, 7);
    let r = findBreaks(series, { model: 'mean', penalty: 'bic' });
    const reps = n <= 1e4 ? 5 : n <= 1e5 ? 3 : 1;
    const seconds = time(() => { r = findBreaks(series, { model: 'mean', penalty: 'bic' }); }, reps);
    meanTimes.push(seconds);
    emit({
      bench: 'breaks', model: 'mean', algorithm: r.solver.algorithm, n, seconds, reps,
      trueChanges: truth.length, foundChanges: r.breaks.length, hitRateWithin5: hitRate(r.breaks.map((b) => b.index), truth, 5),
      meanCandidates: r.solver.meanCandidates, maxCandidates: r.solver.maxCandidates, evaluations: r.solver.evaluations,
      target: n === 1e5 ? 'under 0.5 s' : undefined,
    });
  }
  emit({ bench: 'breaks', model: 'mean', algorithm: 'fpop', measure: 'time-exponent', sizes: meanSizes, exponent: exponent(meanSizes, meanTimes), target: 'close to 1 (linear)' });

  // PELT against exhaustive optimal partitioning on the same cost, same run
  for (const n of quick ? [3e3] : [5e3, 2e4]) {
    const { series } = meanSeries(n, 11);
    const cost = meanCost(series.y, series.w, 1, 0);
    const beta = 2 * Math.log(n);
    const tp = time(() => pelt(cost, beta, 1), 3);
    const to = time(() => optimalPartitioning(cost, beta, 1), 1);
    emit({ bench: 'breaks', model: 'mean', measure: 'pelt-vs-op', n, peltSeconds: tp, opSeconds: to, speedup: to / tp, reference: 'optimal partitioning (Jackson et al. 2005), this engine; no changepoint library installed' });
  }

  // hit rate of the mean model on seeded series with known breaks, by noise level
  for (const sd of [0.5, 1, 2, 3]) {
    let hits = 0, total = 0, found = 0;
    for (let seed = 1; seed <= (quick ? 5 : 20); seed++) {
      const u = mulberry32(seed * 97);
      const z = normalStream(seed * 97 + 1);
      const truth = [150, 320, 500, 650];
      const y: number[] = [];
      let level = 0, k = 0;
      for (let i = 0; i < 800; i++) {
        if (k < truth.length && i === truth[k]) { level += (u() < 0.5 ? -1 : 1) * 2; k++; }
        y.push(level + sd * z());
      }
      const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'mean', penalty: 'mbic' });
      const idx = r.breaks.map((b) => b.index);
      found += idx.length;
      total += truth.length;
      hits += hitRate(idx, truth, 5) * truth.length;
    }
    emit({ bench: 'breaks', model: 'mean', measure: 'hit-rate', shift: 2, noiseSd: sd, tolerance: 5, hitRate: hits / total, meanFoundPerSeries: found / (quick ? 5 : 20), truePerSeries: 4 });
  }

  const slopeTimes: number[] = [];
  for (const n of slopeSizes) {
    const { series, truth } = slopeSeries(n, 5);
    let r = findBreaks(series, { model: 'slope', penalty: 'bic', sigma: 1 });
    const reps = n <= 1e4 ? 3 : 1;
    const seconds = time(() => { r = findBreaks(series, { model: 'slope', penalty: 'bic', sigma: 1 }); }, reps);
    slopeTimes.push(seconds);
    emit({
      bench: 'breaks', model: 'slope', algorithm: 'cpop', n, seconds, reps,
      trueChanges: truth.length, foundChanges: r.breaks.length, hitRateWithin25: hitRate(r.breaks.map((b) => b.index), truth, 25),
      meanCandidates: r.solver.meanCandidates, maxCandidates: r.solver.maxCandidates, evaluations: r.solver.evaluations,
      provenOptimal: r.solver.converged, runs: r.solver.runs,
    });
  }
  emit({ bench: 'breaks', model: 'slope', algorithm: 'cpop', measure: 'time-exponent', sizes: slopeSizes, exponent: exponent(slopeSizes, slopeTimes), target: 'close to 1 (linear)' });
}
