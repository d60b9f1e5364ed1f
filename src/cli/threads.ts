/**
 * Several --y columns spread over worker threads, one column per job, at most
 * one thread per core (and no more threads than columns). The results come
 * back in the columns' order; when columns fail, the first failing one in
 * order is reported, exactly as the in-order run would report it (which stops
 * there), and the other jobs are stopped.
 */
import * as os from 'os';
import * as path from 'path';
import { WorkerPool } from '../runtime/pool';
import { threadFactory, ThreadOptions } from '../runtime/node/threadPool';
import { CliError } from './csv';
import type { ColumnOutcome } from './columnWorker';
import { ColumnJob, runColumn } from './main';

/** Where the compiled worker entry lives (next to this file in dist/node). */
export const COLUMN_WORKER = path.join(__dirname, 'columnWorker.js');

export interface ThreadSettings {
  /** Threads to use at most (default: the number of cores). */
  threads?: number;
  /** Worker entry and its options (tests run the TypeScript sources through a loader). */
  file?: string;
  options?: ThreadOptions;
}

/** Runs the column jobs: on this thread when there is one column or one core, else in worker threads. */
export async function runColumnsInThreads(jobs: ColumnJob[], settings: ThreadSettings = {}): Promise<Record<string, unknown>[]> {
  const size = Math.min(jobs.length, settings.threads ?? os.cpus().length);
  if (size < 2) return jobs.map(runColumn);
  const pool = new WorkerPool<ColumnJob, ColumnOutcome>(threadFactory(settings.file ?? COLUMN_WORKER, settings.options), size);
  try {
    // Every job's outcome is caught at once (a later column may fail while an earlier one still runs).
    const settled = jobs.map((j) => pool.run(j).promise.then((o) => ({ o }), (e: unknown) => ({ e })));
    const outcomes: ColumnOutcome[] = [];
    for (const s of settled) {
      // In order: the first failure (or usage error) ends the run; close() below stops the rest.
      const r = await s;
      if ('e' in r) throw r.e;
      if ('usage' in r.o) throw new CliError(r.o.usage.message, r.o.usage.exitCode);
      outcomes.push(r.o);
    }
    return outcomes.map((o) => (o as { record: Record<string, unknown> }).record);
  } finally {
    pool.close();
  }
}
