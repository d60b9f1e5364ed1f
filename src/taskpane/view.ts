/**
 * What the pane shows and writes, made from the engine's results (FitResult
 * or BreaksResult with its series) by the presentation module: dates as
 * dates, cells by their sheet address, numbers at the data's precision.
 * No engine calls here.
 */
import type { Bend, Comparison } from '../engine';
import {
  DataPlace, PresentTable, breaksSettingsNote, breaksSummary, breaksTable, cellsInMessage, fitSettingsNote, fitSummary,
  formatNumber, knotsTable, shownKnots, parseRangeAddress, rangeName, roundedFit, segmentsTable, xPresenter, cellOfRow, ruleInWords,
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
  /** What holds for every result of this kind (ends get revised, a break is not its cause): shown under the chart, not as warnings. */
  caveats: { code: string; message: string }[];
  /** Criterion against df, with the chosen point, for "why this penalty". */
  /** `leftOut`: points of the search not drawn because their fits did not converge. */
  curve?: { df: number[]; score: number[]; chosenDf: number; chosenScore: number; name: string; xLabel: string; step?: boolean; leftOut?: number };
  /** One value per selected data row (header excluded), rounded for the data, '' where dropped. */
  column: (number | string)[];
  /** Excel number format of the fitted values. */
  columnFormat: string;
  columnHeader: string;
  /**
   * The knots, breaks or spikes table ('table'), then (changepoints) the segments table, the automatic
   * choice's comparison, two fits side by side ('side'), and further tables of a decomposition ('more').
   */
  tables: { id: 'table' | 'segments' | 'compare' | 'side' | 'more'; title: string; table: PresentTable; note?: string }[];
  /** A decomposition: its components as panels stacked on one x axis, top to bottom. */
  panels?: Panel[];
  /** A decomposition: the components table written to the sheet (header, then one row per selected data row). */
  components?: { header: string[]; rows: (number | string)[][]; format: string };
  /** A second smoother drawn over the fit for comparison. */
  second?: { label: string; fitted: Float64Array };
  /** What the first fit is called in a legend beside a second one. */
  fitLabel?: string;
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

/** One panel of a decomposition: what it draws, labelled in plain words. */
export interface Panel {
  id: string;
  label: string;
  /** Data points (the top panel). */
  dots?: Float64Array;
  /** A line (trend, season). */
  line?: Float64Array;
  /** Vertical stems from zero (spikes, remainder). */
  stems?: Float64Array;
  /** Clean-point indices marked with a ring (spikes). */
  marked?: number[];
  /** Name of the line, for the readout and the legend. */
  lineName?: string;
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
  // the pipeline's warnings (its own notes, e.g. a season taken out first, with the method's) and its standing caveats
  const warnings: { code: string; message: string }[] = a.warnings.map((w) => ({ code: w.code, message: cellsInMessage(w.message, place) }));
  const caveats = a.caveats.map((w) => ({ code: w.code, message: w.message }));
  const common = {
    x: series.x, y: series.y, fitted: a.result.fitted, xDates, place, sheet: r.sheet, xCol: sel.x ? cols[0] : -1, hasHeader, topRow: r.row, lastCol: Math.max(...cols),
    yName: sel.yName, showX: xp.text, showY, column, columnFormat: fit.format, warnings, caveats,
  };
  if (a.kind === 'decompose') return decompositionView(a, { ...common, fit, source, facts, ctx, xp });
  if (a.kind === 'smooth' && a.secondError) common.warnings = [...common.warnings, { code: 'comparison-failed', message: `The comparison fit was not drawn: ${cellsInMessage(a.secondError, place)}` }];
  if (a.kind === 'smooth') {
    const { result, choice } = a;
    const n = series.n;
    // points whose fit did not converge carry no fit's df (a solver stopped short counts its knots wrongly), so the
    // chart leaves them out and says how many; the sheet's penalty table keeps them, marked
    const drawn = result.criterion.curve?.filter((p) => p.converged !== false);
    const curve = drawn && drawn.length > 1
      ? { df: drawn.map((p) => p.df), score: drawn.map((p) => p.score), chosenDf: result.df, chosenScore: result.criterion.value, name: `${result.criterion.name.toUpperCase()} score`, xLabel: 'degrees of freedom', leftOut: result.criterion.curve!.length - drawn.length }
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
    const fitLabel = a.comparison ? cap(a.comparison.rows[a.comparison.chosen].label) : choice.label;
    const second = a.second ? { label: a.second.how === 'runner-up' ? `${a.second.choice.label} (runner-up)` : a.second.choice.label, fitted: a.second.result.fitted } : undefined;
    return {
      ...common,
      fitLabel, second,
      title: a.comparison ? `Automatic choice: ${a.comparison.rows[a.comparison.chosen].label}` : choice.label,
      beyond: a.beyond, band, curve, markers, markerName: 'knot',
      boundaryPoints: Math.max(2, Math.min(Math.floor(n / 4), Math.round(n / Math.max(result.df, 1)))),
      summary: fitSummary(result, series),
      columnHeader: `${sel.yName} (${result.method}${result.options.order !== undefined ? ` ${result.options.order}` : ''})`,
      tables: [
        { id: 'table', title: 'Knots', table: withFitted(knots, shown.map((k) => result.fitted[k.index]), fit.format, showY) },
        ...(a.comparison ? [{ id: 'compare' as const, title: 'Methods compared', table: comparisonTable(a.comparison) }] : []),
        ...(a.second && second ? [sideBySide(a, fitLabel, second.label)] : []),
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

const cap = (t: string) => t.charAt(0).toUpperCase() + t.slice(1);

/** Two fits side by side: what each is, its degrees of freedom and the score that chose its penalty. */
function sideBySide(a: Extract<Analysis, { kind: 'smooth' }>, firstLabel: string, secondLabel: string): View['tables'][number] {
  const r1 = a.result, r2 = a.second!.result;
  const t = (s: string) => ({ value: s, text: s });
  const num = (v: number) => (Number.isFinite(v) ? formatNumber(v, 4) : '-');
  const score = (r: typeof r1) => (Number.isFinite(r.criterion.value) ? `${r.criterion.name.toUpperCase()} ${num(r.criterion.value)}` : r.criterion.name === 'fixed' ? 'none (penalty given)' : r.criterion.name);
  const rows: string[][] = [
    ['method', firstLabel, secondLabel],
    ['degrees of freedom', num(r1.df), num(r2.df)],
    ['penalty chosen by', ruleInWords(r1.criterion.name, r1.options), ruleInWords(r2.criterion.name, r2.options)],
    ['criterion', score(r1), score(r2)],
    ['knots', String(r1.bends?.length ?? r1.knots.length), String(r2.bends?.length ?? r2.knots.length)],
  ];
  const c = a.comparison, row2 = a.second!.row;
  if (c && row2) {
    const w = c.rows[c.chosen];
    rows.push([`CV error on the same ${c.folds} folds (se)`, `${num(w.cv)} (${num(w.se)})`, `${num(row2.cv)} (${num(row2.se)})`]);
  }
  const same = r1.criterion.name === r2.criterion.name && !!(c && row2);
  return {
    id: 'side', title: 'Two fits side by side',
    table: { header: ['', 'fit', 'compared'], rows: rows.map((r) => r.map(t)) },
    note: same
      ? 'Both scores are cross-validation errors on the same held-out points, so they compare like with like.'
      : 'Each criterion is the score its own rule minimised: scores of different rules (or folds) are different quantities. Compare the curves and degrees of freedom; both describe the past, neither is a forecast.',
  };
}

const SPACING_UNIT: Record<string, string> = { daily: 'days', weekly: 'weeks', monthly: 'months', quarterly: 'quarters', steps: 'steps' };

interface DecompositionParts {
  x: Float64Array; y: Float64Array; xDates: boolean; place: DataPlace; sheet: string | null; xCol: number; hasHeader: boolean; topRow: number; lastCol: number;
  yName: string; showX(x: number): string; showY(y: number): string; column: (number | string)[]; columnFormat: string; warnings: { code: string; message: string }[];
  caveats: { code: string; message: string }[];
  fit: ReturnType<typeof roundedFit>; source: string; facts: RunFacts; ctx: { xDates: boolean; place: DataPlace }; xp: ReturnType<typeof xPresenter>;
}

/** The components as stacked panels, the components table for the sheet, and the spikes, seasons and knots tables. */
function decompositionView(a: Extract<Analysis, { kind: 'decompose' }>, p: DecompositionParts): View {
  const { series, result } = a;
  const d = result.decomposition!;
  const c = d.components;
  const seasons = d.seasons as { label: string; length: number; strength: number; kept: boolean; values: Float64Array }[];
  // the trend's bends (neighbouring knots merged, honest sizes), as the knots table of a fit; the raw knots are counted
  const allKnots = d.knots as { x: number; index: number; row: number; change: number }[];
  const knots = ((d.bends ?? []) as Bend[]).map((b) => ({ x: b.x, index: b.index, row: b.row, change: Number.isFinite(b.change) ? b.change : b.shrunkChange }));
  const spikeIndex = d.spikeIndex as number[];
  const unit = SPACING_UNIT[d.spacing as string] ?? 'steps';
  const method = d.method === 'stl' ? 'STL (LOESS trend and a slowly changing season)' : 'trend with knots chosen by the data, fixed seasonal pattern and one-off spikes';
  const kept = seasons.filter((q) => q.kept);
  const panels: Panel[] = [{ id: 'data', label: `${p.yName} with its trend`, dots: series.y, line: c.trend, lineName: 'trend', marked: spikeIndex }];
  for (const q of kept) panels.push({ id: `season-${q.label}`, label: `Season: ${q.label} pattern (${formatNumber(q.length, 4)} ${unit})`, line: q.values, lineName: `${q.label} season` });
  if (spikeIndex.length) panels.push({ id: 'spikes', label: `One-off spikes (${spikeIndex.length})`, stems: c.spikes, marked: spikeIndex, lineName: 'spike' });
  panels.push({ id: 'remainder', label: 'Remainder: what is left', stems: c.remainder, lineName: 'remainder' });

  // the table written to the sheet: one row per selected data row, as KNOTWISE.DECOMPOSE spills it
  const names = ['trend', 'season', 'spikes', 'remainder', 'adjusted'] as const;
  const r = p.fit.rounding;
  const rows = Array.from({ length: series.nRows }, (_, i) => {
    const k = series.rowOf[i];
    return names.map((nm) => (k >= 0 ? r.round(c[nm][k]) : ''));
  });
  const dataCell = (v: number) => ({ value: r.round(v), text: r.format(v), format: p.columnFormat });
  const text = (t: string) => ({ value: t, text: t });
  const spikes: PresentTable = {
    // the data value last: a sheet chart marks the spikes there, on the data points
    header: [p.xp.label, 'cell', 'spike', 'trend', p.yName],
    rows: spikeIndex.map((i) => [p.xp.cell(series.x[i]), text(cellOfRow(p.place, series.firstRow[i])), dataCell(c.spikes[i]), dataCell(c.trend[i]), dataCell(series.y[i])]),
  };
  const seasonTable: PresentTable = {
    header: ['season', `length (${unit})`, 'strength', 'kept'],
    rows: seasons.map((q) => [text(q.label), { value: Number(q.length.toPrecision(4)), text: formatNumber(q.length, 4) }, { value: Number(q.strength.toFixed(2)), text: q.strength.toFixed(2) }, text(q.kept ? 'yes' : 'no')]),
  };
  const knotTable: PresentTable = {
    header: [p.xp.label, 'cell', 'change', 'trend'],
    rows: knots.map((k) => [p.xp.cell(k.x), text(cellOfRow(p.place, k.row)), { value: Number(k.change.toPrecision(3)), text: formatNumber(k.change, 3) }, dataCell(c.trend[k.index])]),
  };
  const seasonWords = kept.length ? kept.map((q) => `${q.label} (${formatNumber(q.length, 4)} ${unit}, strength ${q.strength.toFixed(2)})`).join(' and ') : `none kept (strength below ${Number(d.strengthThreshold).toFixed(2)})`;
  const penalty = d.penalty as number;
  const summary: [string, string][] = [
    ['method', method],
    ['season', seasonWords],
    ['trend', d.method === 'stl' ? 'LOESS' : `${knots.length} bends (from ${allKnots.length} knots); penalty ${Number.isFinite(penalty) ? formatNumber(penalty) : '-'} chosen by ${ruleInWords(result.criterion?.name ?? 'fixed')}`],
    ['spikes', String(spikeIndex.length)],
    ['noise sd', r.format(d.noiseScale as number)],
    ['points used', `${series.n} of ${series.nRows} rows`],
    ['solver', result.solver.converged ? `converged in ${result.solver.iterations} steps` : `stopped after ${result.solver.iterations} steps without reaching its tolerance`],
  ];
  const curvePts = result.criterion?.curve;
  const chosen = curvePts?.find((q) => q.penalty === penalty);
  const curve = curvePts && curvePts.length > 1 && chosen
    ? { df: curvePts.map((q) => q.df), score: curvePts.map((q) => q.score), chosenDf: chosen.df, chosenScore: chosen.score, name: `${result.criterion!.name.toUpperCase()} score`, xLabel: 'degrees of freedom of the trend' }
    : undefined;
  const n = series.n;
  return {
    ...p,
    title: d.method === 'stl' ? 'Decomposition: STL' : 'Decomposition: trend, season and spikes',
    fitted: c.trend, markers: knots.map((k) => ({ x: k.x, y: c.trend[k.index], label: `knot at ${p.xp.text(k.x)} (${cellOfRow(p.place, k.row)}): change ${formatNumber(k.change, 3)}` })),
    markerName: 'knot', summary, curve, panels,
    // about one smoothing window at each end: n / df of the trend where the rule reports it (as for a fit);
    // for STL half its default trend window, about 1.5 times the longest period kept (Cleveland et al. 1990)
    boundaryPoints: Math.max(2, Math.min(Math.floor(n / 4), d.method === 'stl'
      ? Math.round(0.75 * Math.max(2, ...kept.map((q) => q.length)))
      : Math.round(n / Math.max(chosen?.df ?? knots.length + 2, 1)))),
    columnHeader: 'trend',
    components: { header: [...names], rows, format: p.columnFormat },
    tables: [
      { id: 'table', title: 'Spikes', table: spikes },
      { id: 'more', title: 'Seasons', table: seasonTable, note: `A season is kept when its strength is at least ${Number(d.strengthThreshold).toFixed(2)} (Wang, Smith & Hyndman 2006).` },
      ...(knots.length ? [{ id: 'more' as const, title: 'Knots of the trend', table: knotTable }] : []),
    ],
    note: `Knotwise ${p.facts.version}, ${p.facts.date}: decomposition of ${p.source} (${method}); season ${seasonWords}; ${knots.length} knots, ${spikeIndex.length} spikes. y = trend + season + spikes + remainder. The trend describes the past; it is not a forecast, and its last values get revised as data arrive.`,
  };
}
