/**
 * Runs jobs on the calling thread, one task later, for hosts without workers
 * (Node tests of the fronts, a JavaScript-only functions runtime). Same job
 * handles as the pool; a job cancelled before it starts never runs, one that
 * has started runs to its end (nothing can interrupt it on this thread).
 */
import { Progress, RunControl, cancelledError } from './engineEntry';
import type { JobHandle } from './pool';

let nextId = 1;

export function inlineSubmit<Req, Res>(run: (request: Req, control: RunControl) => Res): (request: Req, onProgress: (p: Progress) => void) => JobHandle<Res> {
  return (request, onProgress) => {
    const id = nextId++;
    let cancelled = false;
    let started = false;
    let rejectNow: (e: unknown) => void = () => undefined;
    const promise = new Promise<Res>((resolve, reject) => {
      rejectNow = reject;
      setTimeout(() => {
        if (cancelled) return;
        started = true;
        try {
          resolve(run(request, { onProgress, signal: { get aborted() { return cancelled; } } }));
        } catch (e) {
          reject(e);
        }
      }, 0);
    });
    return {
      id,
      promise,
      cancel: () => {
        if (started || cancelled) return;
        cancelled = true;
        rejectNow(cancelledError());
      },
    };
  };
}
