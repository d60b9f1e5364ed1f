/**
 * How a page's (or a process's) analysis client submits to its worker pool, with the automatic
 * choice spread over the workers: its candidates are independent cross-validations on the same
 * folds, so each runs as its own job ({@link runCandidates}, the costliest first, as the engine
 * orders them in {@link autoSplit}), and one last job makes the choice from their outcomes
 * ({@link runAnalysis} with `candidates`), the same answer as one job would give. Any other request,
 * or any request on a pool of one worker, is one job as before.
 *
 * Progress is the mean of the candidates' own, then the last job's. Cancel stops every job of the
 * request; one candidate's failure stops the others and is the request's error.
 */
import { AnalysisRequest, AnalysisResult, CandidateOutcome, EngineJob, EngineJobResult, Progress, autoSplit, cancelledError } from './engineEntry';
import type { Submit } from './client';
import type { JobHandle, WorkerPool } from './pool';

/** Share of the progress bar given to the candidates (the choice itself is quick). */
const CANDIDATES_SHARE = 0.97;

/** The submit function of a client over `pool`. */
export function poolSubmit(pool: WorkerPool<EngineJob, EngineJobResult>): Submit<AnalysisRequest, AnalysisResult> {
  return (request, onProgress) => {
    const parts = pool.size >= 2 ? autoSplit(request) : null;
    if (!parts || parts.length < 2) return pool.run(request, onProgress) as JobHandle<AnalysisResult>;
    return splitChoice(pool, request, parts, onProgress);
  };
}

/** The automatic choice as one job per candidate, then the choice. */
function splitChoice(pool: WorkerPool<EngineJob, EngineJobResult>, request: AnalysisRequest, parts: number[], onProgress: (p: Progress) => void): JobHandle<AnalysisResult> {
  const fractions = new Float64Array(parts.length);
  let finished = 0;
  let stopped = false;
  let choice: JobHandle<EngineJobResult> | null = null;
  const report = (): void => {
    let sum = 0;
    for (let j = 0; j < fractions.length; j++) sum += fractions[j];
    onProgress({ fraction: (CANDIDATES_SHARE * sum) / parts.length, stage: `${finished} of ${parts.length} methods compared` });
  };
  const jobs = parts.map((i, j) => pool.run({ candidatesOf: request, indices: [i] }, (p) => { fractions[j] = p.fraction; report(); }));
  const stopAll = (): void => {
    for (const h of jobs) h.cancel();
    choice?.cancel();
  };
  const outcomes = jobs.map((h, j) => h.promise.then((v) => {
    fractions[j] = 1;
    finished++;
    report();
    return v as CandidateOutcome[];
  }));
  const promise = Promise.all(outcomes).then((outs) => {
    if (stopped) throw cancelledError();
    choice = pool.run({ ...request, candidates: outs.flat() }, (p) => onProgress({ fraction: CANDIDATES_SHARE + (1 - CANDIDATES_SHARE) * p.fraction, stage: p.stage }));
    return choice.promise as Promise<AnalysisResult>;
  });
  // a candidate that fails (or is cancelled) loses the whole answer: stop the others
  promise.catch(() => {
    stopped = true;
    stopAll();
  });
  return {
    id: jobs[0].id,
    promise,
    cancel: () => {
      stopped = true;
      stopAll();
    },
  };
}
