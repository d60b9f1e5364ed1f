/**
 * Translation between Excel cell arrays and the engine's cells. Nothing here
 * decides anything about the data: the engine's intake drops, sorts and
 * merges; this only maps Excel's value kinds and the output shape.
 */
import { Cell, KnotwiseError, toColumn } from '../engine';

/** A range as Excel passes it: rows of values. */
export type Matrix = unknown[][];

/** Whether a range runs down a column (or is a single cell) or along a row. */
export type Orientation = 'column' | 'row';

const isBlank = (s: unknown): boolean => s === null || s === undefined || s === '';

/** An omitted optional argument arrives as null or undefined; a blank cell reference as a 1 x 1 range holding "" or null. */
export function omitted(v: unknown): boolean {
  return isBlank(scalar(v));
}

/**
 * One Excel value as an engine cell. Excel passes numbers (dates are serial
 * numbers), text, booleans, null or "" for blanks, error values as objects with
 * a code ({ code: '#N/A' }, CustomFunctions.Error), and, for data types, rich
 * values { type, basicValue } whose basic value is what the cell shows
 * (type 'Error' holds the error's code as its basic value).
 */
export function toCell(v: unknown): Cell {
  if (v === null || v === undefined || typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v as Cell;
  if (typeof v === 'object') {
    const o = v as { code?: unknown; type?: unknown; basicValue?: unknown; errorType?: unknown };
    if (o.code !== undefined) return { error: String(o.code) };
    if (o.type === 'Error') return { error: String(o.basicValue ?? o.errorType ?? '#VALUE!') };
    if (o.basicValue !== undefined) return toCell(o.basicValue);
    return { error: 'an unsupported value' };
  }
  return { error: `an unsupported ${typeof v} value` };
}

/** Flattens a single row or column range into engine cells; `name` is used in messages. */
export function readColumn(m: Matrix, name: string): { cells: Cell[]; orientation: Orientation } {
  if (!Array.isArray(m)) throw new KnotwiseError('shape-mismatch', `${name} must be a range of cells (a column or a row); got the single value ${describeCell(m)}.`);
  const lines = m.filter((r) => Array.isArray(r)).length;
  if (lines !== 0 && lines !== m.length) throw new KnotwiseError('shape-mismatch', `${name} must be a range of cells (rows of values); got a list mixing rows and single values.`);
  const cells = lines ? toColumn(m.map((r) => r.map(toCell)), name) : m.map(toCell);
  const orientation: Orientation = m.length === 1 && (m[0]?.length ?? 0) > 1 ? 'row' : 'column';
  return { cells, orientation };
}

/** A value for a message: text quoted, an error by its code. */
function describeCell(v: unknown): string {
  const c = toCell(v);
  if (typeof c === 'string') return JSON.stringify(c);
  if (c !== null && typeof c === 'object') return `the error value ${c.error}`;
  return String(c);
}

/** Shapes one value per input row as the input was shaped (a column, or a row). */
export function shapeLike(values: unknown[], orientation: Orientation): unknown[][] {
  return orientation === 'row' ? [values] : values.map((v) => [v]);
}

/** A scalar argument that may arrive as a 1 x 1 range. */
export function scalar(v: unknown): unknown {
  if (Array.isArray(v) && v.length === 1 && Array.isArray(v[0]) && v[0].length === 1) return v[0][0];
  return v;
}

/** An optional number argument: omitted -> undefined; anything else is passed to the engine as typed, which validates it. */
export function optionalNumber(v: unknown): number | undefined {
  const s = scalar(v);
  return isBlank(s) ? undefined : (s as number);
}

/** A required scalar argument, which Excel passes blank when its cell is empty or the argument is left out: refused by name. */
export function required(v: unknown, what: string): unknown {
  const s = scalar(v);
  if (isBlank(s)) throw new KnotwiseError('bad-option', `${what} is blank; give a number.`);
  return s;
}

/** An optional text argument: omitted -> undefined. */
export function optionalText(v: unknown): string | undefined {
  const s = scalar(v);
  return isBlank(s) ? undefined : String(s);
}

/** y, and x and weights when given, as engine cells; the orientation of y shapes the output. */
export function readInputs(y: Matrix, x: unknown, weights: unknown): { y: Cell[]; x: Cell[] | null; w: Cell[] | null; orientation: Orientation } {
  const yc = readColumn(y, 'y');
  return {
    y: yc.cells,
    x: omitted(x) ? null : readColumn(x as Matrix, 'x').cells,
    w: omitted(weights) ? null : readColumn(weights as Matrix, 'weights').cells,
    orientation: yc.orientation,
  };
}

/** Replaces NaN and infinities (which Excel cannot hold) by blank cells. */
export function cellNumber(v: number): number | string {
  return Number.isFinite(v) ? v : '';
}
