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

function toCell(v: unknown): Cell {
  if (v === null || v === undefined || typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v as Cell;
  if (typeof v === 'object') {
    const o = v as { code?: unknown; message?: unknown; type?: unknown; basicValue?: unknown };
    if (o.code !== undefined) return { error: String(o.code) };
    if (o.basicValue !== undefined) return toCell(o.basicValue);
    return { error: 'unsupported value' };
  }
  return { error: String(v) };
}

/** Flattens a single row or column range into engine cells; `name` is used in messages. */
export function readColumn(m: Matrix, name: string): { cells: Cell[]; orientation: Orientation } {
  if (!Array.isArray(m)) throw new KnotwiseError('shape-mismatch', `${name} must be a range of cells (a column or a row); got the single value ${JSON.stringify(m)}.`);
  const cells = toColumn(m.map((r) => r.map(toCell)), name);
  const orientation: Orientation = m.length === 1 && (m[0]?.length ?? 0) > 1 ? 'row' : 'column';
  return { cells, orientation };
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
