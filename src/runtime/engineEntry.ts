/**
 * The engine entry every runtime runs, {@link runAnalysis}: a request in, a
 * plain structured-clone-able result out, with progress reports and a
 * cancellation signal; and the key under which equal requests share a result.
 * Re-exported here so the runtime's hosts (Web Workers, Node worker threads)
 * import one place, with the error a cancelled job ends with.
 */
import { KnotwiseError } from '../engine/errors';
import { runAnalysis, runCandidates } from '../engine';
import type { AnalysisRequest, AnalysisResult, CandidateOutcome, RunControl } from '../engine';

export { runAnalysis, runCandidates, autoSplit, analysisKey } from '../engine';
export type { AnalysisRequest, AnalysisResult, CandidateOutcome, Progress, RunControl } from '../engine';

/** A job that computes some candidates of an automatic choice ({@link runCandidates}). */
export interface CandidatesJob {
  candidatesOf: AnalysisRequest;
  indices: number[];
}

/** What a worker runs: an analysis, or some candidates of an automatic choice. */
export type EngineJob = AnalysisRequest | CandidatesJob;

/** What a worker answers: the analysis's result, or the candidates' outcomes. */
export type EngineJobResult = AnalysisResult | CandidateOutcome[];

/** True for a {@link CandidatesJob}. */
export function isCandidatesJob(job: EngineJob): job is CandidatesJob {
  return typeof job === 'object' && job !== null && 'candidatesOf' in job;
}

/** The job function of every worker: {@link runCandidates} for a candidates job, else {@link runAnalysis}. */
export function runEngineJob(job: EngineJob, control?: RunControl): EngineJobResult {
  return isCandidatesJob(job) ? runCandidates(job.candidatesOf, job.indices, control) : runAnalysis(job, control);
}

/** The error a job ends with when its caller cancels it (the same code the engine uses when it sees the signal). */
export function cancelledError(): KnotwiseError {
  return new KnotwiseError('cancelled', 'the computation was cancelled.');
}

/** True when `e` is the error of a cancelled run. */
export function isCancelled(e: unknown): boolean {
  return typeof e === 'object' && e !== null && (e as { code?: unknown }).code === 'cancelled';
}

/** Points of the invented series {@link warmUp} runs. */
export const WARM_UP_POINTS = 200;

/**
 * Runs the automatic choice once on a short invented series (a slow wave on a rising line with a
 * kink, plus a fixed pseudo-random noise), so that a freshly loaded worker has compiled the numerical
 * kernels before its first real job: a browser, like Node, compiles a function only once it has run
 * hot, and the first fit on a series otherwise pays for that. Measured in Node (fresh processes, the
 * automatic choice in one thread, three pairs at a load average of 1.2 to 1.8): on 5,000 points 3.3 to
 * 3.7 s as a first run, 2.0 to 2.5 s after this warm-up, which itself took 1.35 to 1.5 s; on 730
 * points 2.9 to 3.1 s, 1.8 to 2.0 s after it. The compilation is paid either way, but while the worker
 * waits for work (the pane loads its workers when it opens) instead of while the analyst waits for a
 * fit. Any error is swallowed: a warm-up never stops a worker from serving.
 *
 * @returns true when the choice ran to its end, false when it failed (the worker serves all the same)
 */
export function warmUp(): boolean {
  try {
    return runAnalysis(warmUpRequest()).comparison !== undefined;
  } catch {
    // a warm-up that fails changes nothing: the worker serves as it would have
    return false;
  }
}

/** The request {@link warmUp} runs: the automatic choice on {@link WARM_UP_POINTS} invented points. */
export function warmUpRequest(): AnalysisRequest {
  const n = WARM_UP_POINTS;
  const x = new Array<number>(n), y = new Array<number>(n);
  let s = 12345;
  for (let i = 0; i < n; i++) {
    s = (Math.imul(s, 1103515245) + 12345) >>> 0;
    x[i] = i + 1;
    y[i] = 0.02 * i + Math.sin(i / 12) + (i > 120 ? -0.05 * (i - 120) : 0) + 0.3 * (s / 4294967296 - 0.5);
  }
  return { analysis: 'auto', y, x };
}
