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
 *   reader, and csv-parse (installed; general-purpose CSV reader).
 * Timings are medians of repeats; this machine is shared and has few cores, so
 * single runs are noisy.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { spawnSync } from 'child_process';
import { threadPool } from '../../src/runtime/node/threadPool';
import type { AnalysisRequest } from '../../src/runtime/engineEntry';
import { fitCells } from '../../src/engine';
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

export async function run(emit: Emit, quick: boolean): Promise<void> {
  await firstProgress(emit, quick);
  await cancelToIdle(emit, quick, 0);
  await cancelToIdle(emit, quick, 1);
  cliWholeProcess(emit, quick);
}
