/**
 * Entry of a command-line worker thread (compiled to columnWorker.js): runs
 * one column's analysis per job. A usage error (CliError) travels as a value
 * so that its exit code survives the crossing.
 */
import { parentPort } from 'worker_threads';
import { serveJobs } from '../runtime/serveJobs';
import { CliError } from './csv';
import { ColumnJob, runColumn } from './main';

/** What a column job sends back. */
export type ColumnOutcome = { record: Record<string, unknown> } | { usage: { message: string; exitCode: number } };

export function runColumnJob(job: ColumnJob): ColumnOutcome {
  try {
    return { record: runColumn(job) };
  } catch (e) {
    if (e instanceof CliError) return { usage: { message: e.message, exitCode: e.exitCode } };
    throw e;
  }
}

if (parentPort) {
  const port = parentPort;
  port.on('message', serveJobs(runColumnJob, (m) => port.postMessage(m)));
  port.postMessage({ type: 'ready' });
}
