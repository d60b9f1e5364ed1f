/**
 * The engine entry every runtime runs, {@link runAnalysis}: a request in, a
 * plain structured-clone-able result out, with progress reports and a
 * cancellation signal; and the key under which equal requests share a result.
 * Re-exported here so the runtime's hosts (Web Workers, Node worker threads)
 * import one place, with the error a cancelled job ends with.
 */
import { KnotwiseError } from '../engine/errors';

export { runAnalysis, analysisKey } from '../engine';
export type { AnalysisRequest, AnalysisResult, Progress, RunControl } from '../engine';

/** The error a job ends with when its caller cancels it (the same code the engine uses when it sees the signal). */
export function cancelledError(): KnotwiseError {
  return new KnotwiseError('cancelled', 'the computation was cancelled.');
}

/** True when `e` is the error of a cancelled run. */
export function isCancelled(e: unknown): boolean {
  return typeof e === 'object' && e !== null && (e as { code?: unknown }).code === 'cancelled';
}
