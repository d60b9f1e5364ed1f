/**
 * A worker thread for the pool tests: runs real engine jobs (analyses and candidates of an
 * automatic choice), plus two test jobs
 * ('spin' busy-waits for the given milliseconds, reporting progress;
 * 'crash' ends the thread).
 */
import { parentPort } from 'worker_threads';
import { serveJobs } from '../../src/runtime/serveJobs';
import { AnalysisRequest, EngineJob, RunControl, isCandidatesJob, runEngineJob } from '../../src/runtime/engineEntry';

const port = parentPort!;
function run(job: EngineJob, control: RunControl): unknown {
  if (isCandidatesJob(job)) return runEngineJob(job, control);
  const request: AnalysisRequest = job;
  if (request.analysis === 'spin') {
    const ms = Number(request.options?.ms ?? 0);
    const t0 = Date.now();
    let steps = 0;
    while (Date.now() - t0 < ms) {
      if (++steps % 100000 === 0) control.onProgress?.({ fraction: (Date.now() - t0) / ms, stage: 'spinning' });
    }
    return { spun: ms, thread: require('worker_threads').threadId };
  }
  if (request.analysis === 'crash') process.exit(3);
  return runEngineJob(request, control);
}
port.on('message', serveJobs(run, (m) => port.postMessage(m)));
port.postMessage({ type: 'ready' });
