/**
 * poolSubmit: the automatic choice runs as one job per candidate plus one for the choice, on
 * in-process stand-ins for workers running the real engine jobs, and answers as one runAnalysis
 * does; other requests are one job; Cancel and a failing candidate stop every job of the request.
 * Seeded series of our own.
 */
import { WorkerPool } from '../../src/runtime/pool';
import { poolSubmit } from '../../src/runtime/poolSubmit';
import { AnalysisClient } from '../../src/runtime/client';
import { EngineJob, EngineJobResult, RunControl, analysisKey, isCandidatesJob, runEngineJob, autoSplit } from '../../src/runtime/engineEntry';
import { AnalysisResult, KnotwiseError, runAnalysis } from '../../src/engine';
import { fakeWorkers } from './fakeWorker';
import { normalStream } from '../helpers/random';

// A wave with a level shift halfway, noise sd 0.3 (invented).
function wave(n: number, seed: number): number[] {
  const z = normalStream(seed);
  return Array.from({ length: n }, (_, i) => Math.sin(i / 15) + (i > n / 2 ? 1 : 0) + 0.3 * z());
}

function setup(size: number, run: (job: EngineJob, c: RunControl) => EngineJobResult = runEngineJob, delay = 5) {
  const fw = fakeWorkers(run, () => delay);
  const pool = new WorkerPool<EngineJob, EngineJobResult>(fw.factory, size);
  const client = new AnalysisClient(poolSubmit(pool), analysisKey);
  return { fw, pool, client };
}

const timingsOff = (r: AnalysisResult) => r.comparison?.rows.map((q) => ({ ...q, milliseconds: 0 }));

describe('poolSubmit', () => {
  const y = wave(120, 4);

  test('an automatic choice runs one job per candidate and one for the choice, and answers as one runAnalysis', async () => {
    const { fw, pool, client } = setup(2);
    const stages: string[] = [];
    const fractions: number[] = [];
    const got = await client.compute({ y }, { onProgress: (p) => { stages.push(p.stage); fractions.push(p.fraction); } });
    const parts = autoSplit({ y })!;
    expect(fw.ran).toHaveLength(parts.length + 1);
    expect(fw.ran.slice(0, parts.length).every((j) => isCandidatesJob(j as EngineJob))).toBe(true);
    // the last job makes the choice from every candidate's outcome
    const last = fw.ran[parts.length] as { candidates: { index: number }[] };
    expect(last.candidates.map((o) => o.index).sort((a, b) => a - b)).toEqual([...parts].sort((a, b) => a - b));
    const here = runAnalysis({ y });
    expect(timingsOff(got)).toEqual(timingsOff(here));
    expect(Array.from(got.fitted)).toEqual(Array.from(here.fitted));
    expect(got.comparison!.chosen).toBe(here.comparison!.chosen);
    expect(stages).toContain(`${parts.length} of ${parts.length} methods compared`);
    expect(Math.max(...fractions)).toBeLessThanOrEqual(1);
    expect(fractions[fractions.length - 1]).toBeGreaterThan(0.97);
    pool.close();
  });

  test('another method, or a pool of one worker, runs the request as one job', async () => {
    const two = setup(2);
    await two.client.compute({ analysis: 'spline', y });
    expect(two.fw.ran).toHaveLength(1);
    two.pool.close();
    const one = setup(1);
    const got = await one.client.compute({ y });
    expect(one.fw.ran).toHaveLength(1);
    expect(isCandidatesJob(one.fw.ran[0] as EngineJob)).toBe(false);
    expect(got.analysis).toBe('auto');
    one.pool.close();
  });

  test('Cancel stops every job of the request: the caller gets "cancelled" and the choice never runs', async () => {
    const { fw, pool } = setup(2, runEngineJob, 40);
    const submit = poolSubmit(pool);
    const handle = submit({ y }, () => undefined);
    await new Promise((r) => setTimeout(r, 10));
    handle.cancel();
    const err = await handle.promise.catch((e) => e);
    expect(err).toBeInstanceOf(KnotwiseError);
    expect(err.code).toBe('cancelled');
    const parts = autoSplit({ y })!;
    // every candidate job was cancelled (queued ones dropped, running ones' workers stopped) before it ran
    expect(pool.stats.jobsCancelled).toBe(parts.length);
    // each job waits 40 ms in its worker before it runs: none ran, and the choice was never submitted
    expect(fw.ran).toHaveLength(0);
    await new Promise((r) => setTimeout(r, 80));
    expect(fw.ran).toHaveLength(0);
    expect(pool.running + pool.queued).toBe(0);
    pool.close();
  });

  test('a candidate that fails fails the request with its error, and the other candidates are stopped', async () => {
    const parts = autoSplit({ y })!;
    const failing = parts[2];
    const run = (job: EngineJob, c: RunControl): EngineJobResult => {
      if (isCandidatesJob(job) && job.indices.includes(failing)) throw new KnotwiseError('numerical', `candidate ${failing} failed`);
      return runEngineJob(job, c);
    };
    const { fw, pool, client } = setup(2, run, 20);
    const err = await client.compute({ y }).catch((e) => e);
    expect(err).toBeInstanceOf(KnotwiseError);
    expect(err.message).toBe(`candidate ${failing} failed`);
    // the choice never ran, and not every candidate did either
    expect(fw.ran.every((j) => isCandidatesJob(j as EngineJob))).toBe(true);
    expect(fw.ran.length).toBeLessThan(parts.length);
    await new Promise((r) => setTimeout(r, 50));
    expect(pool.running + pool.queued).toBe(0);
    pool.close();
  });
});
