/**
 * Benchmark of changepoint segmentation: PELT (mean model) and CPOP (slope model)
 * on seeded series with a change every ~1000 points, plus the fitted growth
 * exponent of time against n (least squares on log time vs log n).
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

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  const meanSizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  const slopeSizes = quick ? [1e3, 3e3] : [1e3, 1e4, 1e5];
  const meanTimes: number[] = [];
  for (const n of meanSizes) {
    const { series, truth } = meanSeries(n, 7);
    let r = findBreaks(series, { model: 'mean', penalty: 'bic' });
    const reps = n <= 1e4 ? 5 : n <= 1e5 ? 3 : 1;
    const seconds = time(() => { r = findBreaks(series, { model: 'mean', penalty: 'bic' }); }, reps);
    meanTimes.push(seconds);
    emit({
      bench: 'breaks', model: 'mean', algorithm: 'pelt', n, seconds, reps,
      trueChanges: truth.length, foundChanges: r.breaks.length, hitRateWithin5: hitRate(r.breaks.map((b) => b.index), truth, 5),
      meanCandidates: r.solver.meanCandidates, maxCandidates: r.solver.maxCandidates, evaluations: r.solver.evaluations,
      target: n === 1e5 ? 'under 0.5 s' : undefined,
    });
  }
  emit({ bench: 'breaks', model: 'mean', algorithm: 'pelt', measure: 'time-exponent', sizes: meanSizes, exponent: exponent(meanSizes, meanTimes), target: 'close to 1 (linear)' });

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
