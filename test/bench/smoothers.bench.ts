/**
 * Benchmark of the classical smoothers, each beside its usual reference in the same run
 * (time inside the reference, excluding reading the data; medians of repeats on both sides):
 * - Whittaker / Hodrick-Prescott (order 2, lambda 1600, x = 1..n) at n = 1e3 .. 1e6, one fit
 *   with the exact df, and the one-sided trend; beside statsmodels' hpfilter (sparse LU of
 *   I + lambda K'K, trend only, no df); speedups of wall-time medians and of CPU-time medians.
 * - Wavelet shrinkage (sym8, universal soft threshold, periodic boundary) at 1e3 .. 1e6 beside
 *   PyWavelets (wavedec / threshold / waverec, mode 'periodization': the same computation);
 *   our default mirror boundary, which transforms twice the length, is timed too.
 * - LOESS (degree 2, span 0.1, no robustness) at 1e3 .. 1e5 (and ours alone at 1e6) with the default delta
 *   interpolation (exact local fits at anchors min(0.01, span / 20) * range apart) beside R's
 *   loess with its default kd-tree vertex interpolation (surface = "interpolate"; timed with its
 *   default exact trace of the smoother matrix, as ours, and with trace.hat = "approximate"), and our
 *   exact fit beside R's surface = "direct" up to 1e4.
 * - The automatic choice (auto) at n = 156 and 730 (a weekly and a daily business length), 5,000
 *   and 10,000 on two seeded series (a kinked line
 *   with a smooth wave, and a slow wave with level shifts): wall and CPU time of the whole choice
 *   (medians of repeats) and each candidate's milliseconds from the comparison table (medians), with
 *   the chosen method, df and the load average at the start and end of each size.
 * KNOTWISE_BENCH_SMOOTHERS=whittaker,wavelet,loess,auto selects parts (default all).
 * The machine is shared and has 2 cores: figures are noisy, so medians and minima of the
 * repeats are both printed; ratios are ours / theirs (speedups theirs / ours).
 */
import { kinksAndWave, shiftsAndWave } from '../helpers/autoBenchShapes';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { execFileSync } from 'child_process';
import { whittakerFit } from '../../src/engine/smoothers/whittaker/whittakerFit';
import { whittakerOneSided } from '../../src/engine/smoothers/whittaker/whittakerOneSided';
import { waveletShrink } from '../../src/engine/smoothers/wavelet/waveletShrink';
import { loessFit } from '../../src/engine/smoothers/loess/loessFit';
import { mulberry32, normalStream } from '../helpers/random';
import { runAnalysis } from '../../src/engine';

function median(v: number[]): number {
  const a = [...v].sort((p, q) => p - q);
  return a.length % 2 ? a[(a.length - 1) >> 1] : 0.5 * (a[a.length / 2 - 1] + a[a.length / 2]);
}

function timeMedian<T>(f: () => T, repeats: number): { ms: number; minMs: number; cpuMs: number; value: T } {
  let value = f(); // first call (JIT warm-up), not counted
  const t: number[] = [], c: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    value = f();
    t.push(Number(process.hrtime.bigint() - t0) / 1e6);
    const dc = process.cpuUsage(c0);
    c.push((dc.user + dc.system) / 1e3);
  }
  return { ms: Number(median(t).toFixed(2)), minMs: Number(Math.min(...t).toFixed(2)), cpuMs: Number(median(c).toFixed(2)), value };
}

function writeBin(dir: string, name: string, v: Float64Array): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, Buffer.from(v.buffer, v.byteOffset, v.byteLength));
  return file;
}

function has(cmd: string, args: string[]): boolean {
  try { execFileSync(cmd, args, { stdio: 'ignore' }); return true; } catch { return false; }
}

function python(code: string): string | null {
  try {
    return execFileSync('/usr/bin/python3', ['-c', code], { encoding: 'utf8', maxBuffer: 1 << 20 }).trim();
  } catch {
    return null;
  }
}

function rscript(code: string): string | null {
  try {
    return execFileSync('Rscript', ['--vanilla', '-e', code], { encoding: 'utf8', maxBuffer: 1 << 20 }).trim();
  } catch {
    return null;
  }
}

const pyTimer = `
import time, statistics
def tmed(f, r):
    f()
    t = []
    c = []
    for _ in range(r):
        c0 = time.process_time(); t0 = time.perf_counter(); f(); t.append((time.perf_counter() - t0) * 1000); c.append((time.process_time() - c0) * 1000)
    return '%r %r %r' % (statistics.median(t), min(t), statistics.median(c))
`;

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  // KNOTWISE_BENCH_SMOOTHERS=whittaker (or wavelet, loess; comma-separated) runs only those parts
  const parts = process.env.KNOTWISE_BENCH_SMOOTHERS?.split(',').map((p) => p.trim());
  const part = (name: string) => !parts || parts.includes(name);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-bench-smoothers-'));
  const havePy = has('/usr/bin/python3', ['-c', 'import statsmodels, pywt']);
  const haveR = has('Rscript', ['--version']);
  try {
    // Whittaker / Hodrick-Prescott
    for (const n of !part('whittaker') ? [] : quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6]) {
      const z = normalStream(n + 1);
      const x = Float64Array.from({ length: n }, (_, i) => i + 1);
      let level = 0;
      const y = Float64Array.from(x, () => (level += 0.01 + 0.05 * z()) + 0.3 * z());
      // statsmodels takes seconds per fit at 1e6, so it is repeated less often than ours
      const repeats = n >= 1e6 ? 3 : n >= 1e5 ? 7 : 21;
      const ours = n >= 1e6 ? 9 : repeats;
      const fit = timeMedian(() => whittakerFit(x, y, null, 1600, 2), ours);
      const one = timeMedian(() => whittakerOneSided(x, y, null, 1600, 2), ours);
      const rec: Record<string, unknown> = { bench: 'smoothers', method: 'whittaker-hp', n, lambda: 1600, repeats: ours, statsmodels_repeats: repeats, ms: fit.ms, min_ms: fit.minMs, cpu_ms: fit.cpuMs, df: Number(fit.value.df.toFixed(3)), one_sided_ms: one.ms };
      if (havePy) {
        const f = writeBin(dir, 'hp.bin', y);
        const out = python(`${pyTimer}
import numpy as np
from statsmodels.tsa.filters.hp_filter import hpfilter
y = np.fromfile('${f}', dtype='<f8')
print(tmed(lambda: hpfilter(y, lamb=1600), ${repeats}))
c, t = hpfilter(y, lamb=1600)
t.astype('<f8').tofile('${f}.trend')
`);
        if (out !== null) {
          const ref = new Float64Array(fs.readFileSync(`${f}.trend`).buffer.slice(0));
          let d = 0, s = 0;
          for (let i = 0; i < n; i++) { d = Math.max(d, Math.abs(ref[i] - fit.value.fitted[i])); s = Math.max(s, Math.abs(ref[i])); }
          const [med, mn, cpu] = out.split(/\s+/).map(Number);
          Object.assign(rec, {
            statsmodels_hpfilter_ms: Number(med.toFixed(2)), statsmodels_min_ms: Number(mn.toFixed(2)), statsmodels_cpu_ms: Number(cpu.toFixed(2)),
            speedup_vs_statsmodels: Number((med / fit.ms).toFixed(1)), speedup_of_minima: Number((mn / fit.minMs).toFixed(1)),
            // on a loaded machine the CPU times (process time on both sides) vary less than wall times
            speedup_of_cpu_times: Number((cpu / fit.cpuMs).toFixed(1)),
            max_rel_diff: Number((d / s).toExponential(2)),
          });
        }
      } else rec.statsmodels_hpfilter_ms = 'statsmodels not installed';
      emit(rec);
    }

    // Wavelet shrinkage
    for (const n of !part('wavelet') ? [] : quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6]) {
      const z = normalStream(n + 2);
      const y = Float64Array.from({ length: n }, (_, i) => { const t = (i + 0.5) / n; return 7 * Math.sqrt(t * (1 - t)) * Math.sin((2 * Math.PI * 1.05) / (t + 0.05)) / 0.29 + z(); });
      const repeats = n >= 1e6 ? 5 : n >= 1e5 ? 9 : 21;
      const per = timeMedian(() => waveletShrink(y, { filter: 'sym8', boundary: 'periodic' }), repeats);
      const refl = timeMedian(() => waveletShrink(y, { filter: 'sym8', boundary: 'reflect' }), repeats);
      const rec: Record<string, unknown> = { bench: 'smoothers', method: 'wavelet-universal-soft', filter: 'sym8', n, levels: per.value.levels, periodic_ms: per.ms, periodic_min_ms: per.minMs, reflect_ms: refl.ms, reflect_min_ms: refl.minMs };
      if (havePy) {
        const f = writeBin(dir, 'wav.bin', y);
        const out = python(`${pyTimer}
import numpy as np, pywt
y = np.fromfile('${f}', dtype='<f8')
J = ${per.value.levels}
n = len(y)
def shrink():
    c = pywt.wavedec(y, 'sym8', mode='periodization', level=J)
    s = np.median(np.abs(c[-1])) / 0.6745
    t = s * np.sqrt(2 * np.log(n))
    return pywt.waverec([c[0]] + [pywt.threshold(d, t, 'soft') for d in c[1:]], 'sym8', mode='periodization')
# the same shrinkage with PyWavelets' half-sample symmetric extension (its default mode), the boundary rule of our 'reflect'
def shrink_symmetric():
    c = pywt.wavedec(y, 'sym8', mode='symmetric', level=J)
    s = np.median(np.abs(c[-1])) / 0.6745
    t = s * np.sqrt(2 * np.log(n))
    return pywt.waverec([c[0]] + [pywt.threshold(d, t, 'soft') for d in c[1:]], 'sym8', mode='symmetric')
print(tmed(shrink, ${repeats}), tmed(shrink_symmetric, ${repeats}))
`);
        if (out !== null) {
          const [med, mn, , smed, smn] = out.split(/\s+/).map(Number);
          Object.assign(rec, {
            pywavelets_ms: Number(med.toFixed(2)), pywavelets_min_ms: Number(mn.toFixed(2)),
            ratio_periodic_to_pywavelets: Number((per.ms / med).toFixed(2)), ratio_reflect_to_pywavelets: Number((refl.ms / med).toFixed(2)),
            ratio_of_minima_periodic: Number((per.minMs / mn).toFixed(2)),
            pywavelets_symmetric_ms: Number(smed.toFixed(2)), pywavelets_symmetric_min_ms: Number(smn.toFixed(2)),
            ratio_reflect_to_pywavelets_symmetric: Number((refl.ms / smed).toFixed(2)), ratio_of_minima_reflect_symmetric: Number((refl.minMs / smn).toFixed(2)),
          });
        }
      } else rec.pywavelets_ms = 'pywt not installed';
      emit(rec);
    }

    // LOESS
    for (const n of !part('loess') ? [] : quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6]) {
      const u = mulberry32(n + 3), z = normalStream(n + 4);
      const x = Float64Array.from({ length: n }, () => 10 * u()).sort();
      const y = Float64Array.from(x, (v) => Math.sin(v) + 0.3 * z());
      const repeats = n >= 1e6 ? 3 : n >= 1e5 ? 5 : 9;
      const span = 0.1;
      const interp = timeMedian(() => loessFit(x, y, null, { span, degree: 2 }), repeats);
      const rec: Record<string, unknown> = { bench: 'smoothers', method: 'loess', degree: 2, span, n, ms: interp.ms, min_ms: interp.minMs, anchors: interp.value.anchors, df: Number(interp.value.df.toFixed(3)) };
      let exact: { ms: number; value: ReturnType<typeof loessFit> } | null = null;
      if (n <= 1e4) {
        exact = timeMedian(() => loessFit(x, y, null, { span, degree: 2, delta: 0 }), repeats);
        rec.exact_ms = exact.ms;
      }
      if (n > 1e5) rec.r_loess_interpolate_ms = 'not timed beyond 1e5 points (the peers\' range); ours alone at a full column';
      else if (haveR) {
        const fx = writeBin(dir, 'lx.bin', x), fy = writeBin(dir, 'ly.bin', y);
        const direct = n <= 1e4;
        const out = rscript(`x <- readBin('${fx}', 'double', n = ${n}); y <- readBin('${fy}', 'double', n = ${n})
tm <- function(f, r) { f(); median(sapply(seq_len(r), function(i) system.time(f())[['elapsed']])) * 1000 }
a <- tm(function() loess(y ~ x, span = ${span}, degree = 2), ${repeats})
b <- if (${direct ? 'TRUE' : 'FALSE'}) tm(function() loess(y ~ x, span = ${span}, degree = 2, control = loess.control(surface = 'direct')), ${repeats}) else NA
c <- tm(function() loess(y ~ x, span = ${span}, degree = 2, control = loess.control(trace.hat = 'approximate')), ${repeats})
f <- fitted(loess(y ~ x, span = ${span}, degree = 2, control = loess.control(surface = 'direct', statistics = 'none')))
writeBin(f, '${fx}.fit')
cat(a, b, c)`);
        if (out !== null) {
          const [a, b, c] = out.split(/\s+/).map(Number);
          const rf = new Float64Array(fs.readFileSync(`${fx}.fit`).buffer.slice(0));
          let d = 0;
          for (let i = 0; i < n; i++) d = Math.max(d, Math.abs(rf[i] - interp.value.fitted[i]));
          Object.assign(rec, {
            r_loess_interpolate_ms: a, ratio_to_r_interpolate: Number((interp.ms / Math.max(a, 1e-3)).toFixed(3)),
            r_loess_interpolate_approx_trace_ms: c, ratio_to_r_approx_trace: Number((interp.ms / Math.max(c, 1e-3)).toFixed(3)),
            max_abs_diff_to_r_direct: Number(d.toExponential(2)),
          });
          if (exact && Number.isFinite(b)) Object.assign(rec, { r_loess_direct_ms: b, ratio_exact_to_r_direct: Number((exact.ms / Math.max(b, 1e-3)).toFixed(3)) });
        }
      } else rec.r_loess_interpolate_ms = 'R not installed';
      emit(rec);
    }

    // the automatic choice: every candidate cross-validated on the same folds
    for (const n of !part('auto') ? [] : quick ? [1000] : [156, 730, 5000, 10000]) {
      for (const shape of ['kinks-and-wave', 'shifts-and-wave']) {
        const z = normalStream(n + (shape === 'kinks-and-wave' ? 5 : 6));
        const x = Array.from({ length: n }, (_, i) => i + 1);
        const y = x.map((t) => (shape === 'kinks-and-wave' ? kinksAndWave(t / n) + 0.3 * z() : shiftsAndWave(t / n) + 0.4 * z()));
        const load0 = os.loadavg()[0];
        const repeats = quick ? 1 : 3;
        const wall: number[] = [], cpu: number[] = [], per = new Map<string, number[]>();
        let last: ReturnType<typeof runAnalysis> | undefined;
        for (let r = 0; r < repeats; r++) {
          const c0 = process.cpuUsage();
          const t0 = process.hrtime.bigint();
          last = runAnalysis({ analysis: 'auto', y, x });
          wall.push(Number(process.hrtime.bigint() - t0) / 1e6);
          const dc = process.cpuUsage(c0);
          cpu.push((dc.user + dc.system) / 1e3);
          for (const row of last.comparison!.rows) per.set(row.label, [...(per.get(row.label) ?? []), row.milliseconds]);
        }
        const c = last!.comparison!;
        emit({
          bench: 'smoothers', method: 'auto', shape, n, repeats, ms: Math.round(median(wall)), min_ms: Math.round(Math.min(...wall)), cpu_ms: Math.round(median(cpu)),
          load_average_start: Number(load0.toFixed(2)), load_average_end: Number(os.loadavg()[0].toFixed(2)),
          chosen: c.rows[c.chosen].label, chosen_df: Number(c.rows[c.chosen].df.toFixed(2)), best: c.rows[c.best].label,
          candidates: c.rows.map((row) => ({ label: row.label, median_ms: median(per.get(row.label)!), df: Number(row.df.toFixed(2)), cv: Number(row.cv.toPrecision(4)), se: Number(row.se.toPrecision(3)), ...(row.skipped ? { skipped: row.skipped.slice(0, 60) } : {}) })),
        });
      }
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
