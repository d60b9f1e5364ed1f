/**
 * The knotwise command line: CSV in, JSON or a text summary out. A thin front
 * over the engine: it reads columns, calls the same entry points as the
 * worksheet functions, and prints what comes back.
 */
import { Cell, FitOptions, breaksFromCells, evaluate, fitCells, isKnotwiseError, numberFromText, ruleOptions, toRows } from '../engine';
import type { BreaksOptions } from '../engine/breaks/types';
import { CliError, NumericTable, Table, columnIndex, parseCsv, parseNumericCsv } from './csv';
import { BREAKS, FIT, Parsed, helpText, parseArgs } from './options';

/** What the command line needs from its host (Node's fs and streams, or a test double). */
export interface CliIO {
  readFile(path: string): string;
  out(text: string): void;
  err(text: string): void;
}

const fail = (m: string): never => { throw new CliError(m); };

/** A flag's value as a number when it reads as one, else the text (the engine names it in its message). */
function numberOrText(v: string | undefined): number | string | undefined {
  if (v === undefined) return undefined;
  return numberFromText(v) ?? v.trim();
}

function one(p: Parsed, flag: string): string | undefined {
  return p.values.get(flag)?.[0];
}

function readTable(io: CliIO, path: string | undefined): Table | NumericTable {
  if (!path) fail('give a CSV file; see knotwise help.');
  let text: string;
  try {
    text = io.readFile(path!);
  } catch (e) {
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`);
  }
  // All-numeric files (the common case) are read straight into typed arrays; anything else cell by cell.
  const t = parseNumericCsv(text) ?? parseCsv(text);
  if (!t.header.length) fail(`${path} is empty.`);
  return t;
}

/** Column i of a table as engine cells (a typed array for an all-numeric file). */
function tableColumn(t: Table | NumericTable, i: number): Cell[] {
  return 'columns' in t ? (t.columns[i] as unknown as Cell[]) : t.rows.map((r) => (i < r.length ? r[i] : null));
}

function columns(p: Parsed, t: Table | NumericTable): { x: Cell[] | null; w: Cell[] | null; ys: { name: string; cells: Cell[] }[] } {
  const col = (i: number): Cell[] => tableColumn(t, i);
  const xSpec = one(p, '--x');
  const wSpec = one(p, '--w');
  const xi = xSpec !== undefined ? columnIndex(t, xSpec) : -1;
  const wi = wSpec !== undefined ? columnIndex(t, wSpec) : -1;
  const ySpecs = p.values.get('--y') ?? [String(t.header.length)];
  const ys = ySpecs.map((s) => { const i = columnIndex(t, s.trim()); return { name: t.header[i], cells: col(i) }; });
  return { x: xi >= 0 ? col(xi) : null, w: wi >= 0 ? col(wi) : null, ys };
}

function fitOne(p: Parsed, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null, evalX: number[] | null): Record<string, unknown> {
  const options: FitOptions = {};
  const set = (flag: string, key: keyof FitOptions) => { const v = numberOrText(one(p, flag)); if (v !== undefined) (options as Record<string, unknown>)[key] = v; };
  const method = one(p, '--method');
  if (method !== undefined) options.method = method;
  set('--order', 'order');
  set('--penalty', 'penalty');
  set('--df', 'df');
  set('--folds', 'folds');
  set('--relaxed', 'relaxed');
  const select = one(p, '--select');
  if (select !== undefined) Object.assign(options, ruleOptions(select));
  if (p.switches.has('--one-se')) options.oneSE = true;
  const { series, result } = fitCells(y, x, w, options);
  const fitted = toRows(series, result.fitted, null);
  const out: Record<string, unknown> = {
    column: name, method: result.method, n: series.n, nRows: series.nRows, nUsed: series.nUsed,
    dropped: series.dropped.length, tiesMerged: series.tiesMerged,
    penalty: result.penalty, df: result.df, sigma: Number.isFinite(result.sigma) ? result.sigma : null,
    criterion: { name: result.criterion.name, value: Number.isFinite(result.criterion.value) ? result.criterion.value : null, atEdge: result.criterion.atEdge ?? false },
    fitted,
    knots: result.knots.map((k) => ({ x: k.x, row: k.row + 1, change: k.change })),
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
  if (evalX) {
    const ev = evaluate(result, evalX);
    out.eval = evalX.map((v, i) => ({ x: v, value: ev.value[i], extrapolated: ev.extrapolated[i] === 1 }));
  }
  return out;
}

function readEval(io: CliIO, path: string): number[] {
  const t = readTable(io, path);
  const i = t.header.findIndex((h) => h.toLowerCase() === 'x');
  const k = i >= 0 ? i : 0;
  const xs: number[] = [];
  Array.from(tableColumn(t, k)).forEach((v, j) => {
    if (typeof v !== 'number') fail(`${path}: row ${j + 1} of column "${t.header[k]}" is not a number (${v === null ? 'blank' : JSON.stringify(v)}).`);
    xs.push(v as number);
  });
  return xs;
}

function parseBreaksPenalty(v: string | undefined): Pick<BreaksOptions, 'penalty' | 'crops'> {
  if (v === undefined) return {};
  const t = v.trim().toLowerCase();
  if (t.startsWith('crops:')) {
    const parts = t.slice(6).split(',').map((s) => numberOrText(s));
    if (parts.length !== 2 || parts.some((q) => typeof q !== 'number')) fail(`--penalty crops:LOW,HIGH needs two numbers; got "${v}".`);
    return { crops: [parts[0] as number, parts[1] as number] };
  }
  return { penalty: numberOrText(t) as BreaksOptions['penalty'] };
}

function breaksOne(p: Parsed, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null): Record<string, unknown> {
  const options = {
    model: (one(p, '--model') ?? 'mean') as BreaksOptions['model'],
    ...parseBreaksPenalty(one(p, '--penalty')),
  } as BreaksOptions;
  const ms = numberOrText(one(p, '--min-segment'));
  if (ms !== undefined) options.minSegment = ms as number;
  const sg = numberOrText(one(p, '--sigma'));
  if (sg !== undefined) options.sigma = sg as number;
  const { series, result } = breaksFromCells(y, x, w, options);
  const fitted = toRows(series, result.fitted, null);
  const seg = (s: typeof result.segments[number]) => {
    const o: Record<string, unknown> = { rowStart: s.rowStart + 1, rowEnd: s.rowEnd + 1, xStart: s.xStart, xEnd: s.xEnd, n: s.n };
    for (const k of ['mean', 'sd', 'rate', 'median', 'slope', 'intercept'] as const) if (Number.isFinite(s[k])) o[k] = s[k];
    return o;
  };
  return {
    column: name, model: result.model, n: series.n, nRows: series.nRows,
    penalty: result.penalty,
    ...(result.sigma ? { sigma: result.sigma } : {}),
    breaks: result.breaks.map((b) => ({ row: b.row + 1, x: b.x, change: b.change, before: seg(b.before), after: seg(b.after), uncertainty: b.uncertainty.note })),
    segments: result.segments.map(seg),
    fitted,
    cost: result.cost,
    ...(result.crops ? { crops: result.crops.map((c) => ({ penalty: c.penalty, penaltyLow: c.penaltyLow, penaltyHigh: c.penaltyHigh, changes: c.changes, cost: c.cost, rows: c.breaks.map((i) => series.firstRow[i] + 1) })) } : {}),
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
}

const fmt = (v: unknown): string => (typeof v === 'number' ? Number(v.toPrecision(6)).toString() : String(v));

function textFit(o: Record<string, any>): string {
  const lines = [
    `${o.column}: ${o.method}, ${o.n} points (${o.dropped} rows dropped, ${o.tiesMerged} merged as ties)`,
    `  lambda ${fmt(o.penalty)}   df ${fmt(o.df)}   sigma ${o.sigma === null ? 'n/a' : fmt(o.sigma)}   ${o.criterion.name} ${o.criterion.value === null ? '' : fmt(o.criterion.value)}`,
  ];
  if (o.knots.length) lines.push(`  knots (${o.knots.length}): ` + o.knots.slice(0, 12).map((k: any) => `x=${fmt(k.x)} (row ${k.row}, change ${fmt(k.change)})`).join('; ') + (o.knots.length > 12 ? ' ...' : ''));
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  return lines.join('\n');
}

function textBreaks(o: Record<string, any>): string {
  const lines = [`${o.column}: ${o.model} model, ${o.n} points, penalty ${o.penalty.rule} = ${fmt(o.penalty.value)}, ${o.breaks.length} breaks`];
  for (const b of o.breaks) lines.push(`  row ${b.row} (x = ${fmt(b.x)}): change ${fmt(b.change)}`);
  if (o.crops) for (const c of o.crops) lines.push(`  crops: penalty ${fmt(c.penaltyLow)}..${fmt(c.penaltyHigh)} -> ${c.changes} changes, cost ${fmt(c.cost)}`);
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  return lines.join('\n');
}

/** One column's analysis: what the command line runs per --y, here in order or spread over worker threads (threads.ts). */
export interface ColumnJob {
  command: 'fit' | 'breaks';
  parsed: Parsed;
  name: string;
  y: Cell[];
  x: Cell[] | null;
  w: Cell[] | null;
  evalX: number[] | null;
}

/** Runs one column's analysis and shapes its output record. */
export function runColumn(j: ColumnJob): Record<string, unknown> {
  return j.command === 'fit' ? fitOne(j.parsed, j.name, j.y, j.x, j.w, j.evalX) : breaksOne(j.parsed, j.name, j.y, j.x, j.w);
}

/** Reads the arguments and the file: the help's exit code, or the columns to run. */
function prepare(argv: string[], io: CliIO): number | { command: 'fit' | 'breaks'; p: Parsed; jobs: ColumnJob[] } {
  const [command, ...rest] = argv;
  if (!command || command === 'help' || command === '--help' || command === '-h') { io.out(helpText()); return command ? 0 : 2; }
  if (command !== 'fit' && command !== 'breaks') fail(`unknown command "${command}"; use fit, breaks or help.`);
  const cmd = command as 'fit' | 'breaks';
  const spec = cmd === 'fit' ? FIT : BREAKS;
  const p = parseArgs(rest, spec, fail);
  if (p.positional.length !== 1) fail(`${spec.usage}: give exactly one CSV file (got ${p.positional.length}).`);
  const t = readTable(io, p.positional[0]);
  const { x, w, ys } = columns(p, t);
  const evalPath = one(p, '--eval');
  const evalX = cmd === 'fit' && evalPath ? readEval(io, evalPath) : null;
  return { command: cmd, p, jobs: ys.map((c) => ({ command: cmd, parsed: p, name: c.name, y: c.cells, x, w, evalX })) };
}

function print(io: CliIO, command: 'fit' | 'breaks', p: Parsed, results: Record<string, unknown>[]): number {
  if (p.switches.has('--json')) io.out(JSON.stringify(results.length === 1 ? results[0] : results));
  else io.out(results.map((r) => (command === 'fit' ? textFit(r) : textBreaks(r))).join('\n'));
  return 0;
}

function report(io: CliIO, e: unknown): number {
  if (e instanceof CliError) { io.err(`knotwise: ${e.message}`); return e.exitCode; }
  if (isKnotwiseError(e)) { io.err(`knotwise: ${e.message}`); return 1; }
  io.err(`knotwise: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
  return 1;
}

/** Runs the command line; returns the exit code (0 done, 1 data or option refused, 2 usage). */
export function runCli(argv: string[], io: CliIO): number {
  try {
    const plan = prepare(argv, io);
    if (typeof plan === 'number') return plan;
    return print(io, plan.command, plan.p, plan.jobs.map(runColumn));
  } catch (e) {
    return report(io, e);
  }
}

/**
 * The command line with the columns run by `runColumns` (e.g. spread over
 * worker threads): same output, same order, same exit codes as {@link runCli}.
 * `runColumns` rejects with the error of the first failing column in order.
 */
export async function runCliWith(argv: string[], io: CliIO, runColumns: (jobs: ColumnJob[]) => Promise<Record<string, unknown>[]>): Promise<number> {
  try {
    const plan = prepare(argv, io);
    if (typeof plan === 'number') return plan;
    return print(io, plan.command, plan.p, await runColumns(plan.jobs));
  } catch (e) {
    return report(io, e);
  }
}
