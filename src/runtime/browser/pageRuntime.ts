/**
 * The page's analysis runtime: one pool of Web Workers and one cache of
 * results, shared by the task pane and the worksheet functions (in Excel's
 * shared runtime they run on one page; the runtime is kept on the page's
 * global object, so every bundle loaded into that page finds the same one).
 *
 * The worker code is its own bundle, analysis-worker.js, next to the bundle
 * that loaded this module.
 */
import { AnalysisClient, ComputeOptions } from '../client';
import { AnalysisRequest, AnalysisResult, EngineJob, EngineJobResult, analysisKey, runAnalysis } from '../engineEntry';
import { inlineSubmit } from '../inlineRunner';
import { WorkerPool, poolSize } from '../pool';
import { poolSubmit } from '../poolSubmit';

/** File name of the worker bundle (webpack entry 'analysis-worker'). */
export const WORKER_FILE = 'analysis-worker.js';

/** The page's runtime. */
export interface PageRuntime {
  client: AnalysisClient<AnalysisRequest, AnalysisResult>;
  /** Null where the host has no Web Workers (jobs then run on the page's thread). */
  pool: WorkerPool<EngineJob, EngineJobResult> | null;
  workerUrl: string | null;
}

// Captured while the bundle's script runs; later document.currentScript is null.
const loadedFrom: string | null = (() => {
  try {
    const s = typeof document !== 'undefined' ? (document.currentScript as HTMLScriptElement | null) : null;
    if (s && s.src) return s.src;
    return typeof location !== 'undefined' ? location.href : null;
  } catch {
    return null;
  }
})();

const KEY = Symbol.for('knotwise.pageRuntime');

function create(): PageRuntime {
  if (typeof Worker === 'undefined' || loadedFrom === null) {
    return { client: new AnalysisClient(inlineSubmit(runAnalysis), analysisKey), pool: null, workerUrl: null };
  }
  const workerUrl = new URL(WORKER_FILE, loadedFrom).href;
  const size = poolSize(typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : 1);
  const pool = new WorkerPool<EngineJob, EngineJobResult>((onMessage, onFailure) => {
    const w = new Worker(workerUrl);
    w.onmessage = (e) => onMessage(e.data);
    w.onerror = (e) => { e.preventDefault?.(); onFailure(new Error(e.message || `could not run ${workerUrl}`)); };
    w.onmessageerror = () => onFailure(new Error('a message from the worker could not be read'));
    return w;
  }, size, 1); // one loaded worker in reserve, so Cancel leaves the pool ready at once
  // the automatic choice runs its candidates on the workers side by side (poolSubmit)
  const client = new AnalysisClient<AnalysisRequest, AnalysisResult>(poolSubmit(pool), analysisKey);
  return { client, pool, workerUrl };
}

/** The page's one runtime, made on first use. */
export function pageRuntime(): PageRuntime {
  const g = globalThis as unknown as Record<symbol, PageRuntime | undefined>;
  return (g[KEY] ??= create());
}

/** Runs an analysis off the page's thread (shared cache, shared pool). */
export function compute(request: AnalysisRequest, options?: ComputeOptions): Promise<AnalysisResult> {
  return pageRuntime().client.compute(request, options);
}
