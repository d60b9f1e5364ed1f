/**
 * Entry of the browser analysis worker (bundled as analysis-worker.js): runs
 * each posted job through `runEngineJob` (an analysis, or some candidates of an automatic choice) off the page's thread and posts
 * progress, then the result or the error.
 */
import { runEngineJob } from '../engineEntry';
import { serveJobs } from '../serveJobs';
import type { RunMessage } from '../protocol';

const scope = self as unknown as { postMessage(m: unknown): void; onmessage: ((e: { data: RunMessage<never> }) => void) | null };
const handle = serveJobs(runEngineJob, (m) => scope.postMessage(m));
scope.onmessage = (e) => handle(e.data);
scope.postMessage({ type: 'ready' });
