/**
 * Turns a block of selected cells and the pane's choices into one engine call,
 * and the engine's result into what the pane shows. No numerics here: the
 * engine fits, checks and warns; this only arranges.
 */
import { Cell, FitOptions, SeriesBreaks, SeriesFit, Warning, evaluate, findAnalysis, numberFromText, ruleOptions, toRows } from '../engine';
import type { BreaksModel, BreaksOptions } from '../engine/breaks/types';
import { AnalysisRequest, AnalysisResult, runAnalysis } from '../runtime/engineEntry';
import type { CellBlock } from './workbook';

/** Runs one analysis request: the page's worker pool in the pane, or this thread by default. */
export type Compute = (request: AnalysisRequest) => Promise<AnalysisResult>;
const onThisThread: Compute = async (r) => runAnalysis(r);
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

export interface Marker {
  x: number;
  label: string;
}

export interface View {
  title: string;
  /** Clean points, sorted by x. */
  x: Float64Array;
  y: Float64Array;
  fitted: Float64Array;
  /** The fitted curve continued beyond the data on both sides (extrapolation), when the method defines it. */
  beyond?: { left: { x: number[]; y: number[] }; right: { x: number[]; y: number[] } };
  /** Approximate 95% pointwise band (fitted +/- 1.96 se), for linear smoothers. */
  band?: { lower: Float64Array; upper: Float64Array };
  /** x holds Excel serial dates: label the axis with dates. */
  xDates: boolean;
  /** Points at each end whose fitted values rest on one side only (about one smoothing window). */
  boundaryPoints: number;
  markers: Marker[];
  summary: [string, string][];
  warnings: Warning[];
  /** Criterion against df, with the chosen point, for "why this penalty". */
  curve?: { df: number[]; score: number[]; chosenDf: number; chosenScore: number; name: string; xLabel: string; step?: boolean };
  /** One value per selected data row (header excluded), blank where dropped: what "write" puts in the sheet. */
  column: unknown[];
  columnHeader: string;
  /** Rows of the knots or breaks table (with header). */
  table: unknown[][];
}

const fmt = (v: number): string => (Number.isFinite(v) ? Number(v.toPrecision(5)).toString() : 'n/a');

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

/** Runs the chosen analysis on a selection through `compute`. Throws the engine's errors unchanged. */
export async function analyse(block: CellBlock, choice: Choice, pen: PenaltyChoice, compute: Compute = onThisThread): Promise<View> {
  const sel = splitSelection(block);
  if (choice.kind === 'smooth') {
    const options: FitOptions = { method: choice.method, ...penaltyOptions(pen) };
    if (choice.method === 'trend') options.order = choice.order ?? 1;
    const { series, result } = asFit(await compute(smoothRequest(sel, options)));
    const n = series.n;
    const span = series.x[n - 1] - series.x[0];
    const ext = (from: number, to: number) => {
      const xs = Array.from({ length: 12 }, (_, i) => from + ((to - from) * i) / 11);
      return { x: xs, y: Array.from(evaluate(result, xs).value) };
    };
    const column = toRows(series, result.fitted, '');
    const curve = result.criterion.curve && result.criterion.curve.length > 1
      ? { df: result.criterion.curve.map((p) => p.df), score: result.criterion.curve.map((p) => p.score), chosenDf: result.df, chosenScore: result.criterion.value, name: `${result.criterion.name} score`, xLabel: 'degrees of freedom' }
      : undefined;
    const title = choice.method === 'spline' ? 'Smoothing spline' : `Trend filtering, order ${options.order}`;
    const band = result.se ? {
      lower: Float64Array.from(result.fitted, (f, i) => f - 1.96 * result.se![i]),
      upper: Float64Array.from(result.fitted, (f, i) => f + 1.96 * result.se![i]),
    } : undefined;
    return {
      title, x: series.x, y: series.y, fitted: result.fitted, band, xDates: !!block.firstColumnDates && !!sel.x,
      beyond: { left: ext(series.x[0] - 0.08 * span, series.x[0]), right: ext(series.x[n - 1], series.x[n - 1] + 0.08 * span) },
      boundaryPoints: Math.max(2, Math.min(Math.floor(n / 4), Math.round(n / Math.max(result.df, 1)))),
      markers: result.knots.map((k) => ({ x: k.x, label: `knot at ${fmt(k.x)}: change ${fmt(k.change)}` })),
      summary: [
        ['lambda', fmt(result.penalty)], ['df', fmt(result.df)], ['sigma', fmt(result.sigma)],
        ['chosen by', result.criterion.name], ['points used', `${series.n} of ${series.nRows}`],
        ['knots', String(result.knots.length)], ['solver', result.solver.converged ? `converged (${result.solver.iterations} steps)` : 'NOT converged'],
      ],
      warnings: result.warnings, curve, column, columnHeader: `${sel.yName} (${choice.method})`,
      table: [['x', 'row', 'change'], ...result.knots.map((k) => [k.x, k.row + 1, k.change])],
    };
  }
  const bo: BreaksOptions = { model: choice.model, ...breaksPenalty(pen) };
  const { series, result } = asBreaks(await compute(breaksRequest(sel, bo)));
  // The penalty path around the chosen penalty (CROPS), so the analyst sees changes against cost.
  // The slope model's exact search is costly, so its path is drawn on shorter series only.
  let curve: View['curve'];
  if (choice.model !== 'slope' || series.n <= 2000) {
    const beta = result.penalty.value;
    const path = asBreaks(await compute(breaksRequest(sel, { ...bo, crops: [beta / 10, beta * 10] }))).result.crops ?? [];
    if (path.length > 1) {
      curve = { df: path.map((c) => c.changes), score: path.map((c) => c.cost), chosenDf: result.breaks.length, chosenScore: result.cost, name: 'cost', xLabel: 'number of changes', step: true };
    }
  }
  const column = toRows(series, result.fitted, '');
  return {
    title: `Changepoints (${choice.model})`, x: series.x, y: series.y, fitted: result.fitted, xDates: !!block.firstColumnDates && !!sel.x,
    boundaryPoints: 0,
    markers: result.breaks.map((b) => ({ x: b.x, label: `break at ${fmt(b.x)}: change ${fmt(b.change)}` })),
    summary: [
      ['penalty', `${result.penalty.rule} = ${fmt(result.penalty.value)}`], ['breaks', String(result.breaks.length)],
      ['segments', String(result.segments.length)], ['points used', `${series.n} of ${series.nRows}`],
      ['search', `${result.solver.algorithm}, exact`],
    ],
    warnings: result.warnings, curve, column, columnHeader: `${sel.yName} (segments)`,
    table: [['x', 'row', 'change'], ...result.breaks.map((b) => [b.x, b.row + 1, b.change])],
  };
}
