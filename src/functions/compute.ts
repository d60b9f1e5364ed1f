/**
 * Where the worksheet functions send their requests: the page's one runtime
 * (src/runtime), a pool of Web Workers in Excel's shared runtime and the
 * preview, or this thread where there are no workers (tests, Node). Its
 * client shares jobs between equal requests, keeps finished results, forgets
 * failures, and stops a job only when no call waits on it; this file only
 * turns Excel's cancelable invocation into the client's abort signal.
 */
import type { AnalysisRequest, AnalysisResult } from '../engine';
import { pageRuntime } from '../runtime/browser/pageRuntime';

/** Lets a caller stop waiting; Excel's cancelable invocation fits. */
export interface Cancel {
  onCanceled?: () => void;
}

/** Answers a request through the page's runtime; Excel's cancel aborts this call's wait. */
export function compute(request: AnalysisRequest, cancel?: Cancel): Promise<AnalysisResult> {
  const stop = new AbortController();
  if (cancel) cancel.onCanceled = () => stop.abort();
  return pageRuntime().client.compute(request, { signal: stop.signal });
}

/** Empties the runtime's cache of finished results (tests, and the pane after edits). */
export function clearComputeCache(): void {
  pageRuntime().client.clear();
}

/** Number of requests held: finished ones kept and jobs still running. */
export function computeCacheSize(): number {
  const c = pageRuntime().client;
  return c.size + c.pending;
}
