/**
 * Benchmark of the seasonal decomposition on five years of invented daily data
 * (1,826 points: a weekday pattern, a yearly swing, a slope change, a level step,
 * two spikes and noise; seeded). Times, as medians of repeats (the machine is
 * shared, so single timings are noisy): STL with one period (7), the engine's
 * STL/MSTL decomposition (weekday + yearly), and the adaptive decomposition at a
 * given penalty and with its default penalty choice; then the adaptive decomposition at default
 * settings on monthly (96 points), weekly (261), ten years of daily (3,653) and 10,000 daily points
 * (not in --quick), with the time at the penalty it chose beside it; and (not in --quick, not a timing) the
 * spike rule and the error against the planted truth over 50 seeded series each of Gaussian and AR(1) noise
 * ({@link spikeRule}). In the same run, when
 * installed, R's stats::stl and statsmodels' STL are timed on the same data with
 * the same settings (time inside each, excluding start-up and file reading).
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { execFileSync } from 'child_process';
import { stl } from '../../src/engine/decompose/stl';
import { decompose } from '../../src/engine/decompose/decompose';
import { seriesFromArrays } from '../../src/engine/series';
import { normalStream } from '../helpers/random';

/** Five years of invented daily sales from 2019-01-01 (Excel serial 43466). */
export function dailySales(seed: number, days = 1826): { x: Float64Array; y: Float64Array } {
  const z = normalStream(seed);
  const weekday = [-9, 2, 3, 3, 4, 6, -9];
  const x = new Float64Array(days), y = new Float64Array(days);
  for (let i = 0; i < days; i++) {
    x[i] = 43466 + i;
    const dow = (x[i] + 6) % 7; // 0 = Sunday for Excel serials
    y[i] = 200 + 0.02 * i + (i > 900 ? 0.05 * (i - 900) : 0) + (i > 1300 ? 12 : 0) + weekday[dow] + 10 * Math.sin((2 * Math.PI * x[i]) / 365.2425) + 3 * z();
  }
  y[400] += 40;
  y[1000] -= 35;
  return { x, y };
}

/**
 * Invented daily series from 2019-01-01 (Excel serial 43466) for the spike rule: a weekday pattern, a yearly
 * swing, a slope change at the middle, a level step of 12 at 70% of the span, noise of sd 3 (AR(1) with
 * coefficient phi, 0 for independent Gaussian noise), and spikes added at `at` of `size` noise sd with
 * alternating signs. Returns the series and the planted truth (trend and season, without noise or spikes).
 */
export function dailyWithNoise(seed: number, phi: number, days: number, at: number[] = [], size: number[] = []): { x: Float64Array; y: Float64Array; truth: Float64Array } {
  const sd = 3;
  const z = normalStream(seed);
  const weekday = [-9, 2, 3, 3, 4, 6, -9];
  const x = new Float64Array(days), y = new Float64Array(days), truth = new Float64Array(days);
  let e = sd * z();
  for (let i = 0; i < days; i++) {
    x[i] = 43466 + i;
    if (i > 0) e = phi * e + Math.sqrt(1 - phi * phi) * sd * z();
    const dow = (x[i] + 6) % 7;
    truth[i] = 200 + 0.02 * i + (i > days / 2 ? 0.05 * (i - days / 2) : 0) + (i > 0.7 * days ? 12 : 0) + weekday[dow] + 10 * Math.sin((2 * Math.PI * x[i]) / 365.2425);
    y[i] = truth[i] + e;
  }
  at.forEach((i, j) => { y[i] += (j % 2 ? -1 : 1) * size[j] * sd; });
  return { x, y, truth };
}

/**
 * The spike rule and the error against the planted truth at default settings, over `seeds` seeded five-year
 * daily series ({@link dailyWithNoise}) each of Gaussian and AR(1) (phi 0.5) noise: spikes reported per series
 * without planted spikes; with 4 planted spikes of 5 noise sd and 2 of 8 sd, how many are found, other spikes
 * per series, and the root mean square error of trend + season against the truth.
 */
export function spikeRule(seeds: number, days = 1826): Record<string, unknown>[] {
  const at = [200, 500, 800, 1100, 1400, 1700].map((i) => Math.round((i * days) / 1826)), size = [5, 5, 5, 5, 8, 8];
  const out: Record<string, unknown>[] = [];
  for (const phi of [0, 0.5]) {
    let none = 0, most = 0, found5 = 0, found8 = 0, others = 0, rmse = 0;
    for (let s = 1; s <= seeds; s++) {
      const a = dailyWithNoise(7000 + s, phi, days);
      const r0 = decompose(seriesFromArrays(a.x, a.y));
      none += r0.spikeIndex.length;
      most = Math.max(most, r0.spikeIndex.length);
      const b = dailyWithNoise(9000 + s, phi, days, at, size);
      const r = decompose(seriesFromArrays(b.x, b.y));
      const got = new Set(r.spikeIndex);
      at.forEach((i, j) => { if (got.has(i)) { if (size[j] === 5) found5++; else found8++; } });
      others += r.spikeIndex.filter((i) => !at.includes(i)).length;
      let e = 0;
      for (let i = 0; i < days; i++) e += (r.trend[i] + r.season[i] - b.truth[i]) ** 2;
      rmse += Math.sqrt(e / days);
    }
    out.push({
      noise: phi ? `AR(1) phi ${phi}` : 'Gaussian', seeds, n: days, spikes_per_series_without_spikes: none / seeds, most_in_one_series: most,
      found_5sd: `${found5}/${4 * seeds}`, found_8sd: `${found8}/${2 * seeds}`, other_spikes_per_series: others / seeds, rmse_vs_truth: Number((rmse / seeds).toFixed(4)),
    });
  }
  return out;
}

/** Invented weekly orders (Mondays from 2015-01-05): a yearly swing, a level step, a slope change, one spike, noise; seeded. */
export function weeklyOrders(seed: number, weeks: number): { x: Float64Array; y: Float64Array } {
  const z = normalStream(seed);
  const x = new Float64Array(weeks), y = new Float64Array(weeks);
  for (let i = 0; i < weeks; i++) {
    x[i] = 42009 + 7 * i;
    y[i] = 100 + 0.05 * i + (i > weeks / 2 ? -10 : 0) + (i > (2 * weeks) / 3 ? 0.2 * (i - (2 * weeks) / 3) : 0) + 8 * Math.sin((2 * Math.PI * x[i]) / 365.2425) + 1.5 * z();
  }
  y[Math.floor(weeks / 5)] += 15;
  return { x, y };
}

/** Invented monthly costs (first days of months from January 2015): a month-of-year pattern, a slope change, one spike, noise; seeded. */
export function monthlyCosts(seed: number, months: number): { x: Float64Array; y: Float64Array } {
  const z = normalStream(seed);
  const pattern = [3, 2, 1, 0, -1, -2, -4, -3, -1, 0, 2, 3];
  const x = new Float64Array(months), y = new Float64Array(months);
  for (let m = 0; m < months; m++) {
    x[m] = Math.round(Date.UTC(2015, m, 1) / 86400000) + 25569;
    y[m] = 50 + 0.1 * m + (m > months * 0.6 ? 0.4 * (m - months * 0.6) : 0) + pattern[m % 12] + 0.8 * z();
  }
  y[Math.floor(months / 3)] += 15;
  return { x, y };
}

function median(a: number[]): number {
  const b = a.slice().sort((p, q) => p - q);
  const m = b.length >> 1;
  return b.length % 2 ? b[m] : 0.5 * (b[m - 1] + b[m]);
}

/**
 * Median wall time of `repeats` runs, and the median CPU time of this process over the same runs
 * (user + system from process.cpuUsage, garbage collection included): on a shared machine the wall
 * time also counts the waits for a core, the CPU time does not.
 */
function timeMedian(f: () => void, repeats: number): { ms: number; all: number[]; cpuMs: number; cpuAll: number[] } {
  const all: number[] = [], cpu: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    f();
    all.push(Number(process.hrtime.bigint() - t0) / 1e6);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return { ms: Number(median(all).toFixed(2)), all: all.map((v) => Number(v.toFixed(1))), cpuMs: Number(median(cpu).toFixed(2)), cpuAll: cpu.map((v) => Number(v.toFixed(1))) };
}

function writeData(y: Float64Array): { dir: string; file: string } {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-bench-'));
  const file = path.join(dir, 'y.txt');
  fs.writeFileSync(file, Array.from(y, (v) => v.toPrecision(17)).join('\n'));
  return { dir, file };
}

/** R's stl(ts(y, frequency = 7), s.window = 13, l.window = 9, robust = TRUE) (statsmodels needs a low-pass window above the period, so 9 rather than R's 7 everywhere): median ms over `reps` runs inside R. */
function rStl(file: string, reps: number): number | string {
  try {
    execFileSync('Rscript', ['--version'], { stdio: 'ignore' });
  } catch {
    return 'R not installed';
  }
  const code = `y <- scan('${file}', quiet = TRUE); x <- ts(y, frequency = 7); ms <- numeric(${reps});
for (i in 1:${reps}) ms[i] <- system.time(stl(x, s.window = 13, l.window = 9, robust = TRUE))[['elapsed']] * 1000; cat(median(ms))`;
  try {
    return Number(execFileSync('Rscript', ['--vanilla', '-e', code], { encoding: 'utf8' }).trim());
  } catch (e) {
    return `R failed: ${String(e).slice(0, 80)}`;
  }
}

/** statsmodels' STL with R's settings (degree 0, jumps ceiling(window / 10), inner 1, outer 15). */
function statsmodelsStl(file: string, reps: number, p: { trendWindow: number; lowPassWindow: number; seasonalJump: number; trendJump: number; lowPassJump: number }): number | string {
  const py = '/usr/bin/python3';
  if (!fs.existsSync(py)) return 'python3 not installed';
  const code = `
import time, statistics, numpy as np
from statsmodels.tsa.seasonal import STL
y = np.loadtxt('${file}')
ms = []
for i in range(${reps}):
    t0 = time.perf_counter()
    STL(y, period=7, seasonal=13, trend=${p.trendWindow}, low_pass=${p.lowPassWindow}, seasonal_deg=0, trend_deg=1, low_pass_deg=1, robust=True,
        seasonal_jump=${p.seasonalJump}, trend_jump=${p.trendJump}, low_pass_jump=${p.lowPassJump}).fit(inner_iter=1, outer_iter=15)
    ms.append((time.perf_counter() - t0) * 1000)
print(statistics.median(ms))`;
  try {
    return Number(execFileSync(py, ['-c', code], { encoding: 'utf8' }).trim());
  } catch {
    return 'statsmodels not installed';
  }
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  const reps = quick ? 3 : 7;
  const { x, y } = dailySales(20190101);
  const n = y.length;
  const series = seriesFromArrays(x, y);
  // warm-up of the JIT (full size: the first calls are several times slower)
  for (let r = 0; r < 3; r++) stl(y, { period: 7, seasonalWindow: 13, lowPassWindow: 9, robust: true });
  decompose(series, { method: 'stl' });
  const one = timeMedian(() => stl(y, { period: 7, seasonalWindow: 13, lowPassWindow: 9, robust: true }), reps);
  const p = stl(y, { period: 7, seasonalWindow: 13, lowPassWindow: 9, robust: true }).parameters;
  const { dir, file } = writeData(y);
  try {
    const r = rStl(file, reps);
    const sm = statsmodelsStl(file, reps, p);
    emit({
      bench: 'decompose', n, op: 'stl-period-7-robust', ms: one.ms, repeats: one.all, r_stl_ms: r, statsmodels_stl_ms: sm,
      ratio_to_r: typeof r === 'number' ? Number((one.ms / Math.max(r, 1e-3)).toFixed(3)) : null,
      ratio_to_statsmodels: typeof sm === 'number' ? Number((one.ms / Math.max(sm, 1e-3)).toFixed(3)) : null,
    });
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
  const mstl = timeMedian(() => decompose(series, { method: 'stl' }), reps);
  emit({ bench: 'decompose', n, op: 'stl-weekday-and-yearly', ms: mstl.ms, repeats: mstl.all, cpu_ms: mstl.cpuMs, target_ms: 200 });
  const def = decompose(series);
  const lam = def.penalty;
  const fixed = timeMedian(() => decompose(series, { penalty: lam }), quick ? 3 : 9);
  emit({ bench: 'decompose', n, op: 'adaptive-given-penalty', ms: fixed.ms, repeats: fixed.all, cpu_ms: fixed.cpuMs, cpu_repeats: fixed.cpuAll, target_ms: 200, cycles: def.solver.iterations, knots: def.knots.length, spikes: def.spikeIndex.length });
  const auto = timeMedian(() => decompose(series), quick ? 3 : 9);
  emit({ bench: 'decompose', n, op: 'adaptive-default', ms: auto.ms, repeats: auto.all, cpu_ms: auto.cpuMs, cpu_repeats: auto.cpuAll, target_ms: 200, load_average: os.loadavg().map((v) => Number(v.toFixed(2))), select: def.criterion.name, penalty: Number(lam.toPrecision(4)), knots: def.knots.length, spikes: def.spikeIndex.length, cycles: def.solver.iterations, solver: def.solver.stoppingRule.split('; ').slice(-2).join('; ') });
  // other spacings and lengths at default settings (the penalty search included)
  const cases: { spacing: string; data: { x: Float64Array; y: Float64Array }; repeats: number }[] = [
    { spacing: 'monthly', data: monthlyCosts(2015, 96), repeats: quick ? 3 : 9 },
    { spacing: 'weekly', data: weeklyOrders(2015, 261), repeats: quick ? 3 : 9 },
    { spacing: 'daily', data: dailySales(2015, 3653), repeats: quick ? 1 : 5 },
    ...(quick ? [] : [{ spacing: 'daily', data: dailySales(2015, 10000), repeats: 3 }]),
  ];
  for (const c of cases) {
    const sr = seriesFromArrays(c.data.x, c.data.y);
    const first = decompose(sr);
    const t = timeMedian(() => decompose(sr), c.repeats);
    const given = timeMedian(() => decompose(sr, { penalty: first.penalty }), c.repeats);
    emit({
      bench: 'decompose', n: sr.n, op: `adaptive-default-${c.spacing}`, ms: t.ms, repeats: t.all, cpu_ms: t.cpuMs, given_penalty_ms: given.ms, given_penalty_cpu_ms: given.cpuMs,
      seasons: first.seasons.filter((q) => q.kept).map((q) => q.label), knots: first.knots.length, spikes: first.spikeIndex.length, cycles: first.solver.iterations, converged: first.solver.converged,
    });
  }
  // quality at default settings (not a timing): the spike rule over 50 seeds of each noise (not in --quick)
  if (!quick) for (const r of spikeRule(50)) emit({ bench: 'decompose', op: 'adaptive-spike-rule', ...r });
}
