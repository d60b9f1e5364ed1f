/**
 * Turns a block of selected cells and the pane's choices into engine calls.
 * This is the one place the pane computes; what it shows is made from the
 * returned results by view.ts. No numerics here: the engine fits, checks and
 * warns.
 */
import { Cell, Comparison, FitResult, Series, SeriesBreaks, SeriesFit, evaluateAnalysis, numberFromText } from '../engine';
import { AnalysisRequest, AnalysisResult, runAnalysis } from '../runtime/engineEntry';
import type { BreaksResult, CropsRow } from '../engine/breaks/types';
import type { CellBlock } from './workbook';
import { MethodChoice, methodChoices, ruleOptions } from './methodChoices';

/** Runs one analysis request: the page's worker pool in the pane, or this thread by default. */
export type Compute = (request: AnalysisRequest) => Promise<AnalysisResult>;
const asFit = (o: AnalysisResult): SeriesFit & { result: FitResult } => ({ series: o.series, result: o.smooth! });
const asBreaks = (o: AnalysisResult): SeriesBreaks => ({ series: o.series, result: o.breaks! });

/** A method of the pane's list ({@link methodChoices}): generated from the engine's declarations. */
export type Choice = MethodChoice;

/** How the penalty is set: 'auto' (the method's default), one of its declared rules, 'df' or 'value'. */
export interface PenaltyChoice {
  rule: string;
  value?: number;
}

/** The list entry with this value (e.g. 'trend1', 'spline', 'breaks-level'). */
export function choiceOf(value: string): Choice {
  const c = methodChoices().find((m) => m.value === value);
  if (!c) throw new Error(`no method "${value}" in the list.`);
  return c;
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

/** The selection as the analysis read it. */
export type Selection = ReturnType<typeof splitSelection>;

/** What the engine returned for one run: results in the engine's own shapes, with the series they refer to. */
export type Analysis =
  | { kind: 'smooth'; choice: Choice; sel: Selection; series: Series; result: FitResult;
      /** The fitted curve continued after the last point (an extrapolation), when the method defines it. */
      beyond?: { x: number[]; y: number[] };
      /** The automatic choice's comparison of methods, when the method was 'auto'. */
      comparison?: Comparison }
  | { kind: 'breaks'; choice: Choice; sel: Selection; series: Series; result: BreaksResult;
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
  const request = (extra: Record<string, unknown> = {}): AnalysisRequest => ({
    analysis: choice.analysis, family: choice.kind === 'smooth' ? 'smoother' : 'changepoints', y: sel.y, x: sel.x, w: sel.w,
    options: { ...choice.options, ...ruleOptions(pen.rule, pen.value), ...extra },
  });
  if (choice.kind === 'smooth') {
    const answer = yield request();
    const { series, result } = asFit(answer);
    const n = series.n;
    const span = series.x[n - 1] - series.x[0];
    const from = series.x[n - 1], to = from + 0.08 * span;
    const xs = Array.from({ length: 12 }, (_, i) => from + ((to - from) * i) / 11);
    let beyond: { x: number[]; y: number[] } | undefined;
    try {
      beyond = span > 0 ? { x: xs, y: Array.from(evaluateAnalysis(answer, xs).value) } : undefined;
    } catch {
      beyond = undefined; // a method without values beyond the data (wavelets): nothing drawn there
    }
    return { kind: 'smooth', choice, sel, series, result, beyond, comparison: answer.comparison };
  }
  const { series, result } = asBreaks(yield request());
  // The penalty path around the chosen penalty (CROPS), so the analyst sees changes against cost.
  // The slope model's exact search is costly, so its path is drawn on shorter series only.
  let path: CropsRow[] | undefined;
  if (choice.analysis !== 'slope' || series.n <= 2000) {
    const beta = result.penalty.value;
    if (beta > 0 && Number.isFinite(beta)) path = asBreaks(yield request({ penaltyRange: [beta / 10, beta * 10] })).result.crops ?? [];
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
