/**
 * Node worker threads as a pool's workers (the command line, tests and
 * benchmarks). `file` is a compiled JavaScript worker entry, e.g.
 * threadWorker.js beside this file.
 */
import * as os from 'os';
import { Worker } from 'worker_threads';
import { WorkerFactory, WorkerPool, poolSize } from '../pool';

export interface ThreadOptions {
  /** Options of `new Worker` (e.g. execArgv, eval). */
  workerOptions?: ConstructorParameters<typeof Worker>[1];
  /** Loaded threads kept in reserve to replace a cancelled job's thread at once (default 0). */
  spares?: number;
}

/** A factory of worker threads running `file`. */
export function threadFactory(file: string, options: ThreadOptions = {}): WorkerFactory {
  return (onMessage, onFailure) => {
    const w = new Worker(file, options.workerOptions);
    w.on('message', onMessage);
    w.on('error', onFailure);
    w.on('exit', (code) => onFailure(new Error(`the worker thread exited (code ${code})`)));
    return { postMessage: (m) => w.postMessage(m), terminate: () => w.terminate() };
  };
}

/** A pool of worker threads, one per core (at most 4) unless `size` is given. Close it when done: live threads keep the process running. */
export function threadPool<Req, Res>(file: string, size = poolSize(os.cpus().length), options?: ThreadOptions): WorkerPool<Req, Res> {
  return new WorkerPool<Req, Res>(threadFactory(file, options), size, options?.spares ?? 0);
}
