/**
 * The pool and the client over real Node worker threads running the real
 * engine: errors cross with their code, a long changepoint fit is cancelled
 * by terminating its thread, and ten equal calls compute once.
 */
import * as path from 'path';
import { threadPool } from '../../src/runtime/node/threadPool';
import { AnalysisClient } from '../../src/runtime/client';
import { AnalysisRequest, EngineJob, analysisKey, autoSplit } from '../../src/runtime/engineEntry';
import { poolSubmit } from '../../src/runtime/poolSubmit';
import { KnotwiseError, runAnalysis } from '../../src/engine';
import type { WorkerPool } from '../../src/runtime/pool';
import { mulberry32 } from '../helpers/random';

const entry = path.join(__dirname, 'slowWorker.ts');
const loader = path.join(__dirname, 'tsThread.js');
let pool: WorkerPool<EngineJob, any>;

beforeAll(() => {
  pool = threadPool<EngineJob, any>(loader, 2, { workerOptions: { workerData: { entry } } });
});
afterAll(() => pool.close());

// A seeded broken-line series (invented): slope changes at rows 100 and 220.
function brokenLine(n: number): number[] {
  const u = mulberry32(7);
  return Array.from({ length: n }, (_, i) => (i < 100 ? 0.5 * i : i < 220 ? 50 - 0.3 * (i - 100) : 14 + 0.8 * (i - 220)) + (u() - 0.5));
}

test('a real fit in a thread equals the same fit on this thread', async () => {
  const y = brokenLine(300);
  const got = await pool.run({ analysis: 'slope', y }).promise;
  const here = runAnalysis({ analysis: 'slope', y });
  expect(got.analysis).toBe('slope');
  expect(got.breaks.breaks.map((b: any) => b.row)).toEqual(here.breaks!.breaks.map((b) => b.row));
  expect(here.breaks!.breaks.length).toBeGreaterThan(0);
  expect(Object.prototype.toString.call(got.fitted)).toBe('[object Float64Array]'); // typed arrays survive the crossing
  expect(Array.from(got.fitted)).toEqual(Array.from(here.fitted));
});

test('an engine error crosses the thread boundary as a KnotwiseError with code and message', async () => {
  const y = [1, 2, 3, 4, 5, 6];
  const err = await pool.run({ analysis: 'spline', y, options: { penalty: -2 } }).promise.catch((e) => e);
  const here = (() => { try { runAnalysis({ analysis: 'spline', y, options: { penalty: -2 } }); return null; } catch (e) { return e as KnotwiseError; } })();
  expect(err).toBeInstanceOf(KnotwiseError);
  expect(err.code).toBe('bad-option');
  expect(err.message).toBe(here!.message);
  expect(err.message).toMatch(/-2/);
  const unknown = await pool.run({ analysis: 'wavy', y: [1, 2, 3] }).promise.catch((e) => e);
  expect(unknown.code).toBe('unknown-method');
});

test('cancel stops a running job at once: the thread is terminated, a new one started, and the next job runs', async () => {
  const before = { ...pool.stats };
  const seen: number[] = [];
  const long = pool.run({ analysis: 'spin', y: [], options: { ms: 20_000 } }, (p) => seen.push(p.fraction));
  while (seen.length === 0) await new Promise((r) => setTimeout(r, 5));
  const t0 = Date.now();
  long.cancel();
  const err = await long.promise.catch((e) => e);
  expect(Date.now() - t0).toBeLessThan(1000);
  expect(err.code).toBe('cancelled');
  expect(pool.stats.workersTerminated).toBe(before.workersTerminated + 1);
  expect(pool.stats.workersStarted).toBe(before.workersStarted + 1);
  const next = await pool.run({ analysis: 'spline', y: [3, 1, 4, 1, 5, 9, 2, 6], options: { df: 3 } }).promise;
  expect(next.smooth.df).toBeCloseTo(3, 6);
});

test('a thread that dies rejects its job; the pool goes on', async () => {
  const err = await pool.run({ analysis: 'crash', y: [] }).promise.catch((e) => e);
  expect(err.message).toMatch(/the worker stopped: the worker thread exited \(code 3\)/);
  const ok = await pool.run({ analysis: 'spin', y: [], options: { ms: 1 } }).promise;
  expect(ok.spun).toBe(1);
});

test('ten concurrent equal requests through the client run one job; a different option runs another', async () => {
  const client = new AnalysisClient<AnalysisRequest, any>((r, p) => pool.run(r, p), analysisKey);
  const y = brokenLine(250);
  const runsBefore = pool.stats.jobsRun;
  const out = await Promise.all(Array.from({ length: 10 }, () => client.compute({ analysis: 'trend', y: y.slice(), options: { order: 1 } })));
  expect(new Set(out).size).toBe(1);
  expect(pool.stats.jobsRun).toBe(runsBefore + 1);
  await client.compute({ analysis: 'trend', y, options: { order: 2 } });
  expect(pool.stats.jobsRun).toBe(runsBefore + 2);
});

test('the automatic choice spread over two threads (one job per candidate, then the choice) answers as one runAnalysis here', async () => {
  const y = brokenLine(150);
  const runsBefore = pool.stats.jobsRun;
  const client = new AnalysisClient<AnalysisRequest, any>(poolSubmit(pool), analysisKey);
  const got = await client.compute({ y });
  const here = runAnalysis({ y });
  expect(pool.stats.jobsRun).toBe(runsBefore + autoSplit({ y })!.length + 1);
  const rows = (r: any) => r.comparison.rows.map((q: any) => ({ ...q, milliseconds: 0 }));
  expect(rows(got)).toEqual(rows(here));
  expect(got.comparison.chosen).toBe(here.comparison!.chosen);
  expect(Array.from(got.fitted)).toEqual(Array.from(here.fitted));
  expect(got.smooth.method).toBe(here.smooth!.method);
});
