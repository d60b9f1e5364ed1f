/**
 * Excel workbooks (.xlsx) as tables of engine cells, for the command line and
 * the preview page. The cells are read by read-excel-file (its Node or
 * browser entry, passed in by the caller); this module only translates them,
 * by the rule a worksheet range follows when it reaches the engine:
 *
 * - numbers stay numbers;
 * - dates (date cells, or numbers with a date format) become Excel serial day
 *   numbers in the 1900 date system (a 1904-system workbook's dates come out
 *   as the same days), to the millisecond, and mark their column as dates, as
 *   an ISO date column of a CSV file does;
 * - text stays text, untrimmed, booleans stay booleans, empty cells are
 *   blanks, and error cells (#N/A, #DIV/0! ...) become error cells, so the
 *   engine's intake leaves out the same rows with the same reasons as for
 *   the same cells on a worksheet. read-excel-file reads error cells as
 *   empty, so they are found here in the sheet's XML (unzipped with fflate).
 *
 * The first non-empty row holds the headers; rows are counted as the sheet's
 * data rows, the first after the header being row 1 (a sheet with headers in
 * row 1 thus has data row N in sheet row N + 1).
 */
import { strFromU8, unzipSync } from 'fflate';
import type { Cell } from '../engine/series';
import { CliError, Table } from './csv';

/** One cell as read-excel-file gives it. */
export type WorkbookCell = string | number | boolean | Date | null | undefined;

/** read-excel-file's readSheet (from 'read-excel-file/node' or 'read-excel-file/browser'). */
export type SheetReader = (input: any, sheet: number, options: { trim: boolean }) => Promise<unknown[][]>;

/** A sheet of a workbook: its name and where its cells are stored in the archive. */
export interface SheetEntry {
  name: string;
  path: string;
}

/** The table read from one sheet, with the names of all the workbook's sheets. */
export interface WorkbookTable {
  table: Table;
  sheet: string;
  sheets: string[];
}

/** True when the bytes start a zip archive (as every .xlsx file does). */
export function isZip(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

/** True when the bytes start an OLE compound file: an Excel 97-2003 .xls workbook (or another old Office file). */
export function isOldOfficeFile(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0;
}

const MS_PER_DAY = 86400000;
/** Serial of 1970-01-01 in the 1900 date system. */
const UNIX_EPOCH_SERIAL = 25569;

/**
 * A date read from a workbook as its Excel serial (1900 date system). The
 * exact inverse of read-excel-file's conversion (serial - 25569 days from
 * 1970-01-01, to the millisecond), so a date cell comes back as the number
 * Excel stores.
 *
 * @example dateToSerial(new Date(Date.UTC(2024, 0, 1))) === 45292
 */
export function dateToSerial(d: Date): number {
  return d.getTime() / MS_PER_DAY + UNIX_EPOCH_SERIAL;
}

const unescapeXml = (s: string) => s.replace(/&(lt|gt|quot|apos|amp|#x[0-9a-fA-F]+|#\d+);/g, (_m, e: string) =>
  e === 'lt' ? '<' : e === 'gt' ? '>' : e === 'quot' ? '"' : e === 'apos' ? "'" : e === 'amp' ? '&' : String.fromCodePoint(e[1] === 'x' ? parseInt(e.slice(2), 16) : Number(e.slice(1))));

const attr = (tag: string, name: string): string | undefined => {
  const m = new RegExp(`(?:^|\\s)${name}\\s*=\\s*("([^"]*)"|'([^']*)')`).exec(tag);
  return m ? unescapeXml(m[2] ?? m[3]) : undefined;
};

/** Unzips the named parts of the archive (only those are inflated). */
function parts(bytes: Uint8Array, wanted: (name: string) => boolean): Record<string, Uint8Array> {
  return unzipSync(bytes, { filter: (f) => wanted(f.name) });
}

/** The workbook's sheets in tab order, with where each one's cells are stored. */
export function workbookSheets(bytes: Uint8Array): SheetEntry[] {
  const files = parts(bytes, (n) => n === 'xl/workbook.xml' || n === 'xl/_rels/workbook.xml.rels');
  if (!files['xl/workbook.xml'] || !files['xl/_rels/workbook.xml.rels']) throw new CliError('the file is a zip archive but not an Excel workbook (no xl/workbook.xml); save it from Excel as .xlsx.', 1);
  const rels = new Map<string, string>();
  for (const m of strFromU8(files['xl/_rels/workbook.xml.rels']).matchAll(/<(?:\w+:)?Relationship\b([^>]*)>/g)) {
    const id = attr(m[1], 'Id'), target = attr(m[1], 'Target');
    if (id && target) rels.set(id, target.startsWith('/') ? target.slice(1) : `xl/${target}`);
  }
  const out: SheetEntry[] = [];
  for (const m of strFromU8(files['xl/workbook.xml']).matchAll(/<(?:\w+:)?sheet\b([^>]*)>/g)) {
    const name = attr(m[1], 'name');
    const id = /(?:^|\s)[\w]+:id\s*=\s*"([^"]*)"/.exec(m[1])?.[1];
    if (name !== undefined) out.push({ name, path: (id && rels.get(id)) || '' });
  }
  return out;
}

/**
 * The error cells of one sheet (Excel's #N/A, #DIV/0! ...), keyed by
 * "row,column" counted from 0 at A1.
 */
export function sheetErrorCells(bytes: Uint8Array, path: string): Map<string, string> {
  const out = new Map<string, string>();
  if (!path) return out;
  const file = parts(bytes, (n) => n === path)[path];
  if (!file) return out;
  for (const m of strFromU8(file).matchAll(/<(?:\w+:)?c\b([^>]*?)(?:\/>|>([\s\S]*?)<\/(?:\w+:)?c>)/g)) {
    if (attr(m[1], 't') !== 'e') continue;
    const ref = attr(m[1], 'r');
    const v = m[2] ? /<(?:\w+:)?v>([^<]*)<\/(?:\w+:)?v>/.exec(m[2])?.[1] : undefined;
    const a = ref ? /^([A-Z]+)(\d+)$/.exec(ref) : null;
    if (!a || v === undefined) continue;
    let col = 0;
    for (const ch of a[1]) col = col * 26 + (ch.charCodeAt(0) - 64);
    out.set(`${Number(a[2]) - 1},${col - 1}`, unescapeXml(v).toUpperCase());
  }
  return out;
}

/**
 * Finds a sheet by name (exact, then ignoring case) or 1-based number; an
 * unknown sheet is refused with the list of the workbook's sheets.
 */
export function sheetIndex(names: string[], spec: string | undefined): number {
  if (!names.length) throw new CliError('the workbook has no sheets.', 1);
  if (spec === undefined) return 0;
  const exact = names.indexOf(spec);
  if (exact >= 0) return exact;
  const lower = names.findIndex((n) => n.toLowerCase() === spec.trim().toLowerCase());
  if (lower >= 0) return lower;
  if (/^\s*\d+\s*$/.test(spec)) {
    const k = Number(spec);
    if (k >= 1 && k <= names.length) return k - 1;
  }
  throw new CliError(`no sheet "${spec}"; the workbook has ${names.length} sheet${names.length > 1 ? 's' : ''}: ${names.map((n, i) => `${i + 1}="${n}"`).join(', ')}.`);
}

/** One workbook cell as an engine cell (the error cells come from {@link sheetErrorCells}). */
export function workbookCell(v: WorkbookCell): Cell {
  if (v === null || v === undefined) return null;
  if (v instanceof Date) return dateToSerial(v);
  return v;
}

/**
 * A sheet's rows (as read-excel-file gives them, row 0 being sheet row 1) as
 * a table: the first non-empty row is the header, rows after the last
 * non-empty one are left off, error cells are put back from `errors`.
 */
export function sheetTable(data: WorkbookCell[][], errors: Map<string, string>, sheet: string): Table {
  const empty = (r: WorkbookCell[] | undefined, i: number) => (r ?? []).every((c, j) => (c === null || c === undefined) && !errors.has(`${i},${j}`));
  let first = 0, last = data.length;
  while (first < last && empty(data[first], first)) first++;
  while (last > first && empty(data[last - 1], last - 1)) last--;
  if (first === last) throw new CliError(`sheet "${sheet}" is empty; choose another sheet.`, 1);
  let width = 0;
  for (let i = first; i < last; i++) width = Math.max(width, (data[i] ?? []).length);
  for (const k of errors.keys()) { const [i, j] = k.split(',').map(Number); if (i >= first && i < last) width = Math.max(width, j + 1); }
  const head = data[first] ?? [];
  const header = Array.from({ length: width }, (_, j) => {
    const h = head[j];
    return h === null || h === undefined ? '' : h instanceof Date ? h.toISOString().slice(0, 10) : String(h).trim();
  });
  const dateColumns = header.map(() => false);
  const rows: Cell[][] = [];
  for (let i = first + 1; i < last; i++) {
    const r = data[i] ?? [];
    rows.push(Array.from({ length: width }, (_, j) => {
      const e = errors.get(`${i},${j}`);
      if (e !== undefined) return { error: e };
      const v = r[j];
      if (v instanceof Date) dateColumns[j] = true;
      return workbookCell(v);
    }));
  }
  return { header, rows, dateColumns, source: 'workbook' };
}

/**
 * Reads one sheet of an .xlsx file (by name or 1-based number; the first
 * when `sheet` is undefined) as a table of engine cells. Refuses, with one
 * line: a file that is not an .xlsx workbook (an old .xls, any other file),
 * an unknown sheet (listing the sheets), an empty sheet.
 *
 * @param bytes - the whole file
 * @param read - read-excel-file's readSheet (Node or browser entry)
 */
export async function readWorkbookTable(bytes: Uint8Array, sheet: string | undefined, read: SheetReader): Promise<WorkbookTable> {
  if (isOldOfficeFile(bytes)) throw new CliError('this is an Excel 97-2003 workbook (.xls), which is not read; save it as .xlsx or CSV.', 1);
  if (!isZip(bytes)) throw new CliError('the file is not an .xlsx workbook (an .xlsx file is a zip archive); save it from Excel as .xlsx, or give a CSV file.', 1);
  let entries: SheetEntry[];
  try {
    entries = workbookSheets(bytes);
  } catch (e) {
    if (e instanceof CliError) throw e;
    throw new CliError(`the file cannot be read as an .xlsx workbook (${(e as Error).message}).`, 1);
  }
  const names = entries.map((s) => s.name);
  const k = sheetIndex(names, sheet);
  let data: unknown[][];
  try {
    data = await read(bytes, k + 1, { trim: false });
  } catch (e) {
    throw new CliError(`the file cannot be read as an .xlsx workbook (${(e as Error).message}).`, 1);
  }
  return { table: sheetTable(data as WorkbookCell[][], sheetErrorCells(bytes, entries[k].path), names[k]), sheet: names[k], sheets: names };
}
