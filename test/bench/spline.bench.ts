/**
 * Benchmark of the smoothing spline: one fit at a fixed lambda and a full GCV
 * selection at n = 1e3 .. 1e6, on a seeded series whose smoothness changes along
 * x (a chirp: slow on the left, fast on the right, plus noise). In the same run,
 * when Debian's R is installed, R's compiled smooth.spline(all.knots = TRUE)
 * with GCV is timed on the same data (time inside R, excluding file reading),
 * and the ratio is reported.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { execFileSync } from 'child_process';
import { fitSpline } from '../../src/engine/smoothers/spline';
import { seriesFromArrays } from '../../src/engine/series';
import { mulberry32, normalStream } from '../helpers/random';

function chirp(n: number, seed: number): { x: Float64Array; y: Float64Array } {
  const u = mulberry32(seed);
  const z = normalStream(seed + 1);
  const x = new Float64Array(n), y = new Float64Array(n);
  let t = 0;
  for (let i = 0; i < n; i++) {
    t += 0.5 + u();
    x[i] = t;
  }
  for (let i = 0; i < n; i++) {
    const s = (x[i] - x[0]) / (x[n - 1] - x[0]);
    y[i] = Math.sin(2 * Math.PI * (1 + 12 * s * s) * s) + 0.3 * z();
  }
  return { x, y };
}

function rTime(x: Float64Array, y: Float64Array): { ms: number; df: number } | null {
  try {
    execFileSync('Rscript', ['--version'], { stdio: 'ignore' });
  } catch {
    return null;
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-bench-'));
  const file = path.join(dir, 'data.bin');
  const buf = Buffer.alloc(16 * x.length);
  for (let i = 0; i < x.length; i++) { buf.writeDoubleLE(x[i], 16 * i); buf.writeDoubleLE(y[i], 16 * i + 8); }
  fs.writeFileSync(file, buf);
  const code = `v <- readBin('${file}', 'double', n = ${2 * x.length}); x <- v[c(TRUE, FALSE)]; y <- v[c(FALSE, TRUE)];
t <- system.time(f <- smooth.spline(x, y, all.knots = TRUE, cv = FALSE))[['elapsed']]; cat(t * 1000, f$df)`;
  try {
    const out = execFileSync('Rscript', ['--vanilla', '-e', code], { encoding: 'utf8', maxBuffer: 1 << 20 }).trim().split(/\s+/);
    return { ms: Number(out[0]), df: Number(out[1]) };
  } catch {
    return null;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

function gcvScore(y: Float64Array, f: Float64Array, df: number): number {
  let rss = 0;
  for (let i = 0; i < y.length; i++) rss += (y[i] - f[i]) ** 2;
  return (y.length * rss) / (y.length - df) ** 2;
}

function time<T>(f: () => T): { ms: number; value: T } {
  const t0 = process.hrtime.bigint();
  const value = f();
  return { ms: Number(process.hrtime.bigint() - t0) / 1e6, value };
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  for (const n of sizes) {
    const { x, y } = chirp(n, 4242 + n);
    const s = seriesFromArrays(x, y);
    fitSpline(seriesFromArrays(x.subarray(0, 200), y.subarray(0, 200)), {}); // warm-up of the JIT
    const gcv = time(() => fitSpline(s, { select: 'gcv' }));
    const fixed = time(() => fitSpline(s, { penalty: gcv.value.penalty }));
    emit({ bench: 'spline', n, op: 'fixed-lambda', ms: Number(fixed.ms.toFixed(1)), df: Number(fixed.value.df.toFixed(3)) });
    const rec: Record<string, unknown> = {
      bench: 'spline', n, op: 'gcv-select', ms: Number(gcv.ms.toFixed(1)), df: Number(gcv.value.df.toFixed(3)),
      evaluations: gcv.value.solver.iterations, atEdge: gcv.value.criterion.atEdge,
    };
    if (n <= 1e6) {
      const r = rTime(x, y);
      if (r) {
        // Our GCV score at R's chosen df, to show which choice is the better GCV minimum.
        const atR = fitSpline(s, { df: r.df });
        Object.assign(rec, {
          r_smooth_spline_ms: r.ms, r_df: Number(r.df.toFixed(3)), ratio_to_r: Number((gcv.ms / Math.max(r.ms, 1e-3)).toFixed(3)),
          gcv_score: gcv.value.criterion.value, gcv_score_at_r_df: gcvScore(s.y, atR.fitted, atR.df),
        });
      }
      else rec.r_smooth_spline_ms = 'R not installed';
    }
    emit(rec);
  }
}
