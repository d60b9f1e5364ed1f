/**
 * What a fit or a segmentation looks like as tables and lines of text, for
 * the pane, the sheet and the command line alike. Pure: takes the engine's
 * result and the series it was made from, returns cells with both a value
 * (what is written to a sheet, rounded) and a text (what is shown).
 */
import type { BreaksModel, BreaksResult, FitResult, SegmentSummary, Series } from '../engine';
import { DataPlace, cellOfRow, cellName } from './cellAddress';
import { breaksPenaltyInWords, breaksSolverInWords, fitSolverInWords, ruleInWords, smoothPenaltyInWords } from './describe';
import { dataDecimals, formatFixed, formatNumber, roundForData, roundTo } from './formatNumber';
import { serialToIso } from './isoDate';

/** One table cell: the value written to a sheet, the text shown, and an Excel number format when it matters. */
export interface PresentCell {
  value: number | string;
  text: string;
  /** Excel number format, e.g. "yyyy-mm-dd" for dates, "0.0" for one decimal. */
  format?: string;
}

export interface PresentTable {
  header: string[];
  rows: PresentCell[][];
}

/** How results are placed and labelled. */
export interface PresentContext {
  /** x holds Excel serial dates. */
  xDates: boolean;
  /** Where the data sit on a sheet (pane); without it rows are counted from 1 over the data rows (command line). */
  place?: DataPlace;
}

const text = (s: string): PresentCell => ({ value: s, text: s });

/** Excel number format for `decimals` decimals ("0", "0.0", "0.00", ...; "General" when rounding to tens or more). */
export function decimalsFormat(decimals: number): string {
  return decimals <= 0 ? (decimals === 0 ? '0' : 'General') : `0.${'0'.repeat(Math.min(decimals, 15))}`;
}

/** Formats x values: dates as ISO text (with time of day only when some x has one), numbers at the data's own decimals. */
export function xPresenter(xs: ArrayLike<number>, dates: boolean): { text(x: number): string; cell(x: number): PresentCell; label: string } {
  if (dates) {
    let timed = false;
    for (let i = 0; i < xs.length && !timed; i++) timed = xs[i] !== Math.floor(xs[i]);
    const format = timed ? 'yyyy-mm-dd hh:mm' : 'yyyy-mm-dd';
    const t = (x: number) => serialToIso(x, timed ? 'auto' : 'never') ?? formatNumber(x, 6);
    return { text: t, cell: (x) => ({ value: x, text: t(x), format }), label: 'date' };
  }
  const d = dataDecimals(xs);
  return { text: (x) => formatFixed(x, d), cell: (x) => ({ value: roundTo(x, d), text: formatFixed(x, d), format: decimalsFormat(d) }), label: 'x' };
}

/** A row reference: the sheet cell (pane) or the 1-based data row (command line). */
function rowCell(row: number, ctx: PresentContext): PresentCell {
  if (ctx.place) return text(cellOfRow(ctx.place, row));
  return { value: row + 1, text: String(row + 1) };
}

const rowHeader = (ctx: PresentContext) => (ctx.place ? 'cell' : 'row');

/** A value rounded to 3 significant digits (quantities without a data scale, such as slope changes). */
function sig3(v: number): PresentCell {
  if (!Number.isFinite(v)) return text('-');
  const r = Number(v.toPrecision(3));
  return { value: r, text: formatNumber(v, 3) };
}

function dataCell(v: number, rounding: ReturnType<typeof roundForData>): PresentCell {
  if (!Number.isFinite(v)) return text('-');
  return { value: rounding.round(v), text: rounding.format(v), format: decimalsFormat(rounding.decimals) };
}

const ORDER_CHANGE = ['level jump', 'slope change', 'curvature change', 'change in 3rd derivative'];

/**
 * The knots an analyst reads: the fit's bends (neighbouring knots of one bend merged, each sized on the
 * unshrunk refit) when the method gives them, else its knots.
 */
export function shownKnots(result: FitResult): { x: number; index: number; row: number; change: number }[] {
  if (!result.bends) return result.knots;
  return result.bends.map((b) => ({ x: b.x, index: b.index, row: b.row, change: Number.isFinite(b.change) ? b.change : b.shrunkChange }));
}

/** The knots table: where the fitted curve changes form, and by how much (bends when the method gives them). */
export function knotsTable(result: FitResult, series: Series, ctx: PresentContext): PresentTable {
  const xp = xPresenter(series.x, ctx.xDates);
  // the mixed trend's knots are the kinks of its straight pieces: slope changes, as trend filtering of order 1
  const order = result.method === 'trend' ? Number((result.options as { order?: number }).order ?? 1) : result.method === 'mixed' ? 1 : 3;
  let change = ORDER_CHANGE[Math.max(0, Math.min(3, order))];
  if (order >= 1) change += ctx.xDates ? ` per day${order > 1 ? `^${order}` : ''}` : ` per x unit${order > 1 ? `^${order}` : ''}`;
  const rounding = roundForData(series.y);
  return {
    header: [xp.label, rowHeader(ctx), change],
    rows: shownKnots(result).map((k) => [xp.cell(k.x), rowCell(k.row, ctx), order === 0 ? dataCell(k.change, rounding) : sig3(k.change)]),
  };
}

/** The summary fields a model is about, with their headers. */
function modelFields(model: BreaksModel, xDates: boolean): { key: keyof SegmentSummary; name: string; data: boolean }[] {
  switch (model) {
    case 'mean': return [{ key: 'mean', name: 'level', data: true }];
    case 'meanvar': return [{ key: 'sd', name: 'sd', data: true }, { key: 'mean', name: 'level', data: true }];
    case 'poisson': return [{ key: 'rate', name: 'rate', data: true }];
    case 'distribution': return [{ key: 'median', name: 'median', data: true }, { key: 'sd', name: 'sd', data: true }];
    case 'slope': return [{ key: 'slope', name: xDates ? 'slope (per day)' : 'slope (per x unit)', data: false }];
  }
}

/** The breaks table: where each change is, and the model's summaries before and after it. */
export function breaksTable(result: BreaksResult, series: Series, ctx: PresentContext): PresentTable {
  const xp = xPresenter(series.x, ctx.xDates);
  const fields = modelFields(result.model, ctx.xDates);
  const rounding = roundForData(series.y);
  const cell = (v: number, data: boolean) => (data ? dataCell(v, rounding) : sig3(v));
  return {
    header: [xp.label, rowHeader(ctx), ...fields.flatMap((f) => [`${f.name} before`, `${f.name} after`])],
    rows: result.breaks.map((b) => [
      xp.cell(b.x), rowCell(b.row, ctx),
      ...fields.flatMap((f) => [cell(b.before[f.key] as number, f.data), cell(b.after[f.key] as number, f.data)]),
    ]),
  };
}

/** The segments table: each segment's span and the summaries its model is about. */
export function segmentsTable(result: BreaksResult, series: Series, ctx: PresentContext): PresentTable {
  const xp = xPresenter(series.x, ctx.xDates);
  const fields = modelFields(result.model, ctx.xDates);
  const rounding = roundForData(series.y);
  const rows = (s: SegmentSummary): PresentCell => {
    if (!ctx.place) return text(`${s.rowStart + 1}-${s.rowEnd + 1}`);
    return text(`${cellOfRow(ctx.place, s.rowStart)}:${cellName(ctx.place.yCol, ctx.place.firstRow + s.rowEnd)}`);
  };
  return {
    header: ['from', 'to', ctx.place ? 'cells' : 'rows', 'points', ...fields.map((f) => f.name)],
    rows: result.segments.map((s) => [
      xp.cell(s.xStart), xp.cell(s.xEnd), rows(s), { value: s.n, text: String(s.n) },
      ...fields.map((f) => (f.data ? dataCell(s[f.key] as number, rounding) : sig3(s[f.key] as number))),
    ]),
  };
}

/** The fitted values rounded for the data (one decimal more than y carries), one per clean point. */
export function roundedFit(fitted: ArrayLike<number>, series: Series): { values: number[]; format: string; rounding: ReturnType<typeof roundForData> } {
  const rounding = roundForData(series.y);
  return { values: Array.from(fitted, (v) => rounding.round(v)), format: decimalsFormat(rounding.decimals), rounding };
}

/** Summary lines of a smoother's fit: [label, text]. */
export function fitSummary(result: FitResult, series: Series): [string, string][] {
  const rounding = roundForData(series.y);
  return [
    ['smoothing', smoothPenaltyInWords(result)],
    ['chosen by', ruleInWords(result.criterion.name, result.options)],
    ['noise sd', Number.isFinite(result.sigma) ? rounding.format(result.sigma) : 'not estimated'],
    ['points used', `${series.n} of ${series.nRows} rows${series.tiesMerged ? ` (${series.tiesMerged} merged as ties)` : ''}`],
    ['knots', result.bends ? `${result.bends.length} bends (from ${result.knots.length} knots; neighbouring knots of one bend merged)` : String(result.knots.length)],
    ['solver', fitSolverInWords(result)],
  ];
}

/** Summary lines of a segmentation: [label, text]. */
export function breaksSummary(result: BreaksResult, series: Series): [string, string][] {
  const out: [string, string][] = [
    ['penalty', breaksPenaltyInWords(result)],
    ['breaks', String(result.breaks.length)],
    ['segments', String(result.segments.length)],
    ['points used', `${series.n} of ${series.nRows} rows`],
  ];
  if (result.sigma) out.push(['noise sd', `${roundForData(series.y).format(result.sigma.value)} (${result.sigma.source})`]);
  out.push(['search', breaksSolverInWords(result)]);
  return out;
}

const METHOD_WORDS: Record<string, string> = { spline: 'smoothing spline', trend: 'trend filtering' };
const MODEL_WORDS: Record<BreaksModel, string> = { mean: 'level', meanvar: 'level and volatility', poisson: 'rate of counts', distribution: 'distribution', slope: 'slope (continuous)' };

/** What a settings note records. */
export interface NoteFacts {
  /** Knotwise version. */
  version: string;
  /** Date of the fit, ISO 8601. */
  date: string;
  /** The data's address (e.g. "Sheet1!A1:B157"). */
  source: string;
}

/** One line that tells a colleague without the add-in what was done. */
export function fitSettingsNote(result: FitResult, facts: NoteFacts): string {
  const order = result.method === 'trend' ? ` of order ${(result.options as { order?: number }).order ?? 1}` : '';
  return `Knotwise ${facts.version}, ${facts.date}: ${METHOD_WORDS[result.method] ?? result.method}${order} of ${facts.source}; penalty by ${ruleInWords(result.criterion.name, result.options)}: ${smoothPenaltyInWords(result)}; ${result.bends ? `${result.bends.length} bends (${result.knots.length} knots)` : `${result.knots.length} knots`}; ${fitSolverInWords(result)}. A smoothed trend describes the past; it is not a forecast, and values near the ends get revised as data arrive.`;
}

/** One line that tells a colleague without the add-in what was done. */
export function breaksSettingsNote(result: BreaksResult, facts: NoteFacts): string {
  return `Knotwise ${facts.version}, ${facts.date}: changepoints in the ${MODEL_WORDS[result.model]} of ${facts.source}; penalty ${breaksPenaltyInWords(result)}; ${result.breaks.length} breaks; ${breaksSolverInWords(result)}. A statistical break is not proof of its cause.`;
}
