/**
 * The knotwise command line: CSV or .xlsx in, JSON or a text summary out. A thin front
 * over the engine: it reads columns, calls the same entry points as the
 * worksheet functions, and prints what comes back.
 */
import { AnalysisResult, Bend, Cell, evaluateAnalysis, isKnotwiseError, runAnalysis, toRows } from '../engine';
import { CliError, NumericTable, Table, columnIndex, parseCsv, parseNumericCsv } from './csv';
import { SheetReader, isOldOfficeFile, isZip, readWorkbookTable } from './xlsx';
import { CommandSpec, Parsed, commands, helpText, parseArgs } from './options';
import { dataDecimals, formatFixed, formatNumber, roundForData, serialToIso, smoothPenaltyInWords, ruleInWords, fitSolverInWords, breaksSolverInWords } from '../present';

/** What the command line needs from its host (Node's fs and streams, or a test double). */
export interface CliIO {
  readFile(path: string): string;
  /** The file's bytes (to tell an .xlsx workbook from CSV text; absent: CSV only). */
  readBytes?(path: string): Uint8Array;
  /** read-excel-file's readSheet (its Node entry), which reads a sheet of an .xlsx workbook (absent: CSV only). */
  readWorkbook?: SheetReader;
  out(text: string): void;
  err(text: string): void;
  /** Whether a file exists (for --out; absent: the command line cannot write files). */
  exists?(path: string): boolean;
  /** Writes a file (for --out); with `overwrite` false it must fail rather than replace an existing file. */
  writeFile?(path: string, text: string, overwrite: boolean): void;
}

const fail = (m: string): never => { throw new CliError(m); };

/** Milliseconds the engine took in this thread's last analysis (for --timing). */
let lastEngineMs: number | null = null;

/** runAnalysis, timed for --timing (also when it refuses). */
function analyse(request: Parameters<typeof runAnalysis>[0]): AnalysisResult {
  const t0 = Date.now();
  try {
    return runAnalysis(request);
  } finally {
    lastEngineMs = Date.now() - t0;
  }
}

function one(p: Parsed, flag: string): string | undefined {
  return p.values.get(flag)?.[0];
}

/** A file name that says workbook (.xlsx, .xlsm, or the old .xls). */
const WORKBOOK_NAME = /\.xls[xmb]?$/i;

function csvTable(path: string, text: string, sheet: string | undefined): Table | NumericTable {
  if (sheet !== undefined) fail(`--sheet applies to .xlsx workbooks; ${path} is read as CSV.`);
  // All-numeric files (the common case) are read straight into typed arrays; anything else cell by cell.
  const t = parseNumericCsv(text) ?? parseCsv(text);
  if (!t.header.length) fail(`${path} is empty.`);
  return t;
}

function readTable(io: CliIO, path: string | undefined, sheet?: string): Table | NumericTable {
  if (!path) fail('give a CSV or .xlsx file; see knotwise help.');
  if (WORKBOOK_NAME.test(path!)) fail(`${path}: this host reads CSV files only; the knotwise command reads .xlsx workbooks.`);
  let text: string;
  try {
    text = io.readFile(path!);
  } catch (e) {
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`);
  }
  return csvTable(path!, text, sheet);
}

/**
 * Reads the data file: an .xlsx workbook (told by its content, a zip
 * archive, or by its name) through the host's workbook reader, anything
 * else as CSV text.
 */
async function loadTable(io: CliIO, path: string | undefined, sheet: string | undefined): Promise<Table | NumericTable> {
  if (!io.readBytes || !io.readWorkbook) return readTable(io, path, sheet);
  if (!path) fail('give a CSV or .xlsx file; see knotwise help.');
  let bytes: Uint8Array;
  try {
    bytes = io.readBytes(path!);
  } catch (e) {
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`);
  }
  if (isZip(bytes) || isOldOfficeFile(bytes) || WORKBOOK_NAME.test(path!)) {
    try {
      return (await readWorkbookTable(bytes, sheet, io.readWorkbook)).table;
    } catch (e) {
      if (e instanceof CliError) throw new CliError(`${path}: ${e.message}`, e.exitCode);
      throw e;
    }
  }
  // the same text readFile gives (a byte-order mark is kept for the CSV reader, which skips it)
  return csvTable(path!, new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes), sheet);
}

/** Column i of a table as engine cells (from an all-numeric file, one packed array of numbers copied from its typed array). */
function tableColumn(t: Table | NumericTable, i: number): Cell[] {
  return 'columns' in t ? Array.from(t.columns[i]) : t.rows.map((r) => (i < r.length ? r[i] : null));
}

function columns(p: Parsed, t: Table | NumericTable): { x: Cell[] | null; w: Cell[] | null; ys: { name: string; cells: Cell[] }[]; xDates: boolean } {
  const col = (i: number): Cell[] => tableColumn(t, i);
  const xSpec = one(p, '--x');
  const wSpec = one(p, '--w');
  const xi = xSpec !== undefined ? columnIndex(t, xSpec) : -1;
  const wi = wSpec !== undefined ? columnIndex(t, wSpec) : -1;
  const ySpecs = p.values.get('--y') ?? [String(t.header.length)];
  const ys = ySpecs.map((s) => { const i = columnIndex(t, s.trim()); return { name: t.header[i], cells: col(i) }; });
  return { x: xi >= 0 ? col(xi) : null, w: wi >= 0 ? col(wi) : null, ys, xDates: xi >= 0 && 'rows' in t && t.dateColumns[xi] };
}

/** The engine options named on the command line: each declared flag's text, passed as typed (the engine checks it). */
function declaredOptions(p: Parsed, spec: CommandSpec): Record<string, unknown> {
  const options: Record<string, unknown> = {};
  for (const o of spec.options) {
    if (!o.option) continue;
    const v = o.value ? one(p, o.flag) : p.switches.has(o.flag) ? 'true' : undefined;
    if (v !== undefined) options[o.option] = v;
  }
  // old spellings the declarations cannot express: --one-se and --penalty crops:LOW,HIGH
  if (p.switches.has('--one-se')) {
    const r = options.rule ?? options.select;
    if (r !== undefined && String(r).trim().toLowerCase() !== 'cv') fail(`--one-se goes with the cross-validation rule; got --rule ${String(r)}. Use --rule cv-simpler.`);
    delete options.select;
    options.rule = 'cv-simpler';
  }
  const pen = options.penalty;
  if (typeof pen === 'string' && pen.trim().toLowerCase().startsWith('crops:')) {
    delete options.penalty;
    options.penaltyRange = pen.trim().slice(6);
  }
  return options;
}

function fitOne(p: Parsed, spec: CommandSpec, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null, evalX: number[] | null): Record<string, unknown> {
  // no --method: the engine's default smoother for these settings (the automatic choice, or the spline with a note)
  const result = analyse({ analysis: one(p, '--method'), family: 'smoother', y, x, w, options: declaredOptions(p, spec) });
  const { series } = result;
  const fit = result.smooth!;
  const out: Record<string, unknown> = {
    column: name, method: result.analysis, ...(fit.method !== result.analysis ? { fittedWith: { method: fit.method, options: result.comparison?.rows[result.comparison.chosen].options ?? {} } } : {}), options: result.options, n: series.n, nRows: series.nRows, nUsed: series.nUsed,
    dropped: series.dropped.length, tiesMerged: series.tiesMerged,
    penalty: fit.penalty, df: fit.df, sigma: Number.isFinite(fit.sigma) ? fit.sigma : null,
    criterion: { name: fit.criterion.name, value: Number.isFinite(fit.criterion.value) ? fit.criterion.value : null, atEdge: fit.criterion.atEdge ?? false },
    fitted: toRows(series, fit.fitted, null),
    knots: (fit.bends ?? []).map((b) => ({ x: b.x, row: b.row + 1, change: Number.isFinite(b.change) ? b.change : null, shrunkChange: b.shrunkChange, xFrom: b.xFrom, xTo: b.xTo, knotsMerged: b.knots, rank: b.rank })),
    allKnots: fit.knots.map((k) => ({ x: k.x, row: k.row + 1, change: k.change })),
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    caveats: result.caveats.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
  if (result.comparison) {
    const c = result.comparison;
    out.candidates = c.rows.map((r, i) => ({ method: r.method, options: r.options, label: r.label, penalty: Number.isFinite(r.penalty) ? r.penalty : null, df: Number.isFinite(r.df) ? r.df : null, cv: Number.isFinite(r.cv) ? r.cv : null, se: Number.isFinite(r.se) ? r.se : null, milliseconds: r.milliseconds, chosen: i === c.chosen, ...(r.skipped ? { skipped: r.skipped } : {}) }));
    out.reason = c.reason;
  }
  if (result.uncompared) out.uncompared = result.uncompared;
  if (evalX) {
    const ev = evaluateAnalysis(result, evalX);
    out.eval = evalX.map((v, i) => ({ x: v, value: ev.value[i], extrapolated: ev.extrapolated[i] === 1 }));
  }
  return out;
}

function readEval(io: CliIO, path: string): number[] {
  const t = readTable(io, path);
  const i = t.header.findIndex((h) => h.toLowerCase() === 'x');
  const k = i >= 0 ? i : 0;
  const xs: number[] = [];
  tableColumn(t, k).forEach((v, j) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      const what = v === null || v === undefined ? 'blank' : typeof v === 'object' ? `the error value ${v.error}` : typeof v === 'boolean' ? (v ? 'TRUE' : 'FALSE') : typeof v === 'number' ? String(v) : JSON.stringify(v);
      throw new CliError(`${path}: row ${j + 1} of column "${t.header[k]}" is not a finite number (${what}); give one plain number per row.`, 1);
    }
    xs.push(v as number);
  });
  return xs;
}

function breaksOne(p: Parsed, spec: CommandSpec, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null): Record<string, unknown> {
  const result: AnalysisResult = analyse({ analysis: one(p, '--model') ?? 'level', family: 'changepoints', y, x, w, options: declaredOptions(p, spec) });
  const { series } = result;
  const b = result.breaks!;
  const seg = (s: typeof b.segments[number]) => {
    const o: Record<string, unknown> = { rowStart: s.rowStart + 1, rowEnd: s.rowEnd + 1, xStart: s.xStart, xEnd: s.xEnd, n: s.n };
    for (const k of ['mean', 'sd', 'rate', 'median', 'slope', 'intercept'] as const) if (Number.isFinite(s[k])) o[k] = s[k];
    return o;
  };
  return {
    column: name, model: result.analysis, options: result.options, n: series.n, nRows: series.nRows,
    penalty: b.penalty,
    ...(b.sigma ? { sigma: b.sigma } : {}),
    breaks: b.breaks.map((k) => ({ row: k.row + 1, x: k.x, change: k.change, before: seg(k.before), after: seg(k.after), uncertainty: k.uncertainty.note })),
    segments: b.segments.map(seg),
    fitted: toRows(series, b.fitted, null),
    cost: b.cost,
    ...(b.crops ? { crops: b.crops.map((c) => ({ penalty: c.penalty, penaltyLow: c.penaltyLow, penaltyHigh: c.penaltyHigh, changes: c.changes, cost: c.cost, rows: c.breaks.map((i) => series.firstRow[i] + 1) })) } : {}),
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    caveats: result.caveats.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: b.solver,
  };
}

function decomposeOne(p: Parsed, spec: CommandSpec, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null): Record<string, unknown> {
  const result: AnalysisResult = analyse({ analysis: 'decompose', family: 'decomposition', y, x, w, options: declaredOptions(p, spec) });
  const { series } = result;
  const d = result.decomposition!;
  const c = d.components;
  const seasons = d.seasons as { label: string; length: number; strength: number; kept: boolean }[];
  return {
    column: name, method: d.method, options: result.options, n: series.n, nRows: series.nRows,
    period: d.period, seasonal: d.seasonal,
    seasons: seasons.map((q) => ({ label: q.label, length: q.length, strength: q.strength, kept: q.kept })),
    trend: toRows(series, c.trend, null), season: toRows(series, c.season, null), spikes: toRows(series, c.spikes, null),
    remainder: toRows(series, c.remainder, null), adjusted: toRows(series, c.adjusted, null),
    // the trend's bends (neighbouring knots merged, sized on the unpenalised refit), as for a fit; every knot in allKnots
    knots: ((d.bends ?? []) as Bend[]).map((b) => ({ x: b.x, row: b.row + 1, change: Number.isFinite(b.change) ? b.change : null, shrunkChange: b.shrunkChange, xFrom: b.xFrom, xTo: b.xTo, knotsMerged: b.knots, rank: b.rank })),
    allKnots: (d.knots as { x: number; row: number; change: number }[]).map((k) => ({ x: k.x, row: k.row + 1, change: Number.isFinite(k.change) ? k.change : null })),
    spikeRows: (d.spikeIndex as number[]).map((i) => series.firstRow[i] + 1),
    penalty: Number.isFinite(d.penalty as number) ? d.penalty : null, spikePenalty: Number.isFinite(d.spikePenalty as number) ? d.spikePenalty : null,
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    caveats: result.caveats.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
}

/** Refuses an --out file that exists (without --force) before any work is done. */
function checkOut(io: CliIO, path: string, force: boolean): void {
  if (path.trim() === '') fail('--out needs a file name.');
  if (!io.writeFile) fail('this host cannot write files; leave out --out.');
  if (!force && io.exists?.(path)) throw new CliError(`${path} already exists; add --force to overwrite it, or choose another --out file.`, 1);
}

/** Writes the output file; never replaces an existing file without --force. */
function writeOut(io: CliIO, path: string, text: string, force: boolean): void {
  try {
    io.writeFile!(path, text, force);
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (code === 'EEXIST') throw new CliError(`${path} already exists; add --force to overwrite it, or choose another --out file.`, 1);
    throw new CliError(`cannot write ${path}: ${(e as Error).message}`, 1);
  }
}


function textDecompose(o: Record<string, any>): string {
  const lines = [`${o.column}: ${o.method} decomposition, ${o.n} points, season ${o.seasonal ? o.period.map(fmt).join(' and ') : 'none'}, ${o.knots.length} bends (${o.allKnots.length} knots), ${o.spikeRows.length} spikes`];
  for (const q of o.seasons) lines.push(`  season ${q.label} (${fmt(q.length)} steps): strength ${fmt(q.strength)}${q.kept ? ', kept' : ', not kept'}`);
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  for (const w of o.caveats) lines.push(`  read with care [${w.code}]: ${w.message}`);
  return lines.join('\n');
}

const fmt = (v: unknown): string => (typeof v === 'number' ? formatNumber(v, 4) : String(v));

/**
 * When x are dates (an ISO date column): ISO 8601 text beside every x in the
 * JSON, keeping the serial number (knots and breaks get xDate, segments
 * xStartDate and xEndDate, evaluations xDate) and a top-level xDates: true.
 */
function withDates(o: Record<string, any>): Record<string, any> {
  const iso = (v: number) => serialToIso(v) ?? null;
  const out: Record<string, any> = { ...o, xDates: true };
  if (o.knots) out.knots = o.knots.map((k: any) => ({ ...k, xDate: iso(k.x) }));
  if (o.allKnots) out.allKnots = o.allKnots.map((k: any) => ({ ...k, xDate: iso(k.x) }));
  if (o.breaks) out.breaks = o.breaks.map((b: any) => ({ ...b, xDate: iso(b.x), before: withSegmentDates(b.before), after: withSegmentDates(b.after) }));
  if (o.segments) out.segments = o.segments.map(withSegmentDates);
  if (o.eval) out.eval = o.eval.map((e: any) => ({ ...e, xDate: iso(e.x) }));
  return out;
}

function withSegmentDates(s: Record<string, any>): Record<string, any> {
  return { ...s, xStartDate: serialToIso(s.xStart) ?? null, xEndDate: serialToIso(s.xEnd) ?? null };
}

/** How a text summary shows x and values derived from the data (the data's own decimals plus one). */
interface TextStyle {
  x(v: number): string;
  value(v: number): string;
}

function textStyle(xDates: boolean, x: Cell[] | null, y: Cell[]): TextStyle {
  const r = roundForData(y.filter((v): v is number => typeof v === 'number'));
  const xd = dataDecimals((x ?? []).filter((v): v is number => typeof v === 'number'));
  return { x: (v) => (xDates ? serialToIso(v) ?? String(v) : formatFixed(v, xd)), value: (v) => r.format(v) };
}

function textFit(o: Record<string, any>, st: TextStyle): string {
  const named = (m: string) => (m === 'spline' ? 'smoothing spline' : m === 'trend' ? 'trend filtering' : m);
  const kept = o.candidates?.find((c: any) => c.chosen)?.label;
  // the method of the fit itself (the automatic choice's kept one) words its penalty and solver
  const fitted = { ...o, method: o.fittedWith?.method ?? o.method } as any;
  // the automatic choice says what it kept (or, on a long series, what it fitted without comparing)
  const method = o.method === 'auto' ? `automatic choice, ${kept ? `kept ${kept}` : `no comparison, fitted ${named(fitted.method)}`}` : named(o.method);
  const lines = [
    `${o.column}: ${method}, ${o.n} points (${o.dropped} rows dropped, ${o.tiesMerged} merged as ties)`,
    `  ${smoothPenaltyInWords(fitted)}; chosen by ${ruleInWords(o.criterion.name)}${o.criterion.value === null ? '' : ` (score ${fmt(o.criterion.value)})`}; noise sd ${o.sigma === null ? 'not estimated' : st.value(o.sigma)}`,
    `  solver: ${fitSolverInWords(fitted)}`,
  ];
  if (o.candidates) {
    lines.push(`  ${o.reason}`);
    for (const c of o.candidates) lines.push(`    ${c.chosen ? '*' : ' '} ${c.label}: ${c.skipped ? `not compared (${c.skipped})` : `df ${fmt(c.df)}, CV error ${fmt(c.cv)} (se ${fmt(c.se)}), ${c.milliseconds} ms`}`);
  }
  if (o.knots.length) lines.push(`  bends (${o.knots.length}, largest first): ` + [...o.knots].sort((a: any, b: any) => a.rank - b.rank).slice(0, 12).map((k: any) => `${st.x(k.x)} (row ${k.row}, change ${fmt(k.change ?? k.shrunkChange)})`).join('; ') + (o.knots.length > 12 ? ' ...' : ''));
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  for (const w of o.caveats) lines.push(`  read with care [${w.code}]: ${w.message}`);
  return lines.join('\n');
}

const SEGMENT_FIELDS = ['mean', 'sd', 'rate', 'median', 'slope'] as const;

function textBreaks(o: Record<string, any>, st: TextStyle): string {
  const lines = [`${o.column}: ${o.model} model, ${o.n} points, penalty ${fmt(o.penalty.value)} per change (${ruleInWords(o.penalty.rule)}), ${o.breaks.length} breaks; ${breaksSolverInWords(o as any)}`];
  const fields = (s: any) => SEGMENT_FIELDS.filter((k) => s[k] !== undefined).map((k) => `${k} ${k === 'slope' ? fmt(s[k]) : st.value(s[k])}`).join(', ');
  for (const b of o.breaks) lines.push(`  break at ${st.x(b.x)} (row ${b.row}): change ${fmt(b.change)}`);
  for (const s of o.segments) lines.push(`  segment ${st.x(s.xStart)} to ${st.x(s.xEnd)} (rows ${s.rowStart}-${s.rowEnd}, ${s.n} points): ${fields(s)}`);
  if (o.crops) for (const c of o.crops) lines.push(`  crops: penalty ${fmt(c.penaltyLow)}..${fmt(c.penaltyHigh)} -> ${c.changes} changes, cost ${fmt(c.cost)}`);
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  for (const w of o.caveats) lines.push(`  read with care [${w.code}]: ${w.message}`);
  return lines.join('\n');
}

type Command = 'fit' | 'breaks' | 'decompose';

/** One column's analysis: what the command line runs per --y, here in order or spread over worker threads (threads.ts). */
export interface ColumnJob {
  command: Command;
  parsed: Parsed;
  name: string;
  y: Cell[];
  x: Cell[] | null;
  w: Cell[] | null;
  evalX: number[] | null;
}

/** Runs one column's analysis and shapes its output record. */
export function runColumn(j: ColumnJob): Record<string, unknown> {
  const spec = commands().find((c) => c.name === j.command)!;
  const record = j.command === 'fit' ? fitOne(j.parsed, spec, j.name, j.y, j.x, j.w, j.evalX)
    : j.command === 'breaks' ? breaksOne(j.parsed, spec, j.name, j.y, j.x, j.w) : decomposeOne(j.parsed, spec, j.name, j.y, j.x, j.w);
  // --timing: the engine's time travels with the record (also from a worker thread) and is taken off before printing
  if (j.parsed.switches.has('--timing')) record[ENGINE_MS] = lastEngineMs ?? 0;
  return record;
}

const ENGINE_MS = 'engineMsForTiming';

/** The --timing line: phases in ms and the process's peak resident memory (MB), on stderr. */
function timingLine(readMs: number, engineMs: (number | string)[], writeMs: number | null, outcome: string): string {
  const rss = typeof process !== 'undefined' && process.resourceUsage ? Math.round(process.resourceUsage().maxRSS / 1024) : NaN;
  return `knotwise timing: read ${readMs} ms, engine ${engineMs.join(' + ')} ms, write ${writeMs ?? '-'} ms, peak memory ${rss} MB (${outcome})`;
}

interface Plan {
  command: Command;
  p: Parsed;
  jobs: ColumnJob[];
  xDates: boolean;
  x: Cell[] | null;
  /** Where to write instead of printing (--out). */
  outPath?: string;
}

interface Request {
  cmd: Command;
  p: Parsed;
  outPath?: string;
}

/** Reads the arguments: the help's exit code, or the command to run on which file. */
function parseCommand(argv: string[], io: CliIO): number | Request {
  const [command, ...rest] = argv;
  if (!command || command === 'help' || command === '--help' || command === '-h') { io.out(helpText(rest[0])); return command ? 0 : 2; }
  if (command !== 'fit' && command !== 'breaks' && command !== 'decompose') fail(`unknown command "${command}"; use fit, breaks, decompose or help.`);
  const cmd = command as Command;
  const spec = commands().find((c) => c.name === cmd)!;
  const p = parseArgs(rest, spec, fail);
  if (p.positional.length !== 1) fail(`${spec.usage}: give exactly one CSV or .xlsx file (got ${p.positional.length}).`);
  const outPath = one(p, '--out');
  if (p.switches.has('--force') && outPath === undefined) fail('--force only applies with --out FILE.');
  if (outPath !== undefined) checkOut(io, outPath, p.switches.has('--force'));
  return { cmd, p, outPath };
}

/** Reads the arguments and the file (CSV only: this entry is synchronous): the help's exit code, or the columns to run. */
function prepare(argv: string[], io: CliIO): number | Plan {
  const r = parseCommand(argv, io);
  if (typeof r === 'number') return r;
  return planFor(io, r, readTable(io, r.p.positional[0], one(r.p, '--sheet')));
}

/** Reads the arguments and the file, CSV or .xlsx: the help's exit code, or the columns to run. */
async function prepareAsync(argv: string[], io: CliIO): Promise<number | Plan> {
  const r = parseCommand(argv, io);
  if (typeof r === 'number') return r;
  return planFor(io, r, await loadTable(io, r.p.positional[0], one(r.p, '--sheet')));
}

function planFor(io: CliIO, { cmd, p, outPath }: Request, t: Table | NumericTable): Plan {
  const { x, w, ys, xDates } = columns(p, t);
  const evalPath = one(p, '--eval');
  const evalX = cmd === 'fit' && evalPath ? readEval(io, evalPath) : null;
  return { command: cmd, p, xDates, x, outPath, jobs: ys.map((c) => ({ command: cmd, parsed: p, name: c.name, y: c.cells, x, w, evalX })) };
}

function print(io: CliIO, plan: Plan, computed: Record<string, unknown>[]): number {
  const { command, p, xDates, x, jobs, outPath } = plan;
  const results = xDates ? computed.map(withDates) : computed;
  const text = p.switches.has('--json')
    ? JSON.stringify(results.length === 1 ? results[0] : results)
    : results.map((r, i) => { const st = textStyle(xDates, x, jobs[i].y); return command === 'fit' ? textFit(r, st) : command === 'breaks' ? textBreaks(r, st) : textDecompose(r); }).join('\n');
  if (outPath === undefined) io.out(text);
  else writeOut(io, outPath, text + '\n', p.switches.has('--force'));
  return 0;
}

function report(io: CliIO, e: unknown): number {
  if (e instanceof CliError) { io.err(`knotwise: ${e.message}`); return e.exitCode; }
  if (isKnotwiseError(e)) { io.err(`knotwise: ${e.message}`); return 1; }
  io.err(`knotwise: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
  return 1;
}

/** Runs the command line on a CSV file; returns the exit code (0 done, 1 data or option refused, 2 usage). */
export function runCli(argv: string[], io: CliIO): number {
  const t0 = Date.now();
  let readMs = -1;
  try {
    const plan = prepare(argv, io);
    if (typeof plan === 'number') return plan;
    readMs = Date.now() - t0;
    return finish(io, plan, plan.jobs.map(runColumn), readMs);
  } catch (e) {
    return refused(io, e, argv, readMs);
  }
}

/** Prints the results (and with --timing the timing line). */
function finish(io: CliIO, plan: Plan, computed: Record<string, unknown>[], readMs: number): number {
  const engineMs = computed.map((r) => { const ms = r[ENGINE_MS] as number; delete r[ENGINE_MS]; return ms; });
  const t1 = Date.now();
  const code = print(io, plan, computed);
  if (plan.p.switches.has('--timing')) io.err(timingLine(readMs, engineMs, Date.now() - t1, 'done'));
  return code;
}

/** Reports a refusal (and with --timing, once the file was read, the timing line). */
function refused(io: CliIO, e: unknown, argv: string[], readMs: number): number {
  const code = report(io, e);
  if (argv.includes('--timing') && readMs >= 0) io.err(timingLine(readMs, [lastEngineMs ?? '-'], null, 'refused'));
  return code;
}

/**
 * The command line with the columns run by `runColumns` (e.g. spread over
 * worker threads): same output, same order, same exit codes as {@link runCli};
 * it also reads .xlsx workbooks when the host gives `readBytes` and
 * `readWorkbook`. `runColumns` rejects with the error of the first failing
 * column in order.
 */
export async function runCliWith(argv: string[], io: CliIO, runColumns: (jobs: ColumnJob[]) => Promise<Record<string, unknown>[]>): Promise<number> {
  const t0 = Date.now();
  let readMs = -1;
  try {
    const plan = await prepareAsync(argv, io);
    if (typeof plan === 'number') return plan;
    readMs = Date.now() - t0;
    return finish(io, plan, await runColumns(plan.jobs), readMs);
  } catch (e) {
    return refused(io, e, argv, readMs);
  }
}
