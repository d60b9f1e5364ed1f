/**
 * Where the worksheet functions send their requests. By default the engine
 * runs in this thread; the add-in's runtime replaces it with a pool of
 * workers ({@link useCompute}), so no calculation blocks Excel. Requests with
 * equal data and options share one job while it runs and one result after (a
 * small cache), so ten functions over one range compute once; the job is
 * stopped only when every call waiting on it has been cancelled.
 */
import { AnalysisRequest, AnalysisResult, FitCache, analysisKey, runAnalysis } from '../engine';

/** Lets a caller stop waiting; Excel's cancelable invocation fits. */
export interface Cancel {
  onCanceled?: () => void;
}

/** Something that answers requests; it stops the job when `signal` aborts. */
export type Compute = (request: AnalysisRequest, signal: AbortSignal) => Promise<AnalysisResult>;

/** Runs the engine in this thread (tests, the CLI, and hosts without workers). */
export const computeHere: Compute = async (request, signal) => runAnalysis(request, { signal });

interface Job {
  result: Promise<AnalysisResult>;
  stop: AbortController;
  waiting: number;
  done: boolean;
}

let current: Compute = computeHere;
const cache = new FitCache<Job>(32);

/** Replaces how requests are answered (the runtime installs its worker pool); clears the cache. */
export function useCompute(c: Compute): void {
  current = c;
  cache.clear();
}

/**
 * Answers a request, sharing the job with identical requests. A failed job
 * is forgotten so a recalculation tries again; a cancelled call stops the job
 * when no other call still waits on it.
 */
export function compute(request: AnalysisRequest, cancel?: Cancel): Promise<AnalysisResult> {
  const key = analysisKey(request);
  const job = cache.get(key, () => {
    const stop = new AbortController();
    const j: Job = { result: Promise.resolve().then(() => current(request, stop.signal)), stop, waiting: 0, done: false };
    j.result.then(() => { j.done = true; }, () => { j.done = true; cache.delete(key); });
    return j;
  });
  job.waiting++;
  if (cancel) {
    cancel.onCanceled = () => {
      job.waiting--;
      if (job.waiting <= 0 && !job.done) { job.stop.abort(); cache.delete(key); }
    };
  }
  return job.result;
}

/** Empties the shared cache (tests, and the pane after edits). */
export function clearComputeCache(): void {
  cache.clear();
}

/** Number of requests held. */
export function computeCacheSize(): number {
  return cache.size;
}
