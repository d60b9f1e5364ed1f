/**
 * The one analysis entry every runtime runs: a request (which analysis, the
 * cells, the options) in, a plain structured-clone-able result out, with
 * progress reports and a cancellation signal.
 *
 * This adapter gives that entry's shape over today's engine calls (`fitCells`
 * for smoothers, `breaksFromCells` for changepoints). It reports progress when
 * it starts and when it ends only, and checks the signal before it starts; the
 * engine's own entry reports and checks at each grid point, fold and iteration
 * batch. Cancelling a running job never depends on the signal here: the pool
 * terminates the worker that runs it.
 */
import { Cell, ErrorCode, KnotwiseError, SeriesBreaks, SeriesFit, breaksFromCells, cacheKey, fitCells } from '../engine';
import type { BreaksOptions } from '../engine/breaks/types';

/** What to analyse: the analysis name ('spline', 'trend', 'breaks'), the cells and the options. */
export interface AnalysisRequest {
  analysis: string;
  y: Cell[];
  x?: Cell[] | null;
  w?: Cell[] | null;
  options?: Record<string, unknown>;
}

/** A progress report: the share done (0..1) and the stage in plain words. */
export interface Progress {
  fraction: number;
  stage: string;
}

/** How a caller follows and stops a run. */
export interface RunControl {
  onProgress?: (p: Progress) => void;
  signal?: { readonly aborted: boolean };
}

/** The result of an analysis: a smoother's fit or a segmentation, with the series it was made from. */
export type AnalysisResult =
  | (SeriesFit & { analysis: string; kind: 'fit' })
  | (SeriesBreaks & { analysis: 'breaks'; kind: 'breaks' });

/** The error a cancelled run ends with. */
export function cancelledError(): KnotwiseError {
  return new KnotwiseError('cancelled' as ErrorCode, 'the computation was cancelled.');
}

/** True when `e` is the error of a cancelled run. */
export function isCancelled(e: unknown): boolean {
  return typeof e === 'object' && e !== null && (e as { code?: unknown }).code === 'cancelled';
}

/**
 * Runs one analysis synchronously.
 * @throws KnotwiseError from the engine; code 'cancelled' when the signal is seen aborted.
 */
export function runAnalysis(request: AnalysisRequest, control: RunControl = {}): AnalysisResult {
  if (control.signal?.aborted) throw cancelledError();
  control.onProgress?.({ fraction: 0, stage: `${request.analysis}: started` });
  const options = { ...(request.options ?? {}) };
  let out: AnalysisResult;
  if (request.analysis === 'breaks') {
    out = { ...breaksFromCells(request.y, request.x, request.w, options as unknown as BreaksOptions), analysis: 'breaks', kind: 'breaks' };
  } else {
    out = { ...fitCells(request.y, request.x, request.w, { ...options, method: request.analysis }), analysis: request.analysis, kind: 'fit' };
  }
  if (control.signal?.aborted) throw cancelledError();
  control.onProgress?.({ fraction: 1, stage: `${request.analysis}: done` });
  return out;
}

/** A cache key of a request: equal analyses, cells and options give equal keys. */
export function analysisKey(request: AnalysisRequest): string {
  return cacheKey([request.analysis, request.y, request.x ?? null, request.w ?? null, request.options ?? {}]);
}
