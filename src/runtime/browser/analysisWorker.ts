/**
 * Entry of the browser analysis worker (bundled as analysis-worker.js): runs
 * each posted job through `runEngineJob` (an analysis, or some candidates of an automatic choice) off the page's thread and posts
 * progress, then the result or the error. Once loaded it runs {@link warmUp} before it says it is ready.
 */
import { runEngineJob, warmUp } from '../engineEntry';
import { serveJobs } from '../serveJobs';
import type { RunMessage } from '../protocol';

const scope = self as unknown as { postMessage(m: unknown): void; onmessage: ((e: { data: RunMessage<never> }) => void) | null };
const handle = serveJobs(runEngineJob, (m) => scope.postMessage(m));
scope.onmessage = (e) => handle(e.data);
// compile the kernels before the first job (a job posted meanwhile is read once this script has run)
warmUp();
scope.postMessage({ type: 'ready' });
