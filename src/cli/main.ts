/**
 * The knotwise command line: CSV in, JSON or a text summary out. A thin front
 * over the engine: it reads columns, calls the same entry points as the
 * worksheet functions, and prints what comes back.
 */
import { AnalysisResult, Cell, evaluateAnalysis, isKnotwiseError, runAnalysis, toRows } from '../engine';
import { CliError, Table, columnIndex, parseCsv } from './csv';
import { CommandSpec, Parsed, commands, helpText, parseArgs } from './options';

/** What the command line needs from its host (Node's fs and streams, or a test double). */
export interface CliIO {
  readFile(path: string): string;
  out(text: string): void;
  err(text: string): void;
}

const fail = (m: string): never => { throw new CliError(m); };

function one(p: Parsed, flag: string): string | undefined {
  return p.values.get(flag)?.[0];
}

function readTable(io: CliIO, path: string | undefined): Table {
  if (!path) fail('give a CSV file; see knotwise help.');
  let text: string;
  try {
    text = io.readFile(path!);
  } catch (e) {
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`);
  }
  const t = parseCsv(text);
  if (!t.header.length) fail(`${path} is empty.`);
  return t;
}

function columns(p: Parsed, t: Table): { x: Cell[] | null; w: Cell[] | null; ys: { name: string; cells: Cell[] }[] } {
  const col = (i: number): Cell[] => t.rows.map((r) => (i < r.length ? r[i] : null));
  const xSpec = one(p, '--x');
  const wSpec = one(p, '--w');
  const xi = xSpec !== undefined ? columnIndex(t, xSpec) : -1;
  const wi = wSpec !== undefined ? columnIndex(t, wSpec) : -1;
  const ySpecs = p.values.get('--y') ?? [String(t.header.length)];
  const ys = ySpecs.map((s) => { const i = columnIndex(t, s.trim()); return { name: t.header[i], cells: col(i) }; });
  return { x: xi >= 0 ? col(xi) : null, w: wi >= 0 ? col(wi) : null, ys };
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
  const result = runAnalysis({ analysis: one(p, '--method') ?? 'spline', family: 'smoother', y, x, w, options: declaredOptions(p, spec) });
  const { series } = result;
  const fit = result.smooth!;
  const out: Record<string, unknown> = {
    column: name, method: result.analysis, options: result.options, n: series.n, nRows: series.nRows, nUsed: series.nUsed,
    dropped: series.dropped.length, tiesMerged: series.tiesMerged,
    penalty: fit.penalty, df: fit.df, sigma: Number.isFinite(fit.sigma) ? fit.sigma : null,
    criterion: { name: fit.criterion.name, value: Number.isFinite(fit.criterion.value) ? fit.criterion.value : null, atEdge: fit.criterion.atEdge ?? false },
    fitted: toRows(series, fit.fitted, null),
    knots: (fit.bends ?? []).map((b) => ({ x: b.x, row: b.row + 1, change: Number.isFinite(b.change) ? b.change : null, shrunkChange: b.shrunkChange, xFrom: b.xFrom, xTo: b.xTo, knotsMerged: b.knots, rank: b.rank })),
    allKnots: fit.knots.map((k) => ({ x: k.x, row: k.row + 1, change: k.change })),
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
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
  t.rows.forEach((r, j) => {
    const v = r[k];
    if (typeof v !== 'number') fail(`${path}: row ${j + 1} of column "${t.header[k]}" is not a number (${v === null ? 'blank' : JSON.stringify(v)}).`);
    xs.push(v as number);
  });
  return xs;
}

function breaksOne(p: Parsed, spec: CommandSpec, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null): Record<string, unknown> {
  const result: AnalysisResult = runAnalysis({ analysis: one(p, '--model') ?? 'level', family: 'changepoints', y, x, w, options: declaredOptions(p, spec) });
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
    solver: b.solver,
  };
}

function decomposeOne(p: Parsed, spec: CommandSpec, name: string, y: Cell[], x: Cell[] | null, w: Cell[] | null): Record<string, unknown> {
  const result: AnalysisResult = runAnalysis({ analysis: 'decompose', family: 'decomposition', y, x, w, options: declaredOptions(p, spec) });
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
    knots: (d.knots as { x: number; row: number; change: number }[]).map((k) => ({ x: k.x, row: k.row + 1, change: Number.isFinite(k.change) ? k.change : null })),
    spikeRows: (d.spikeIndex as number[]).map((i) => series.firstRow[i] + 1),
    penalty: Number.isFinite(d.penalty as number) ? d.penalty : null, spikePenalty: Number.isFinite(d.spikePenalty as number) ? d.spikePenalty : null,
    warnings: result.warnings.map((wn) => ({ code: wn.code, message: wn.message })),
    solver: result.solver,
  };
}

function textDecompose(o: Record<string, any>): string {
  const lines = [`${o.column}: ${o.method} decomposition, ${o.n} points, season ${o.seasonal ? o.period.map(fmt).join(' and ') : 'none'}, ${o.knots.length} knots, ${o.spikeRows.length} spikes`];
  for (const q of o.seasons) lines.push(`  season ${q.label} (${fmt(q.length)} steps): strength ${fmt(q.strength)}${q.kept ? ', kept' : ', not kept'}`);
  for (const w of o.warnings) lines.push(`  warning [${w.code}]: ${w.message}`);
  return lines.join('\n');
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

/** Runs the command line; returns the exit code (0 done, 1 data or option refused, 2 usage). */
export function runCli(argv: string[], io: CliIO): number {
  try {
    const [command, ...rest] = argv;
    if (!command || command === 'help' || command === '--help' || command === '-h') { io.out(helpText(rest[0])); return command ? 0 : 2; }
    if (command !== 'fit' && command !== 'breaks' && command !== 'decompose') fail(`unknown command "${command}"; use fit, breaks, decompose or help.`);
    const spec = commands().find((c) => c.name === command)!;
    const p = parseArgs(rest, spec, fail);
    if (p.positional.length !== 1) fail(`${spec.usage}: give exactly one CSV file (got ${p.positional.length}).`);
    const t = readTable(io, p.positional[0]);
    const { x, w, ys } = columns(p, t);
    const evalPath = one(p, '--eval');
    const evalX = command === 'fit' && evalPath ? readEval(io, evalPath) : null;
    const results = ys.map((c) => (command === 'fit' ? fitOne(p, spec, c.name, c.cells, x, w, evalX) : command === 'breaks' ? breaksOne(p, spec, c.name, c.cells, x, w) : decomposeOne(p, spec, c.name, c.cells, x, w)));
    if (p.switches.has('--json')) io.out(JSON.stringify(results.length === 1 ? results[0] : results));
    else io.out(results.map((r) => (command === 'fit' ? textFit(r) : command === 'breaks' ? textBreaks(r) : textDecompose(r))).join('\n'));
    return 0;
  } catch (e) {
    if (e instanceof CliError) { io.err(`knotwise: ${e.message}`); return e.exitCode; }
    if (isKnotwiseError(e)) { io.err(`knotwise: ${e.message}`); return 1; }
    io.err(`knotwise: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
    return 1;
  }
}
