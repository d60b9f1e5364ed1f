/**
 * What the pane shows and writes, made from the engine's results (FitResult
 * or BreaksResult with its series) by the presentation module: dates as
 * dates, cells by their sheet address, numbers at the data's precision.
 * No engine calls here.
 */
import type { Comparison } from '../engine';
import {
  DataPlace, PresentTable, breaksSettingsNote, breaksSummary, breaksTable, cellsInMessage, fitSettingsNote, fitSummary,
  formatNumber, knotsTable, shownKnots, parseRangeAddress, rangeName, roundedFit, segmentsTable, xPresenter,
} from '../present';
import type { Analysis } from './analysis';
import type { CellBlock } from './workbook';

export interface Marker {
  x: number;
  /** Fitted value at the marker (where the chart puts its symbol). */
  y: number;
  label: string;
}

export interface View {
  title: string;
  /** Clean points, sorted by x. */
  x: Float64Array;
  y: Float64Array;
  fitted: Float64Array;
  /** The fitted curve continued after the last point (extrapolation), when the method defines it. */
  beyond?: { x: number[]; y: number[] };
  /** Approximate 95% pointwise band (fitted +/- 1.96 se), for linear smoothers. */
  band?: { lower: Float64Array; upper: Float64Array };
  /** x holds Excel serial dates: label the axis with dates. */
  xDates: boolean;
  /** Points at each end whose fitted values rest on one side only (about one smoothing window). */
  boundaryPoints: number;
  markers: Marker[];
  /** 'knot' or 'break': what a marker is. */
  markerName: string;
  summary: [string, string][];
  /** Warnings with rows named by their cells. */
  warnings: { code: string; message: string }[];
  /** Criterion against df, with the chosen point, for "why this penalty". */
  curve?: { df: number[]; score: number[]; chosenDf: number; chosenScore: number; name: string; xLabel: string; step?: boolean };
  /** One value per selected data row (header excluded), rounded for the data, '' where dropped. */
  column: (number | string)[];
  /** Excel number format of the fitted values. */
  columnFormat: string;
  columnHeader: string;
  /** The knots or breaks table, then (changepoints) the segments table. */
  tables: { id: 'table' | 'segments' | 'compare'; title: string; table: PresentTable }[];
  /** The automatic choice's reason, in one sentence. */
  compareReason?: string;
  /** One line recording method, rule, penalty, df, date and version. */
  note: string;
  /** Where the data rows sit on the sheet. */
  place: DataPlace;
  /** The selection's sheet, if named in its address. */
  sheet: string | null;
  /** Sheet columns (0-based) of x (-1 when x are row numbers) and y. */
  xCol: number;
  /** Whether the selection has a header row. */
  hasHeader: boolean;
  /** Sheet row of the selection's first row (the header, when there is one). */
  topRow: number;
  /** Last sheet column of the selection. */
  lastCol: number;
  yName: string;
  /** x as shown (a date, or a number at the data's decimals). */
  showX(x: number): string;
  /** A value on the y scale as shown (at the data's precision). */
  showY(y: number): string;
}

/** Version and date recorded in the settings note. */
export interface RunFacts {
  version: string;
  /** ISO 8601 date of the fit. */
  date: string;
}

/** The knot or break table with the fitted value at each marker added (where a chart puts its symbol). */
function withFitted(t: PresentTable, ys: number[], format: string, show: (v: number) => string): PresentTable {
  return { header: [...t.header, 'fitted'], rows: t.rows.map((r, i) => [...r, { value: Number(show(ys[i])), text: show(ys[i]), format }]) };
}

/** The pane's view of one analysis of `block`. */
export function viewOf(a: Analysis, block: CellBlock, facts: RunFacts): View {
  const { sel, series } = a;
  const r = parseRangeAddress(block.address) ?? { sheet: null, col: 0, row: 1, lastCol: 0, lastRow: 1 };
  const hasHeader = sel.header !== null;
  const nc = block.values[0]?.length ?? 1;
  const cols = block.columns ?? Array.from({ length: nc }, (_, j) => r.col + j);
  const place: DataPlace = { firstRow: r.row + (hasHeader ? 1 : 0), yCol: cols[nc === 1 ? 0 : 1] };
  const xDates = !!block.firstColumnDates && !!sel.x;
  const xp = xPresenter(series.x, xDates);
  const fit = roundedFit(a.result.fitted, series);
  const showY = (v: number) => fit.rounding.format(v);
  const ctx = { xDates, place };
  const column = Array.from({ length: series.nRows }, (_, i) => (series.rowOf[i] >= 0 ? fit.values[series.rowOf[i]] : ''));
  const source = rangeName(r.sheet, r.col, r.row, r.lastCol, r.lastRow);
  const warnings = a.result.warnings.map((w) => ({ code: w.code, message: cellsInMessage(w.message, place) }));
  const common = {
    x: series.x, y: series.y, fitted: a.result.fitted, xDates, place, sheet: r.sheet, xCol: sel.x ? cols[0] : -1, hasHeader, topRow: r.row, lastCol: Math.max(...cols),
    yName: sel.yName, showX: xp.text, showY, column, columnFormat: fit.format, warnings,
  };
  if (a.kind === 'smooth') {
    const { result, choice } = a;
    const n = series.n;
    const curve = result.criterion.curve && result.criterion.curve.length > 1
      ? { df: result.criterion.curve.map((p) => p.df), score: result.criterion.curve.map((p) => p.score), chosenDf: result.df, chosenScore: result.criterion.value, name: `${result.criterion.name.toUpperCase()} score`, xLabel: 'degrees of freedom' }
      : undefined;
    const band = result.se ? {
      lower: Float64Array.from(result.fitted, (f, i) => f - 1.96 * result.se![i]),
      upper: Float64Array.from(result.fitted, (f, i) => f + 1.96 * result.se![i]),
    } : undefined;
    const knots = knotsTable(result, series, ctx);
    const changeName = knots.header[2];
    const shown = shownKnots(result);
    const markers = shown.map((k, i) => ({
      x: k.x, y: result.fitted[k.index],
      label: `knot at ${xp.text(k.x)} (${knots.rows[i][1].text}): ${changeName} ${formatNumber(k.change)}`,
    }));
    return {
      ...common,
      title: a.comparison ? `Automatic choice: ${a.comparison.rows[a.comparison.chosen].label}` : choice.label,
      beyond: a.beyond, band, curve, markers, markerName: 'knot',
      boundaryPoints: Math.max(2, Math.min(Math.floor(n / 4), Math.round(n / Math.max(result.df, 1)))),
      summary: fitSummary(result, series),
      columnHeader: `${sel.yName} (${result.method}${result.options.order !== undefined ? ` ${result.options.order}` : ''})`,
      tables: [
        { id: 'table', title: 'Knots', table: withFitted(knots, shown.map((k) => result.fitted[k.index]), fit.format, showY) },
        ...(a.comparison ? [{ id: 'compare' as const, title: 'Methods compared', table: comparisonTable(a.comparison) }] : []),
      ],
      compareReason: a.comparison?.reason,
      note: fitSettingsNote(result, { ...facts, source }),
    };
  }
  const { result, path } = a;
  const curve = path && path.length > 1
    ? { df: path.map((c) => c.changes), score: path.map((c) => c.cost), chosenDf: result.breaks.length, chosenScore: result.cost, name: 'cost', xLabel: 'number of changes', step: true }
    : undefined;
  const breaks = breaksTable(result, series, ctx);
  return {
    ...common,
    title: `Changepoints: ${({ mean: 'level', meanvar: 'level and volatility', poisson: 'rate of counts', distribution: 'distribution', slope: 'slope' } as const)[result.model]}`,
    curve, boundaryPoints: 0, markerName: 'break',
    markers: result.breaks.map((b, i) => ({ x: b.x, y: result.fitted[b.index], label: `break at ${xp.text(b.x)} (${breaks.rows[i][1].text}): ${breaks.header.slice(2).map((h, j) => `${h} ${breaks.rows[i][2 + j].text}`).join(', ')}` })),
    summary: breaksSummary(result, series),
    columnHeader: `${sel.yName} (segments)`,
    tables: [
      { id: 'table', title: 'Breaks', table: withFitted(breaks, result.breaks.map((b) => result.fitted[b.index]), fit.format, showY) },
      { id: 'segments', title: 'Segments', table: segmentsTable(result, series, ctx) },
    ],
    note: breaksSettingsNote(result, { ...facts, source }),
  };
}

/** The automatic choice's candidates: what each fits, its df, cross-validation error and standard error; the chosen one marked. */
function comparisonTable(c: Comparison): PresentTable {
  const num = (v: number) => ({ value: Number.isFinite(v) ? Number(v.toPrecision(4)) : '', text: Number.isFinite(v) ? formatNumber(v) : '' });
  const short = (r: Comparison['rows'][number]) => [r.method, ...Object.values(r.options)].join(' ');
  return {
    header: ['method', 'df', 'CV error', 'se', ''],
    rows: c.rows.map((r, i) => [
      { value: short(r), text: short(r) },
      ...(r.skipped ? [num(NaN), num(NaN), num(NaN)] : [num(r.df), num(r.cv), num(r.se)]),
      { value: i === c.chosen ? 'chosen' : r.skipped ? 'not compared' : '', text: i === c.chosen ? 'chosen' : r.skipped ? 'not compared' : '' },
    ]),
  };
}
