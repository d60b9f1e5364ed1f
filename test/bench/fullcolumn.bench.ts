/**
 * Every method on a full worksheet column (1,048,576 rows), through the command line as a
 * user runs it: `node bin/knotwise.js ... --timing` on a CSV file of an invented, seeded,
 * slowly varying series (a few slow swings and a gentle rise, noise sd 1; whole counts around
 * the same level for the counts model), each method at its default settings (STL is given
 * period 7, since a series without dates has no season for it to find).
 *
 * For each method, the median over the repeats of:
 * - the outcome: finished, refused (with its one-line message), stopped by the bench's time limit
 *   (120 s), or failed (any other exit);
 * - the wall time of the whole process (start of node to exit), the engine's own time and the
 *   time reading the file (from the command line's --timing line);
 * - the CPU time of the process (user + system, from /usr/bin/time when installed) and its peak
 *   resident memory (maxRSS; from /usr/bin/time, else from the --timing line).
 * `within30s` says whether the method finished or refused within 30 s of wall time; a method
 * that does neither is a fault to fix. The machine is shared (2 cores): wall times grow with
 * the load average printed beside them; the CPU times vary less.
 *
 * --quick runs 2^14 rows. The repeat count can be set with KNOTWISE_BENCH_REPEATS (default 3).
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { execFileSync, spawnSync } from 'child_process';
import { mulberry32, normalStream } from '../helpers/random';

/** The project root (this file runs compiled from dist/bench/test/bench). */
const ROOT = path.resolve(__dirname, '../../../..');
const FULL_COLUMN = 1_048_576;
/** The bench stops a run after this many seconds (the aim is 30 s; the margin shows how far off a slow method is). */
const HARD_LIMIT_S = 120;

interface Case { method: string; args: string[] }

/** Every method at its default settings (the command line's own defaults). */
export const FULL_COLUMN_CASES: readonly Case[] = [
  { method: 'spline', args: ['fit', '--y', 'y', '--method', 'spline'] },
  ...[0, 1, 2, 3].map((k) => ({ method: `trend order ${k}`, args: ['fit', '--y', 'y', '--method', 'trend', '--order', String(k)] })),
  { method: 'whittaker', args: ['fit', '--y', 'y', '--method', 'whittaker'] },
  { method: 'loess', args: ['fit', '--y', 'y', '--method', 'loess'] },
  { method: 'wavelet', args: ['fit', '--y', 'y', '--method', 'wavelet'] },
  { method: 'auto', args: ['fit', '--y', 'y', '--method', 'auto'] },
  { method: 'no method named', args: ['fit', '--y', 'y'] },
  { method: 'decompose adaptive', args: ['decompose', '--y', 'y'] },
  { method: 'decompose stl (period 7)', args: ['decompose', '--y', 'y', '--method', 'stl', '--period', '7'] },
  { method: 'level', args: ['breaks', '--y', 'y', '--model', 'level'] },
  { method: 'volatility', args: ['breaks', '--y', 'y', '--model', 'volatility'] },
  { method: 'counts', args: ['breaks', '--y', 'count', '--model', 'counts'] },
  { method: 'distribution', args: ['breaks', '--y', 'y', '--model', 'distribution'] },
  { method: 'slope', args: ['breaks', '--y', 'y', '--model', 'slope'] },
];

/** The invented series as CSV text: x = 1..n, y slowly varying with noise, count whole numbers around the same level. */
export function fullColumnCsv(n: number, seed = 20261202): string {
  const z = normalStream(seed), u = mulberry32(seed + 1);
  const parts: string[] = ['x,y,count'];
  for (let i = 1; i <= n; i++) {
    const t = i / n;
    const level = 10 + 3 * Math.sin(2 * Math.PI * 3 * t) + 1.5 * Math.sin(2 * Math.PI * 0.7 * t + 1) + 2 * t;
    const y = level + z();
    // counts: a whole number near the level (a rounded normal approximation of a Poisson count)
    const c = Math.max(0, Math.round(level + Math.sqrt(level) * (u() + u() + u() + u() - 2) * Math.sqrt(3)));
    parts.push(`${i},${y.toFixed(4)},${c}`);
  }
  return parts.join('\n') + '\n';
}

function median(v: number[]): number {
  const a = v.filter(Number.isFinite).sort((p, q) => p - q);
  if (!a.length) return NaN;
  return a.length % 2 ? a[(a.length - 1) >> 1] : 0.5 * (a[a.length / 2 - 1] + a[a.length / 2]);
}

interface Run { outcome: 'finished' | 'refused' | 'stopped' | 'failed'; message?: string; wallS: number; engineS: number; readS: number; cpuS: number; peakMb: number }

function runOnce(file: string, outFile: string, c: Case, haveTime: boolean): Run {
  const cli = [path.join(ROOT, 'bin/knotwise.js'), ...c.args, file, '--x', 'x', '--json', '--out', outFile, '--force', '--timing'];
  const timeFile = `${outFile}.time`;
  // coreutils' timeout stops node itself at the limit (killing /usr/bin/time would leave node running)
  const limited = ['timeout', '-s', 'KILL', String(HARD_LIMIT_S), process.execPath, ...cli];
  const [cmd, args] = haveTime ? ['/usr/bin/time', ['-f', '%M %U %S', '-o', timeFile, ...limited]] : [limited[0], limited.slice(1)];
  const t0 = process.hrtime.bigint();
  const r = spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 24 });
  const wallS = Number(process.hrtime.bigint() - t0) / 1e9;
  const err = (r.stderr ?? '').split('\n').filter((l) => l && !l.startsWith('Command '));
  const timing = err.find((l) => l.startsWith('knotwise timing:')) ?? '';
  const num = (re: RegExp) => { const m = re.exec(timing); return m ? Number(m[1]) : NaN; };
  let peakMb = num(/peak memory (\d+) MB/), cpuS = NaN;
  if (haveTime && fs.existsSync(timeFile)) {
    const t = fs.readFileSync(timeFile, 'utf8').trim().split('\n').pop()!.split(/\s+/).map(Number);
    if (t.length === 3 && t.every(Number.isFinite)) { peakMb = t[0] / 1024; cpuS = t[1] + t[2]; }
    fs.rmSync(timeFile, { force: true });
  }
  const engine = /engine ([\d +]+) ms/.exec(timing);
  const run: Run = {
    // 137: killed by timeout -s KILL at the bench's limit
    outcome: r.status === 0 ? 'finished' : r.status === 1 && timing.endsWith('(refused)') ? 'refused' : r.status === 137 ? 'stopped' : 'failed',
    wallS, engineS: engine ? engine[1].split('+').reduce((s, v) => s + Number(v), 0) / 1000 : NaN, readS: num(/read (\d+) ms/) / 1000, cpuS, peakMb,
  };
  if (run.outcome === 'stopped') run.message = `stopped by the bench after ${HARD_LIMIT_S} s`;
  // a run stopped at the limit reports no usable CPU time or peak (the kill skips the accounting)
  if (run.outcome === 'stopped') { run.cpuS = NaN; run.peakMb = NaN; }
  if (run.outcome !== 'finished') run.message = err.find((l) => !l.startsWith('knotwise timing:')) ?? (r.error ? String(r.error.message) : `exit ${r.status} signal ${r.signal}`);
  return run;
}

const round = (v: number, d = 2) => (Number.isFinite(v) ? Number(v.toFixed(d)) : null);

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  const n = quick ? 1 << 14 : FULL_COLUMN;
  const repeats = Math.max(1, Number(process.env.KNOTWISE_BENCH_REPEATS ?? 3) | 0);
  execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json'], { cwd: ROOT, stdio: 'inherit' });
  let haveTime = false;
  try { execFileSync('/usr/bin/time', ['-f', '%M', 'true'], { stdio: 'ignore' }); haveTime = true; } catch { /* peak memory from the --timing line */ }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-bench-fullcolumn-'));
  try {
    const file = path.join(dir, 'column.csv');
    fs.writeFileSync(file, fullColumnCsv(n));
    const only = process.env.KNOTWISE_BENCH_METHODS?.split(',').map((s) => s.trim());
    for (const c of FULL_COLUMN_CASES) {
      if (only && !only.includes(c.method)) continue;
      const load = os.loadavg()[0];
      const runs: Run[] = [];
      for (let k = 0; k < repeats; k++) {
        const r = runOnce(file, path.join(dir, 'out.json'), c, haveTime);
        runs.push(r);
        if (r.outcome === 'stopped') break; // one stop is enough to know
      }
      const outcomes = [...new Set(runs.map((r) => r.outcome))];
      const wall = median(runs.map((r) => r.wallS));
      emit({
        bench: 'fullcolumn', method: c.method, command: `knotwise ${c.args.join(' ')} column.csv --x x --json --out FILE`, n,
        outcome: outcomes.join('/'), ...(runs[0].message ? { message: runs[0].message } : {}),
        wall_s: round(wall), engine_s: round(median(runs.map((r) => r.engineS))), read_s: round(median(runs.map((r) => r.readS))),
        cpu_s: round(median(runs.map((r) => r.cpuS))), peak_mb: round(median(runs.map((r) => r.peakMb)), 0),
        within_30s: outcomes.every((o) => o === 'finished' || o === 'refused') && wall <= 30,
        repeats: runs.length, load_average: round(load, 1),
      });
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
