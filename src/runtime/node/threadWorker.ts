/**
 * Entry of a Node worker thread that runs analyses (compiled to
 * threadWorker.js): the same job loop as the browser worker.
 */
import { parentPort } from 'worker_threads';
import { runEngineJob } from '../engineEntry';
import { serveJobs } from '../serveJobs';

if (!parentPort) throw new Error('threadWorker runs as a worker thread only.');
const port = parentPort;
port.on('message', serveJobs(runEngineJob, (m) => port.postMessage(m)));
port.postMessage({ type: 'ready' });
