/**
 * Turns a block of selected cells and the pane's choices into engine calls.
 * This is the one place the pane computes; what it shows is made from the
 * returned results by view.ts. No numerics here: the engine fits, checks and
 * warns.
 */
import { Cell, Comparison, FitResult, Series, SeriesBreaks, SeriesFit, evaluateAnalysis, numberFromText } from '../engine';
import { AnalysisRequest, AnalysisResult, isCancelled, runAnalysis } from '../runtime/engineEntry';
import type { BreaksResult, CropsRow } from '../engine/breaks/types';
import type { Warning } from '../engine/warnings';
import type { CellBlock } from './workbook';
import { MethodChoice, methodChoices, ruleOptions } from './methodChoices';

/**
 * Runs one analysis request: the page's worker pool in the pane, or this thread by default.
 * `second` is true for the fit drawn over the first for comparison.
 */
export type Compute = (request: AnalysisRequest, second?: boolean) => Promise<AnalysisResult>;
const asFit = (o: AnalysisResult): SeriesFit & { result: FitResult } => ({ series: o.series, result: o.smooth! });
const asBreaks = (o: AnalysisResult): SeriesBreaks => ({ series: o.series, result: o.breaks! });

/** A method of the pane's list ({@link methodChoices}): generated from the engine's declarations. */
export type Choice = MethodChoice;

/** How the penalty is set: 'auto' (the method's default), one of its declared rules, 'df' or 'value'. */
export interface PenaltyChoice {
  rule: string;
  value?: number;
}

/**
 * A second smoother drawn over the first for comparison: a method of the list with its rule, or the
 * runner-up of the automatic choice (the candidate with the lowest cross-validation error after the
 * chosen one, drawn as it was compared: the engine returns its fit with the comparison).
 */
export type SecondChoice = { kind: 'method'; choice: Choice; pen: PenaltyChoice } | { kind: 'runner-up' };

/** A second fit for comparison, and how it was asked for. */
export interface SecondFit {
  choice: Choice;
  result: FitResult;
  /** 'method' (picked by the analyst) or 'runner-up' (of the automatic choice). */
  how: SecondChoice['kind'];
  /** For the runner-up: its row of the automatic choice's comparison (CV error and se on the same folds as the winner's). */
  row?: Comparison['rows'][number];
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

/**
 * What the run says beside its numbers, as the engine's pipeline reports it: warnings about these data
 * (notes of the pipeline itself included, e.g. a season taken out first) and the standing caveats.
 */
interface RunNotes { warnings: Warning[]; caveats: Warning[] }

/** What the engine returned for one run: results in the engine's own shapes, with the series they refer to. */
export type Analysis = RunNotes & (
  | { kind: 'smooth'; choice: Choice; sel: Selection; series: Series; result: FitResult;
      /** The fitted curve continued after the last point (an extrapolation), when the method defines it. */
      beyond?: { x: number[]; y: number[] };
      /** The automatic choice's comparison of methods, when the method was 'auto'. */
      comparison?: Comparison;
      /** A second smoother for comparison, when one was asked for. */
      second?: SecondFit;
      /** Why the comparison fit gave no result (the engine's message), when it failed: the first fit stands. */
      secondError?: string }
  | { kind: 'decompose'; choice: Choice; sel: Selection; series: Series; result: AnalysisResult }
  | { kind: 'breaks'; choice: Choice; sel: Selection; series: Series; result: BreaksResult;
      /** The optimal segmentations for penalties around the chosen one (CROPS), for "why this penalty". */
      path?: CropsRow[] });

/** The list entry of a candidate of the automatic choice (same analysis, same options). */
function choiceOfCandidate(r: Comparison['rows'][number]): Choice | undefined {
  const same = (a: Record<string, unknown>, b: Record<string, unknown>) => Object.keys(a).length === Object.keys(b).length && Object.keys(a).every((k) => a[k] === b[k]);
  return methodChoices().find((m) => m.kind === 'smooth' && m.analysis === r.method && same(m.options, r.options));
}

type Step = AnalysisRequest & { second?: boolean };

/**
 * The chosen analysis as a sequence of engine requests: it yields each request
 * and receives its result, so one description runs on this thread
 * ({@link analyse}) or through the page's worker pool ({@link analyseWith}).
 */
function* steps(block: CellBlock, choice: Choice, pen: PenaltyChoice, secondChoice?: SecondChoice): Generator<Step, Analysis, AnalysisResult> {
  const sel = splitSelection(block);
  const FAMILY = { smooth: 'smoother', breaks: 'changepoints', decompose: 'decomposition' } as const;
  const requestFor = (c: Choice, p: PenaltyChoice, extra: Record<string, unknown> = {}): AnalysisRequest => ({
    analysis: c.analysis, family: FAMILY[c.kind], y: sel.y, x: sel.x, w: sel.w,
    options: { ...c.options, ...ruleOptions(p.rule, p.value), ...extra },
  });
  const request = (extra: Record<string, unknown> = {}) => requestFor(choice, pen, extra);
  if (choice.kind === 'decompose') {
    const answer = yield request();
    return { kind: 'decompose', choice, sel, series: answer.series, result: answer, warnings: answer.warnings, caveats: answer.caveats };
  }
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
    // the comparison fit: same cells, its own method and rule, run the same way (a worker in the pane)
    // (a comparison the engine refuses leaves the first fit standing, with the engine's message; Cancel stops both)
    let second: SecondFit | undefined;
    let secondError: string | undefined;
    try {
      if (secondChoice?.kind === 'method') {
        if (secondChoice.choice.kind !== 'smooth') throw new Error(`only a smoother can be drawn over the fit for comparison, not "${secondChoice.choice.label}".`);
        const other = yield { ...requestFor(secondChoice.choice, secondChoice.pen), second: true };
        second = { choice: secondChoice.choice, result: other.smooth!, how: 'method' };
      } else if (secondChoice?.kind === 'runner-up' && answer.comparison) {
        // the engine's runner-up with its fit as it was compared (its cross-validation on the same folds): no second fit
        const ru = answer.comparison.runnerUp;
        const row = ru ? answer.comparison.rows[ru.row] : undefined;
        const c = row && choiceOfCandidate(row);
        if (ru && row && c) second = { choice: c, result: ru.fit, how: 'runner-up', row };
        else secondError = 'no other method could be compared, so there is no runner-up to draw.';
      }
    } catch (e) {
      if (isCancelled(e)) throw e;
      secondError = e instanceof Error ? e.message : String(e);
    }
    return { kind: 'smooth', choice, sel, series, result, beyond, comparison: answer.comparison, second, secondError, warnings: answer.warnings, caveats: answer.caveats };
  }
  const first = yield request();
  const { series, result } = asBreaks(first);
  // The penalty path around the chosen penalty (CROPS), so the analyst sees changes against cost.
  // The slope model's exact search is costly, so its path is drawn on shorter series only.
  let path: CropsRow[] | undefined;
  if (choice.analysis !== 'slope' || series.n <= 2000) {
    const beta = result.penalty.value;
    if (beta > 0 && Number.isFinite(beta)) path = asBreaks(yield request({ penaltyRange: [beta / 10, beta * 10] })).result.crops ?? [];
  }
  return { kind: 'breaks', choice, sel, series, result, path, warnings: first.warnings, caveats: first.caveats };
}

/** Runs the chosen analysis on a selection on this thread. Throws the engine's errors unchanged. */
/** Runs the chosen analysis on a selection on this thread. Throws the engine's errors unchanged. */
export function analyse(block: CellBlock, choice: Choice, pen: PenaltyChoice, second?: SecondChoice): Analysis {
  const it = steps(block, choice, pen, second);
  let step = it.next();
  while (!step.done) {
    const { second: isSecond, ...request } = step.value;
    let answer: AnalysisResult;
    try { answer = runAnalysis(request); } catch (e) { if (!isSecond) throw e; step = it.throw(e); continue; }
    step = it.next(answer);
  }
  return step.value;
}

/** Runs the chosen analysis with each engine request answered by `compute` (the page's worker pool in the pane). */
export async function analyseWith(block: CellBlock, choice: Choice, pen: PenaltyChoice, compute: Compute, second?: SecondChoice): Promise<Analysis> {
  const it = steps(block, choice, pen, second);
  let step = it.next();
  while (!step.done) {
    const { second: isSecond, ...request } = step.value;
    let answer: AnalysisResult;
    // a failed comparison fit goes back to the description, which keeps the first fit (a cancel ends both)
    try { answer = await compute(request, !!isSecond); } catch (e) { if (!isSecond) throw e; step = it.throw(e); continue; }
    step = it.next(answer);
  }
  return step.value;
}
