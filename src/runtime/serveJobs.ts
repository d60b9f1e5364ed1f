/**
 * The inside of a worker, whatever hosts it (a browser Worker or a Node worker
 * thread): runs each `run` message through a synchronous job function and
 * posts progress, then the result or the error. A job is synchronous, so the
 * worker reads no message while it runs; cancelling means terminating it.
 */
import type { Progress, RunControl } from './engineEntry';
import { RunMessage, WorkerMessage, errorToWire } from './protocol';

/** Least time between two progress messages of one job, in ms (the first and the last always go). */
export const PROGRESS_INTERVAL_MS = 25;

/** A message handler for a worker; `post` sends one message back to the caller. */
export function serveJobs<Req, Res>(run: (request: Req, control: RunControl) => Res, post: (m: WorkerMessage<Res>) => void): (m: RunMessage<Req>) => void {
  return (m) => {
    if (!m || m.type !== 'run') return;
    const id = m.id;
    let last = -Infinity;
    const onProgress = (progress: Progress) => {
      const now = Date.now();
      if (now - last < PROGRESS_INTERVAL_MS && progress.fraction < 1) return;
      last = now;
      post({ type: 'progress', id, progress: { fraction: progress.fraction, stage: progress.stage } });
    };
    let result: Res;
    try {
      result = run(m.request, { onProgress, signal: { aborted: false } });
    } catch (e) {
      post({ type: 'error', id, error: errorToWire(e) });
      return;
    }
    try {
      post({ type: 'result', id, result });
    } catch (e) {
      post({ type: 'error', id, error: errorToWire(e) });
    }
  };
}
