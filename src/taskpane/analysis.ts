/**
 * Turns a block of selected cells and the pane's choices into engine calls.
 * This is the one place the pane computes; what it shows is made from the
 * returned results by view.ts. No numerics here: the engine fits, checks and
 * warns.
 */
import { Cell, FitOptions, FitResult, Series, SeriesBreaks, SeriesFit, evaluate, findAnalysis, numberFromText, ruleOptions } from '../engine';
import { AnalysisRequest, AnalysisResult, runAnalysis } from '../runtime/engineEntry';
import type { BreaksModel, BreaksOptions, BreaksResult, CropsRow } from '../engine/breaks/types';
import type { CellBlock } from './workbook';

/** Runs one analysis request: the page's worker pool in the pane, or this thread by default. */
export type Compute = (request: AnalysisRequest) => Promise<AnalysisResult>;
const asFit = (o: AnalysisResult): SeriesFit => ({ series: o.series, result: o.smooth! });
const asBreaks = (o: AnalysisResult): SeriesBreaks => ({ series: o.series, result: o.breaks! });

/** The pane's smoother options as a request with the declared option names (as fitCells translates them). */
function smoothRequest(sel: { y: Cell[]; x: Cell[] | null; w: Cell[] | null }, options: FitOptions): AnalysisRequest {
  const { method = 'spline', oneSE, select, relaxed, gridSize, ...rest } = options;
  const o: Record<string, unknown> = { ...rest };
  if (select !== undefined) o.rule = oneSE && String(select).toLowerCase() === 'cv' ? 'cv-simpler' : select;
  else if (oneSE) o.rule = 'cv-simpler';
  if (relaxed !== undefined) o.refit = relaxed;
  if (gridSize !== undefined) o.searchPoints = gridSize;
  return { analysis: method, family: 'smoother', y: sel.y, x: sel.x, w: sel.w, options: o };
}

/** The pane's changepoint options as a request: a number is the penalty, a word the rule, a range the penalty path. */
function breaksRequest(sel: { y: Cell[]; x: Cell[] | null; w: Cell[] | null }, bo: BreaksOptions): AnalysisRequest {
  const o: Record<string, unknown> = {};
  if (typeof bo.penalty === 'number') o.penalty = bo.penalty;
  else if (bo.penalty !== undefined) o.rule = bo.penalty;
  if (bo.crops) o.penaltyRange = bo.crops;
  return { analysis: findAnalysis(bo.model, 'changepoints').def.name, family: 'changepoints', y: sel.y, x: sel.x, w: sel.w, options: o };
}

export type Choice =
  | { kind: 'smooth'; method: 'spline' | 'trend'; order?: number }
  | { kind: 'breaks'; model: BreaksModel };

/** How the penalty is set: a rule, a df target or a fixed value. */
export interface PenaltyChoice {
  rule: 'auto' | 'gcv' | 'cv' | 'cv-1se' | 'sure' | 'bic' | 'mbic' | 'df' | 'value';
  value?: number;
}

/** Splits a selection into an optional header and the x, y columns (1 column: y; 2: x, y; 3: x, y, weights). */
export function splitSelection(block: CellBlock): { header: string[] | null; x: Cell[] | null; y: Cell[]; w: Cell[] | null; yName: string } {
  const v = block.values;
  const nc = v[0]?.length ?? 0;
  if (nc < 1 || nc > 3) throw new Error(`select one column (y), two (x then y) or three (x, y, weights); the selection ${block.address} has ${nc} columns.`);
  const yCol = nc === 1 ? 0 : 1;
  const isText = (c: unknown) => typeof c === 'string' && c.trim() !== '' && numberFromText(c) === undefined;
  const hasHeader = v.length > 1 && v[0].every(isText) && typeof v[1][yCol] === 'number';
  const body = hasHeader ? v.slice(1) : v;
  const col = (j: number) => body.map((r) => r[j] as Cell);
  return {
    header: hasHeader ? v[0].map(String) : null,
    x: nc >= 2 ? col(0) : null,
    y: col(yCol),
    w: nc === 3 ? col(2) : null,
    yName: hasHeader ? String(v[0][yCol]) : 'y',
  };
}

/** The pane's penalty choice as smoother options; rules a smoother lacks go to the engine, which refuses them by name. */
function penaltyOptions(p: PenaltyChoice): FitOptions {
  if (p.rule === 'auto') return {};
  if (p.rule === 'df') return { df: p.value };
  if (p.rule === 'value') return { penalty: p.value };
  return ruleOptions(p.rule);
}

/** The pane's penalty choice as changepoint options; rules segmentation lacks go to the engine, which refuses them by name. */
function breaksPenalty(p: PenaltyChoice): Pick<BreaksOptions, 'penalty'> {
  if (p.rule === 'auto') return {};
  return { penalty: p.rule === 'value' ? p.value : (p.rule as BreaksOptions['penalty']) };
}

/** The selection as the analysis read it. */
export type Selection = ReturnType<typeof splitSelection>;

/** What the engine returned for one run: results in the engine's own shapes, with the series they refer to. */
export type Analysis =
  | { kind: 'smooth'; choice: Extract<Choice, { kind: 'smooth' }>; sel: Selection; series: Series; result: FitResult;
      /** The fitted curve continued after the last point (an extrapolation), when the method defines it. */
      beyond?: { x: number[]; y: number[] } }
  | { kind: 'breaks'; choice: Extract<Choice, { kind: 'breaks' }>; sel: Selection; series: Series; result: BreaksResult;
      /** The optimal segmentations for penalties around the chosen one (CROPS), for "why this penalty". */
      path?: CropsRow[] };

/** Runs the chosen analysis on a selection. Throws the engine's errors unchanged. */
/**
 * The chosen analysis as a sequence of engine requests: it yields each request
 * and receives its result, so one description runs on this thread
 * ({@link analyse}) or through the page's worker pool ({@link analyseWith}).
 */
function* steps(block: CellBlock, choice: Choice, pen: PenaltyChoice): Generator<AnalysisRequest, Analysis, AnalysisResult> {
  const sel = splitSelection(block);
  if (choice.kind === 'smooth') {
    const options: FitOptions = { method: choice.method, ...penaltyOptions(pen) };
    if (choice.method === 'trend') options.order = choice.order ?? 1;
    const { series, result } = asFit(yield smoothRequest(sel, options));
    const n = series.n;
    const span = series.x[n - 1] - series.x[0];
    const from = series.x[n - 1], to = from + 0.08 * span;
    const xs = Array.from({ length: 12 }, (_, i) => from + ((to - from) * i) / 11);
    const beyond = span > 0 ? { x: xs, y: Array.from(evaluate(result, xs).value) } : undefined;
    return { kind: 'smooth', choice, sel, series, result, beyond };
  }
  const bo: BreaksOptions = { model: choice.model, ...breaksPenalty(pen) };
  const { series, result } = asBreaks(yield breaksRequest(sel, bo));
  // The penalty path around the chosen penalty (CROPS), so the analyst sees changes against cost.
  // The slope model's exact search is costly, so its path is drawn on shorter series only.
  let path: CropsRow[] | undefined;
  if (choice.model !== 'slope' || series.n <= 2000) {
    const beta = result.penalty.value;
    path = asBreaks(yield breaksRequest(sel, { ...bo, crops: [beta / 10, beta * 10] })).result.crops ?? [];
  }
  return { kind: 'breaks', choice, sel, series, result, path };
}

/** Runs the chosen analysis on a selection on this thread. Throws the engine's errors unchanged. */
export function analyse(block: CellBlock, choice: Choice, pen: PenaltyChoice): Analysis {
  const it = steps(block, choice, pen);
  let step = it.next();
  while (!step.done) step = it.next(runAnalysis(step.value));
  return step.value;
}

/** Runs the chosen analysis with each engine request answered by `compute` (the page's worker pool in the pane). */
export async function analyseWith(block: CellBlock, choice: Choice, pen: PenaltyChoice, compute: Compute): Promise<Analysis> {
  const it = steps(block, choice, pen);
  let step = it.next();
  while (!step.done) step = it.next(await compute(step.value));
  return step.value;
}
