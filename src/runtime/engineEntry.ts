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
