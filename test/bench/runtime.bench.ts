/**
 * Benchmark of the runtime around the engine:
 * - the time from a request to its first progress message, through a pool of
 *   worker threads (the same pool and job loop as the browser's Web Workers);
 * - the time from cancelling a running job to the pool being idle again (the
 *   worker terminated and its replacement loaded) and to the next job's first
 *   progress message; target under 100 ms each;
 * - the whole command-line process (`knotwise fit` on a 1e5-row CSV file of
 *   invented numbers, spawned as a new process) against the engine's own time
 *   for the same fit in this process; target under 2x;
 * - the three ways of reading that file: the fast numeric path, the general
 *   reader, and csv-parse (installed; general-purpose CSV reader);
 * - the automatic choice on the workers (poolSubmit: one job per candidate on a pool of two
 *   threads, then the choice) against the same choice in this process, on the smoothers bench's
 *   two shapes at 156 to 10,000 points: the pool's first run (threads loaded, code not yet
 *   compiled) and the median of the runs after it, as a pane's long-lived workers see them;
 *   the answers must agree (chosen candidate, every score).
 * KNOTWISE_BENCH_RUNTIME=auto runs only that part.
 * Timings are medians of repeats; this machine is shared and has few cores, so
 * single runs are noisy.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { spawnSync } from 'child_process';
import { threadPool } from '../../src/runtime/node/threadPool';
import type { AnalysisRequest, AnalysisResult, EngineJob, EngineJobResult } from '../../src/runtime/engineEntry';
import { poolSubmit } from '../../src/runtime/poolSubmit';
import { fitCells, runAnalysis } from '../../src/engine';
import { kinksAndWave, shiftsAndWave, SHAPE_NOISE } from '../helpers/autoBenchShapes';
import { parseCsv, parseNumericCsv } from '../../src/cli/csv';
import { normalStream } from '../helpers/random';

type Emit = (r: Record<string, unknown>) => void;
const now = () => Number(process.hrtime.bigint()) / 1e6;
const median = (a: number[]) => { const s = a.slice().sort((x, y) => x - y); const m = s.length >> 1; return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2; };
const round = (v: number, d = 1) => Number(v.toFixed(d));

/** An invented smooth level with noise, seeded. */
function series(n: number, seed: number): number[] {
  const z = normalStream(seed);
  return Array.from({ length: n }, (_, i) => 10 * Math.sin((6 * i) / n) + 3 * Math.cos((17 * i) / n) + z());
}

async function firstProgress(emit: Emit, quick: boolean): Promise<void> {
  const pool = threadPool<AnalysisRequest, unknown>(path.join(__dirname, '../../src/runtime/node/threadWorker.js'), 1);
  try {
    // Cold: the worker's start-up (loading the engine) is part of the wait.
    const tCold = now();
    let cold = NaN;
    const h0 = pool.run({ analysis: 'spline', y: series(100, 1) }, () => { if (Number.isNaN(cold)) cold = now() - tCold; });
    await h0.promise;
    for (const n of quick ? [1e3, 1e4] : [1e3, 1e4, 1e5]) {
      const y = series(n, 2);
      const waits: number[] = [];
      for (let k = 0; k < (quick ? 5 : 11); k++) {
        await pool.whenIdle();
        const t0 = now();
        let first = NaN;
        // A penalty given, so the fit itself is short and the repeats stay quick.
        const h = pool.run({ analysis: 'spline', y: y.map((v) => v + k * 1e-9), options: { penalty: 10 } }, () => { if (Number.isNaN(first)) first = now() - t0; });
        await h.promise;
        waits.push(first);
      }
      emit({ bench: 'runtime', measure: 'request-to-first-progress', host: 'node worker thread', n, medianMs: round(median(waits)), maxMs: round(Math.max(...waits)), repeats: waits.length, coldStartMs: n === 1e3 ? round(cold) : undefined, targetMs: 100 });
    }
  } finally {
    pool.close();
  }
}

async function cancelToIdle(emit: Emit, quick: boolean, spares: number): Promise<void> {
  const pool = threadPool<AnalysisRequest, unknown>(path.join(__dirname, '../../src/runtime/node/threadWorker.js'), 1, { spares });
  try {
    pool.warm();
    await pool.whenIdle();
    const rejected: number[] = [], idle: number[] = [], next: number[] = [];
    // Slope changepoints on 3000 points: many seconds of work, cancelled once it has started.
    const long = series(3000, 3);
    for (let k = 0; k < (quick ? 3 : 7); k++) {
      let started!: () => void;
      const running = new Promise<void>((r) => { started = r; });
      const h = pool.run({ analysis: 'slope', y: long.map((v) => v + k * 1e-9) }, () => started());
      h.promise.catch(() => undefined);
      await running;
      await new Promise((r) => setTimeout(r, 50));
      while (pool.reserved < spares) await new Promise((r) => setTimeout(r, 10));
      const t0 = now();
      h.cancel();
      await h.promise.catch(() => undefined);
      rejected.push(now() - t0);
      await pool.whenIdle();
      idle.push(now() - t0);
      let first = NaN;
      const h2 = pool.run({ analysis: 'spline', y: series(200, 4), options: { penalty: 1 } }, () => { if (Number.isNaN(first)) first = now() - t0; });
      await h2.promise;
      next.push(first);
    }
    emit({ bench: 'runtime', measure: 'cancel-to-idle', host: 'node worker thread', reserveWorkers: spares, medianCallerReleasedMs: round(median(rejected), 2), medianIdleMs: round(median(idle)), maxIdleMs: round(Math.max(...idle)), medianNextJobFirstProgressMs: round(median(next)), repeats: idle.length, targetMs: 100, note: 'idle = running worker terminated and its replacement loaded' });
  } finally {
    pool.close();
  }
}

function cliWholeProcess(emit: Emit, quick: boolean): void {
  const n = quick ? 1e4 : 1e5;
  const x = Array.from({ length: n }, (_, i) => i + 1);
  const y = series(n, 5);
  const file = path.join(os.tmpdir(), `knotwise-bench-${process.pid}.csv`);
  fs.writeFileSync(file, 'day,level\n' + x.map((v, i) => `${v},${y[i].toFixed(6)}`).join('\n') + '\n');
  try {
    const text = fs.readFileSync(file, 'utf8');
    const yRead = Array.from(parseNumericCsv(text)!.columns[1]);
    const reps = quick ? 3 : 5;
    const engine: number[] = [], whole: number[] = [];
    const cli = path.join(__dirname, '../../src/cli/node.js');
    for (let k = 0; k < reps; k++) {
      const t0 = now();
      fitCells(yRead, x, null, {});
      engine.push(now() - t0);
      const t1 = now();
      const r = spawnSync(process.execPath, [cli, 'fit', file, '--x', 'day', '--y', 'level', '--json'], { maxBuffer: 1 << 28 });
      whole.push(now() - t1);
      if (r.status !== 0) throw new Error(`knotwise fit failed: ${r.stderr}`);
    }
    const t2 = now();
    spawnSync(process.execPath, ['-e', '0']);
    const nodeStart = now() - t2;
    emit({ bench: 'runtime', measure: 'cli-fit-whole-process', n, engineMedianMs: round(median(engine)), processMedianMs: round(median(whole)), ratio: round(median(whole) / median(engine), 2), nodeStartMs: round(nodeStart), repeats: reps, target: 'ratio under 2' });

    const readers: Record<string, () => unknown> = {
      'numeric path (typed arrays)': () => parseNumericCsv(text),
      'general reader (cells)': () => parseCsv(text),
    };
    try {
      // eslint-disable-next-line @typescript-eslint/no-var-requires
      const { parse } = require('csv-parse/sync') as { parse(t: string, o: object): unknown };
      readers['csv-parse (cast numbers)'] = () => parse(text, { cast: true, from_line: 2, skip_empty_lines: true });
    } catch { /* not installed */ }
    for (const [reader, f] of Object.entries(readers)) {
      const t: number[] = [];
      for (let k = 0; k < 5; k++) { const t0 = now(); f(); t.push(now() - t0); }
      emit({ bench: 'runtime', measure: 'csv-read', n, columns: 2, reader, medianMs: round(median(t)) });
    }
  } finally {
    fs.unlinkSync(file);
  }
}

/** The automatic choice through poolSubmit on two worker threads, beside the same choice on this thread. */
async function autoOnWorkers(emit: Emit, quick: boolean): Promise<void> {
  const pool = threadPool<EngineJob, EngineJobResult>(path.join(__dirname, '../../src/runtime/node/threadWorker.js'), 2);
  const submit = poolSubmit(pool);
  try {
    pool.warm();
    await pool.whenIdle();
    for (const n of quick ? [730] : [156, 730, 5000, 10000]) {
      for (const shape of ['kinks-and-wave', 'shifts-and-wave'] as const) {
        const z = normalStream(n + (shape === 'kinks-and-wave' ? 5 : 6));
        const x = Array.from({ length: n }, (_, i) => i + 1);
        const y = x.map((t) => (shape === 'kinks-and-wave' ? kinksAndWave(t / n) : shiftsAndWave(t / n)) + SHAPE_NOISE[shape] * z());
        const load0 = os.loadavg()[0];
        const repeats = quick ? 2 : 4;
        const onWorkers: number[] = [], here: number[] = [];
        let a: AnalysisResult | undefined, b: AnalysisResult | undefined;
        for (let r = 0; r < repeats; r++) {
          const t0 = now();
          a = await submit({ analysis: 'auto', y, x }, () => undefined).promise;
          onWorkers.push(now() - t0);
          const t1 = now();
          b = runAnalysis({ analysis: 'auto', y, x });
          here.push(now() - t1);
        }
        const rows = (r: AnalysisResult) => r.comparison!.rows.map((q) => [q.label, q.cv, q.df]);
        const same = a!.comparison!.chosen === b!.comparison!.chosen && JSON.stringify(rows(a!)) === JSON.stringify(rows(b!));
        const later = onWorkers.slice(1), laterHere = here.slice(1);
        emit({
          bench: 'runtime', measure: 'auto-on-workers', threads: 2, shape, n, repeats,
          firstMs: round(onWorkers[0]), medianMs: round(median(later)), inThisThreadMedianMs: round(median(laterHere)),
          ratio: Number((median(later) / median(laterHere)).toFixed(3)), sameAnswer: same,
          chosen: b!.comparison!.rows[b!.comparison!.chosen].label, loadAverageBefore: load0, loadAverageAfter: os.loadavg()[0],
        });
      }
    }
  } finally {
    pool.close();
  }
}

export async function run(emit: Emit, quick: boolean): Promise<void> {
  const only = process.env.KNOTWISE_BENCH_RUNTIME;
  if (only === 'auto') { await autoOnWorkers(emit, quick); return; }
  await firstProgress(emit, quick);
  await cancelToIdle(emit, quick, 0);
  await cancelToIdle(emit, quick, 1);
  cliWholeProcess(emit, quick);
  await autoOnWorkers(emit, quick);
}
