/**
 * Runs a catalogue case through the fronts and judges what comes back, the
 * same way for every case: a result must be aligned with its input rows and
 * hold only numbers, text, booleans or '' (the worksheet) or finite numbers
 * and null (the command line's JSON); an error must be Excel's #VALUE! with a
 * message (the worksheet) or exit code 1 with one line (the command line);
 * anything else (a stack trace, "unexpected failure", NaN in a cell, a row
 * shifted against its input, a rerun that differs) is a crash.
 */
import { smooth, penalty, summary, knots, evaluateAt } from '../../src/functions/smoothing';
import { breaks, segments, breakScan } from '../../src/functions/breaks';
import { clearComputeCache } from '../../src/functions/compute';
import { runCli, CliIO } from '../../src/cli/main';
import { Case, Target, familyOf } from './catalogue';

export type Front = 'sheet' | 'cli';

/** What one call gave, judged. */
export interface Run {
  front: Front;
  target: Target;
  /** The worksheet function or command line that was called. */
  call: string;
  kind: 'result' | 'error' | 'crash';
  /** Warning and caveat codes of the result (worksheet: from SUMMARY of the same request). */
  warnings: string[];
  warningText: string;
  error?: string;
  /** Why the call counts as a crash. */
  problems: string[];
}

// ------------------------------------------------------------ input rows

/** A range as a flat list of cells (rows of a column, or the one row), or null when it is not a one-line range. */
function flat(v: unknown): unknown[] | null {
  if (!Array.isArray(v)) return null;
  const m = v as unknown[][];
  if (!m.every((r) => Array.isArray(r))) return null;
  if (m.every((r) => r.length === 1)) return m.map((r) => r[0]);
  if (m.length === 1) return m[0];
  return null;
}

/** A cell's number as the worksheet takes it: numbers (and rich values holding one), finite; nothing else. */
function sheetNumber(v: unknown): number | undefined {
  if (typeof v === 'number') return Number.isFinite(v) ? v : undefined;
  if (v && typeof v === 'object' && (v as { type?: string }).type === 'Double') return sheetNumber((v as { basicValue?: unknown }).basicValue);
  return undefined;
}

/** The documented rule for CSV fields: a number is a plain decimal numeral, nothing around it. */
const PLAIN = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
function csvNumber(field: string): number | undefined {
  return PLAIN.test(field) && Number.isFinite(Number(field)) ? Number(field) : undefined;
}

/** One CSV field for a cell. */
export function csvField(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return String(v);
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (typeof v === 'object') return String((v as { code?: unknown; basicValue?: unknown }).code ?? (v as { basicValue?: unknown }).basicValue ?? '');
  const s = String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The case's columns as a CSV file with header x, y, w (x and w only when given). */
export function csvOf(c: Case): string {
  const y = flat(c.y)!, x = c.x === undefined ? null : flat(c.x)!, w = c.w === undefined ? null : flat(c.w)!;
  const head = ['y', ...(x ? ['x'] : []), ...(w ? ['w'] : [])];
  const lines = [head.join(',')];
  for (let i = 0; i < y.length; i++) lines.push([y[i], ...(x ? [x[i]] : []), ...(w ? [w[i]] : [])].map(csvField).join(','));
  return lines.join('\n') + '\n';
}

/** For each input row: its (x, y) when the row is usable on this front, else null. */
function usableRows(c: Case, front: Front): ({ x: number; y: number } | null)[] | null {
  const y = flat(c.y);
  if (!y) return null;
  const x = c.x === undefined ? null : flat(c.x);
  const w = c.w === undefined ? null : flat(c.w);
  const num = (v: unknown) => (front === 'sheet' ? sheetNumber(v) : csvNumber(csvField(v).replace(/^"|"$/g, '')));
  return y.map((yv, i) => {
    const a = num(yv);
    const b = x ? num(x[i]) : i + 1;
    const ww = w ? num(w[i]) : 1;
    return a === undefined || b === undefined || ww === undefined || !(ww > 0) ? null : { x: b, y: a };
  });
}

// ------------------------------------------------------------ judging

const CELL_OK = (v: unknown) => (typeof v === 'number' && Number.isFinite(v)) || typeof v === 'string' || typeof v === 'boolean';

function checkCells(out: unknown, problems: string[]): out is unknown[][] {
  if (!Array.isArray(out) || out.length === 0 || !out.every((r) => Array.isArray(r))) { problems.push(`not a range: ${JSON.stringify(out)?.slice(0, 80)}`); return false; }
  const width = (out[0] as unknown[]).length;
  if (!out.every((r) => (r as unknown[]).length === width)) problems.push('rows of different widths');
  out.forEach((r, i) => (r as unknown[]).forEach((v, j) => { if (!CELL_OK(v)) problems.push(`cell (${i + 1}, ${j + 1}) holds ${String(v)}`); }));
  return true;
}

function checkMessage(m: string, problems: string[]): void {
  if (/unexpected failure/i.test(m)) problems.push(`unexpected failure: ${m}`);
  if (/\n\s+at /.test(m)) problems.push('a stack trace in the message');
  if (/undefined|\[object |is not a function|Cannot read prop/.test(m)) problems.push(`a message leaking internals: ${m}`);
  if (m.trim() === '') problems.push('an empty message');
}

/** The per-row output (a column or a row) as a flat list of the input's length. */
function perRow(out: unknown[][], rows: number, rowShaped: boolean, problems: string[]): unknown[] {
  const v = rowShaped ? out[0] : out.map((r) => r[0]);
  if ((rowShaped ? out.length !== 1 : out.some((r) => r.length !== 1)) || v.length !== rows) problems.push(`output shaped ${out.length} x ${out[0]?.length}, input has ${rows} rows as a ${rowShaped ? 'row' : 'column'}`);
  return v;
}

function checkBlanks(values: readonly unknown[], usable: readonly unknown[], blank: unknown, problems: string[], what: string): void {
  values.forEach((v, i) => {
    const isBlank = v === blank;
    if (isBlank !== (usable[i] === null)) problems.push(`${what}: row ${i + 1} is ${isBlank ? 'empty' : String(v)} but the input row is ${usable[i] === null ? 'unusable' : 'usable'}`);
  });
}

/** Rows (1-based) named in a table must be usable input rows with the x the table prints. */
function checkRowsNamed(rows: { row: unknown; x: unknown }[], usable: readonly ({ x: number } | null)[], problems: string[], what: string): void {
  for (const r of rows) {
    const k = Number(r.row) - 1;
    if (!Number.isInteger(k) || k < 0 || k >= usable.length || usable[k] === null) { problems.push(`${what}: row ${String(r.row)} is not a usable input row`); continue; }
    if (usable[k]!.x !== r.x) problems.push(`${what}: row ${String(r.row)} has x ${usable[k]!.x} but the table says ${String(r.x)}`);
  }
}

/** Per-row fitted + residual must give back y for rows whose x is not shared (a shifted row would not). */
function checkResidual(fitted: readonly unknown[], resid: readonly unknown[], usable: readonly ({ x: number; y: number } | null)[], problems: string[]): void {
  const count = new Map<number, number>();
  for (const u of usable) if (u) count.set(u.x, (count.get(u.x) ?? 0) + 1);
  const scale = Math.max(1, ...usable.map((u) => (u ? Math.abs(u.y) : 0)));
  usable.forEach((u, i) => {
    if (!u || count.get(u.x)! > 1) return;
    const f = fitted[i], r = resid[i];
    if (typeof f !== 'number' || typeof r !== 'number') return;
    if (Math.abs(f + r - u.y) > 1e-9 * scale) problems.push(`row ${i + 1}: fitted ${f} + residual ${r} is not its y ${u.y}`);
  });
}

// ------------------------------------------------------------ the worksheet

const settingsText = (o?: Record<string, string>) => (o ? Object.entries(o).map(([k, v]) => `${k}=${v}`).join('; ') : undefined);

interface Called { ok: boolean; value?: unknown; error?: unknown }
async function call(f: () => Promise<unknown>): Promise<Called> {
  try { return { ok: true, value: await f() }; } catch (e) { return { ok: false, error: e }; }
}

function judgeError(e: unknown, problems: string[]): string {
  const code = (e as { code?: unknown })?.code;
  const message = e instanceof Error ? e.message : String(e);
  if (code !== '#VALUE!') problems.push(`rejected without an Excel error value (code ${String(code)})`);
  checkMessage(message, problems);
  return message;
}

/** Every worksheet function of the target's family on the case; one Run per function. */
export async function runSheet(c: Case, t: Target, rerun = true): Promise<Run[]> {
  const settings = settingsText(c.options);
  const yRange = c.y as any, xRange = c.x as any, wRange = c.w as any;
  const usable = usableRows(c, 'sheet');
  const rowShaped = Array.isArray(c.y) && (c.y as unknown[][]).length === 1 && ((c.y as unknown[][])[0]?.length ?? 0) > 1;
  const calls: Record<string, () => Promise<unknown>> = familyOf(t) === 'smoothers'
    ? {
      SMOOTH: () => smooth(yRange, xRange, t, settings, wRange),
      'SMOOTH residual': () => smooth(yRange, xRange, t, settings, wRange, 'residual'),
      PENALTY: () => penalty(yRange, xRange, t, settings, wRange, true),
      KNOTS: () => knots(yRange, xRange, t, settings, wRange),
      EVALUATE: () => evaluateAt(yRange, [[0], [10.5], [''], [1e4]], xRange, t, settings, wRange),
      SUMMARY: () => summary(yRange, xRange, t, settings, wRange),
    }
    : {
      BREAKS: () => breaks(yRange, xRange, t, settings, wRange),
      SEGMENTS: () => segments(yRange, xRange, t, settings, wRange),
      BREAKSCAN: () => breakScan(yRange, 2, 200, xRange, t, settings, wRange),
      SUMMARY: () => summary(yRange, xRange, t, settings, wRange),
    };
  const got: Record<string, Called> = {};
  for (const [name, f] of Object.entries(calls)) got[name] = await call(f);
  // a bit-identical rerun without the shared result (of the per-row function; the others share its computation)
  clearComputeCache();
  const first = Object.keys(calls)[0];
  const again: Record<string, Called> = rerun ? { [first]: await call(calls[first]) } : {};
  clearComputeCache();

  const sum = got.SUMMARY;
  // warnings and the standing caveats (ends get revised, a break is not its cause), each row naming its code
  const warnRows = sum.ok ? (sum.value as unknown[][]).filter((r) => /^(warning \d+|read with care) \(/.test(String(r[0]))) : [];
  const codes = warnRows.map((r) => String(r[0]).replace(/^(?:warning \d+|read with care) \((.*)\)$/, '$1'));
  const text = warnRows.map((r) => String(r[1])).join(' | ');
  const runs: Run[] = [];
  for (const name of Object.keys(calls)) {
    const g = got[name];
    const problems: string[] = [];
    const show = (v: Called) => (v.ok ? JSON.stringify(v.value) : `error: ${(v.error as Error)?.message}`);
    if (again[name] && show(g) !== show(again[name])) problems.push('a rerun gave a different answer');
    if (!g.ok) {
      const message = judgeError(g.error, problems);
      runs.push({ front: 'sheet', target: t, call: name, kind: problems.length ? 'crash' : 'error', warnings: [], warningText: '', error: message, problems });
      continue;
    }
    if (checkCells(g.value, problems) && usable) {
      const out = g.value as unknown[][];
      if (name === 'SMOOTH' || name === 'SMOOTH residual' || name === 'SEGMENTS') checkBlanks(perRow(out, usable.length, rowShaped, problems), usable, '', problems, name);
      if (name === 'SMOOTH residual' && got.SMOOTH.ok) checkResidual(perRow(got.SMOOTH.value as unknown[][], usable.length, rowShaped, []), perRow(out, usable.length, rowShaped, []), usable, problems);
      if (name === 'BREAKS' || name === 'KNOTS') checkRowsNamed(out.slice(1).map((r) => ({ x: r[0], row: r[1] })), usable, problems, name);
      if (name === 'BREAKSCAN') {
        const changes = out.slice(1).map((r) => r[2] as number);
        if (String(out[0]) !== 'penalty from,penalty to,changes,cost' || changes.some((v, i) => i > 0 && v > changes[i - 1])) problems.push(`BREAKSCAN gave ${JSON.stringify(out).slice(0, 200)}`);
      }
      if (name === 'EVALUATE' && (out.length !== 4 || out[2][0] !== '' || typeof out[0][0] !== 'number' || out[3][1] !== true)) problems.push(`EVALUATE gave ${JSON.stringify(out)}`);
    }
    runs.push({ front: 'sheet', target: t, call: name, kind: problems.length ? 'crash' : 'result', warnings: codes, warningText: text, problems });
  }
  return runs;
}

// ------------------------------------------------------------ the command line

/** A host with files in memory; `written` collects files the command writes. */
export function memoryIO(files: Record<string, string>) {
  const out: string[] = [], err: string[] = [];
  const written: Record<string, string> = {};
  const host: CliIO = {
    readFile: (p) => { if (p in files) return files[p]; if (p in written) return written[p]; throw new Error(`ENOENT: no such file, open '${p}'`); },
    out: (t) => out.push(t), err: (t) => err.push(t),
    exists: (p) => p in files || p in written,
    writeFile: (p, t, overwrite) => {
      if (!overwrite && (p in files || p in written)) throw Object.assign(new Error(`EEXIST: file already exists, open '${p}'`), { code: 'EEXIST' });
      written[p] = t;
    },
  };
  return { host, out, err, written };
}

function flags(o?: Record<string, string>): string[] {
  return o ? Object.entries(o).flatMap(([k, v]) => [`--${k}`, v]) : [];
}

/** The command for the target (fit --method, or breaks --model) on the case's CSV, run twice; one Run. */
export function runCommand(c: Case, t: Target, rerun = true): Run {
  const csv = csvOf(c);
  const args = [familyOf(t) === 'smoothers' ? 'fit' : 'breaks', 'data.csv', '--y', 'y',
    ...(c.x !== undefined ? ['--x', 'x'] : []), ...(c.w !== undefined ? ['--w', 'w'] : []),
    familyOf(t) === 'smoothers' ? '--method' : '--model', t, ...flags(c.options), '--json'];
  const go = () => { const io = memoryIO({ 'data.csv': csv }); const code = runCli(args, io.host); return { code, out: io.out.join('\n'), err: io.err }; };
  const a = go();
  const problems: string[] = [];
  const call = `knotwise ${args[0]} --${args[0] === 'fit' ? 'method' : 'model'} ${t}`;
  if (rerun) {
    const b = go();
    if (a.code !== b.code || a.out !== b.out || a.err.join() !== b.err.join()) problems.push('a rerun gave a different answer');
    const io = memoryIO({ 'data.csv': csv });
    runCli(args.filter((s) => s !== '--json'), io.host);
    const text = io.out.join('\n') + io.err.join('\n');
    if (/NaN|Infinity/.test(text)) problems.push(`the text output holds NaN or Infinity: ${text.slice(0, 200)}`);
  }
  if (a.code !== 0) {
    const usage = /^knotwise: unknown option --/.test(a.err[0] ?? '');
    if (a.code !== 1 && !(a.code === 2 && usage)) problems.push(`exit code ${a.code}`);
    if (a.err.length !== 1 || /\n/.test(a.err[0] ?? '')) problems.push(`${a.err.length} lines on stderr`);
    if (a.out !== '') problems.push('printed a result as well as an error');
    const message = (a.err[0] ?? '').replace(/^knotwise: /, '');
    checkMessage(message, problems);
    return { front: 'cli', target: t, call, kind: problems.length ? 'crash' : 'error', warnings: [], warningText: '', error: message, problems };
  }
  let o: any;
  try { o = JSON.parse(a.out); } catch { problems.push('output is not JSON'); }
  const usable = usableRows(c, 'cli');
  if (o && usable) {
    if (!Array.isArray(o.fitted) || o.fitted.length !== usable.length) problems.push(`fitted has ${o.fitted?.length} entries for ${usable.length} rows`);
    else checkBlanks(o.fitted, usable, null, problems, 'fitted');
    if (familyOf(t) === 'changepoints') checkRowsNamed(o.breaks ?? [], usable, problems, 'breaks');
    else checkRowsNamed(o.knots ?? [], usable, problems, 'knots');
    for (const k of ['penalty', 'df']) if (familyOf(t) === 'smoothers' && !Number.isFinite(o[k])) problems.push(`${k} is ${o[k]}`);
  }
  const warnings: { code: string; message: string }[] = [...(o?.warnings ?? []), ...(o?.caveats ?? [])];
  return { front: 'cli', target: t, call, kind: problems.length ? 'crash' : 'result', warnings: warnings.map((w) => w.code), warningText: warnings.map((w) => w.message).join(' | '), problems };
}
