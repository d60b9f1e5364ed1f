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
import { Cell, Series, prepareSeries, toColumn } from '../series';
import { STANDING_CAVEATS, Warning, warning } from '../warnings';
import { cacheKey } from '../cache/fitCache';
import type { AnalysisDefinition, AnalysisFamily, AnalysisResult, CandidateOutcome } from './analysisDefinition';
import type { Evaluation } from '../types';
import { findAnalysis } from './analysisRegistry';
import type { ResolvedOptions, RunControl } from './optionDeclaration';
import { resolveOptions } from './resolveOptions';
import { RunContext } from './runContext';
import { seasonForSmoothing } from '../decompose/seasonForSmoothing';
import { DEFAULT_SMOOTHER, autoCandidates, candidateOutcome, defaultSmoother, noComparisonReason } from '../smoothers/auto';

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
  /**
   * The automatic choice only: candidates already computed by {@link runCandidates} on other workers
   * (from the same cells and options), used instead of computing them again; any missing one is
   * computed. Not part of the request's key: the answer is the same with or without them.
   */
  candidates?: readonly CandidateOutcome[];
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
  const { def, options, notes, series, context } = prepare(request, control);
  if (request.candidates !== undefined) {
    if (!Array.isArray(request.candidates)) throw new KnotwiseError('bad-option', `candidates must be a list of the automatic choice's computed candidates; got ${describeValue(request.candidates)}.`);
    context.candidates = new Map(request.candidates.map((o) => [o.index, o]));
  }
  const core = def.run(series, options, context);
  context.step(1, 'done');
  const all = [...notes, ...core.warnings];
  return {
    ...core, warnings: all.filter((w) => !STANDING_CAVEATS.has(w.code)), caveats: all.filter((w) => STANDING_CAVEATS.has(w.code)),
    analysis: def.name, family: def.family, options, series,
  };
}

/** Validation and intake shared by {@link runAnalysis} and {@link runCandidates}: the analysis, its options and notes, the clean series (season taken out where asked). */
function prepare(request: AnalysisRequest, control: RunControl): { def: AnalysisDefinition; options: ResolvedOptions; notes: Warning[]; series: Series; context: RunContext } {
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
  return { def, options, notes, series, context };
}

/**
 * Some candidates of an automatic choice, each computed as {@link runAnalysis} would within the
 * choice (same intake, same season step, same folds), for a runtime that spreads the candidates
 * over several workers and then passes every outcome to {@link runAnalysis} in `request.candidates`,
 * which makes the one choice. Nothing is computed where the choice compares no methods (the series
 * is too short or too long); the choice then says why.
 *
 * @param request - a request that runs the automatic choice (named 'auto', or no method with settings it takes)
 * @param indices - positions in the fixed list of candidates ({@link autoSplit} gives them)
 * @throws {@link KnotwiseError} as {@link runAnalysis} for the request; `bad-option` when it is not an automatic choice or an index is not a candidate's
 * @example
 * ```ts
 * const parts = autoSplit(request)!; // e.g. [4, 3, 9, ...], costliest first
 * const done = parts.flatMap((i) => runCandidates(request, [i])); // each on a worker
 * runAnalysis({ ...request, candidates: done });
 * ```
 */
export function runCandidates(request: AnalysisRequest, indices: readonly number[], control: RunControl = {}): CandidateOutcome[] {
  // the positions first: they cost nothing to check, the intake below reads every cell
  const list = autoCandidates();
  if (!Array.isArray(indices)) throw new KnotwiseError('bad-option', `indices must be a list of candidate positions; got ${describeValue(indices)}.`);
  for (const i of indices) if (!(Number.isInteger(i) && i >= 0 && i < list.length)) throw new KnotwiseError('bad-option', `candidate ${describeValue(i)} does not exist: positions run from 0 to ${list.length - 1}.`);
  const { def, options, series, context } = prepare(request, control);
  if (def.name !== DEFAULT_SMOOTHER) throw new KnotwiseError('bad-option', `candidates are computed for the automatic choice only; this request runs "${def.name}".`);
  if (noComparisonReason(series.n, options.folds as number)) return [];
  return indices.map((i, j) => context.part(j / indices.length, (j + 1) / indices.length, () => candidateOutcome(series, options, context, i, list)));
}

/**
 * How a runtime with several workers may split a request: for an automatic choice that will compare
 * methods, the positions of its candidates costliest first (each one a job for {@link runCandidates},
 * then one {@link runAnalysis} with them all); null for any other request, which runs as one job
 * (a request with errors too: that job reports them). Candidates the series is too long for are left
 * out (the choice lists them as not compared at no cost).
 *
 * @example
 * ```ts
 * autoSplit({ y: weekly });          // [4, 3, 9, 8, ...]
 * autoSplit({ analysis: 'spline', y: weekly }); // null
 * ```
 */
export function autoSplit(request: AnalysisRequest): number[] | null {
  let rows: number, folds: number;
  try {
    if (typeof request !== 'object' || request === null || request.candidates !== undefined) return null;
    const { def } = findAnalysis(defaultFor(request).name, request.family);
    if (def.name !== DEFAULT_SMOOTHER) return null;
    folds = resolveOptions(def.options, request.options, def.name).options.folds as number;
    rows = column(request.y, 'y').length;
  } catch {
    return null;
  }
  // the cells are at least the points: a range too long or too short compares nothing
  if (noComparisonReason(rows, folds)) return null;
  const list = autoCandidates();
  return list.map((c, i) => ({ i, cost: c.v.cost ?? 1, out: c.v.maxPoints !== undefined && rows > c.v.maxPoints }))
    .filter((c) => !c.out)
    .sort((a, b) => b.cost - a.cost || a.i - b.i)
    .map((c) => c.i);
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
