/**
 * The one entry every front calls: a plain request in, a plain result out.
 * It validates the request once (shape, analysis name, options against the
 * analysis's declarations), takes the data in ({@link prepareSeries}), runs
 * the analysis and returns a structured-clone-able {@link AnalysisResult}, so
 * the same call runs in Node, in a browser page, in a Web Worker and in a
 * Node worker thread.
 */
import '../analyses';
import { KnotwiseError } from '../errors';
import { describeValue } from '../options';
import { Cell, prepareSeries, toColumn } from '../series';
import { STANDING_CAVEATS, warning } from '../warnings';
import { cacheKey } from '../cache/fitCache';
import type { AnalysisFamily, AnalysisResult } from './analysisDefinition';
import type { Evaluation } from '../types';
import { findAnalysis } from './analysisRegistry';
import type { RunControl } from './optionDeclaration';
import { resolveOptions } from './resolveOptions';
import { RunContext } from './runContext';
import { seasonForSmoothing } from '../decompose/seasonForSmoothing';
import { defaultSmoother } from '../smoothers/auto';

/** What to analyse: the data as cells (numbers, text, blanks, errors, booleans) and the options as typed. */
export interface AnalysisRequest {
  /**
   * A registered analysis name: 'spline', 'trend', 'level', ... (case-insensitive). Omitted or blank: the
   * default smoother for these options ({@link defaultSmoother}: the automatic choice, or the spline for
   * settings only the spline takes, with a note); not with the changepoint family.
   */
  analysis?: string;
  /** The values, one cell per row (a single row or column; a 1-column 2-D block is accepted). */
  y: readonly Cell[] | readonly (readonly Cell[])[];
  /** Positions, same length as y; omitted: 1, 2, 3, ... */
  x?: readonly Cell[] | readonly (readonly Cell[])[] | null;
  /** Positive weights, same length as y; omitted: all 1. */
  w?: readonly Cell[] | readonly (readonly Cell[])[] | null;
  /** Options by declared name (any spelling; see resolveOptions). */
  options?: Readonly<Record<string, unknown>>;
  /** Refuse an analysis of another family (a changepoint model asked of a smoothing function). */
  family?: AnalysisFamily;
}

function column(v: unknown, name: string): Cell[] {
  if (!Array.isArray(v)) throw new KnotwiseError('shape-mismatch', `${name} must be a range of cells (a column or a row); got ${describeValue(v)}.`);
  return toColumn(v as Cell[] | Cell[][], name);
}

/**
 * Runs one analysis.
 *
 * @param request - see {@link AnalysisRequest}
 * @param control - `onProgress` receives {fraction, stage} at most every 50 ms; `signal.aborted` stops the run with a `cancelled` error
 * @throws {@link KnotwiseError} for unknown analyses, bad options, unusable data, or cancellation
 * @example
 * ```ts
 * const r = runAnalysis({ analysis: 'trend', y: orders, x: weeks, options: { order: 1, rule: 'cv' } });
 * r.smooth!.knots; r.fitted; r.warnings; r.caveats;
 * ```
 */
export function runAnalysis(request: AnalysisRequest, control: RunControl = {}): AnalysisResult {
  if (typeof request !== 'object' || request === null) throw new KnotwiseError('bad-option', `a request must name an analysis and give y; got ${describeValue(request)}.`);
  const chosen = defaultFor(request);
  const { def, renamedFrom } = findAnalysis(chosen.name, request.family);
  const { options, notes } = resolveOptions(def.options, request.options, def.name);
  if (chosen.note) notes.unshift(warning('note', chosen.note));
  if (renamedFrom) notes.unshift(warning('note', `"${renamedFrom}" is now called "${def.name}"; the old name is still accepted for now.`));
  const context = new RunContext(control);
  context.step(0, 'reading the data');
  const y = column(request.y, 'y');
  const x = request.x === undefined || request.x === null ? null : column(request.x, 'x');
  const w = request.w === undefined || request.w === null ? null : column(request.w, 'weights');
  let series = prepareSeries(y, x, w, { ties: def.ties, minPoints: def.minPoints(options), method: def.name });
  if (def.family === 'smoother' && options.season === 'auto') {
    context.step(0, 'checking for a season');
    const adj = seasonForSmoothing(series);
    series = adj.series;
    notes.push(...adj.notes);
  }
  const core = def.run(series, options, context);
  context.step(1, 'done');
  const all = [...notes, ...core.warnings];
  return {
    ...core, warnings: all.filter((w) => !STANDING_CAVEATS.has(w.code)), caveats: all.filter((w) => STANDING_CAVEATS.has(w.code)),
    analysis: def.name, family: def.family, options, series,
  };
}

/** Whether the request names its analysis (not omitted, not blank). Unchecked. */
function named(request: AnalysisRequest): boolean {
  return !(request.analysis === undefined || request.analysis === null || (typeof request.analysis === 'string' && request.analysis.trim() === ''));
}

/** The analysis to run: the one named, or the default smoother for the request's options. */
function defaultFor(request: AnalysisRequest): { name: string; note?: string } {
  if (named(request)) return { name: request.analysis as string };
  if (request.family && request.family !== 'smoother') throw new KnotwiseError('unknown-method', `name a ${request.family === 'changepoints' ? 'changepoint model' : 'method'}: only smoothers have a default.`);
  return defaultSmoother(() => request.options);
}

/**
 * A key naming a request's answer: equal keys, equal results (up to a 53-bit
 * hash collision). Analyses are keyed by their current name (old names alike);
 * `family` is not part of the key, since it only restricts which names are
 * accepted (callers check it before looking up a shared answer). Options are
 * keyed as given, so spellings that resolve alike may still get different
 * keys; that only costs a recomputation.
 */
export function analysisKey(request: AnalysisRequest): string {
  let name = named(request) ? String(request.analysis).trim().toLowerCase() : '';
  try { name = findAnalysis(defaultFor(request).name).def.name; } catch { /* an unknown name keys as typed; running it reports the error */ }
  return cacheKey(['analysis', name, request.y, request.x ?? null, request.w ?? null, request.options ?? {}]);
}

/**
 * Values of a smoother's fit at new x, flagged where they lie beyond the data
 * (an extrapolation, not a forecast).
 *
 * @throws {@link KnotwiseError} `bad-option` when the analysis has no curve to evaluate (changepoint models)
 * @example
 * ```ts
 * evaluateAnalysis(runAnalysis({ analysis: 'spline', y }), [2.5, 40]).value;
 * ```
 */
export function evaluateAnalysis(result: AnalysisResult, at: ArrayLike<number>): Evaluation {
  const { def } = findAnalysis(result.analysis);
  if (!def.evaluate) throw new KnotwiseError('bad-option', `"${def.name}" gives no curve to evaluate at new x; use a smoothing method.`);
  return def.evaluate(result, Float64Array.from(at));
}
