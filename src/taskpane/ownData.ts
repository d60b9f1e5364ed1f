/**
 * The analyst's own data in the preview page: cells pasted from a
 * spreadsheet (tab-separated), a CSV file or a sheet of an .xlsx workbook,
 * read by the command line's own readers ({@link parseCsv},
 * {@link readWorkbookTable}), so a file means the same in the preview as on
 * the command line: plain numerals (in a workbook, number cells) become
 * numbers, ISO 8601 dates (YYYY-MM-DD, optionally with a time; in a workbook,
 * date cells) become Excel serials in a date column, as a worksheet holds
 * them; anything else stays text, for the engine to report.
 */
import { unzipSync, zipSync } from 'fflate';
import { readSheet } from 'read-excel-file/browser';
import { Table, guessDelimiter, parseCsv } from '../cli/csv';
import { SheetReader, readWorkbookTable } from '../cli/xlsx';
import { looksLikeIsoDate } from '../present/isoDate';

export interface OwnTable {
  header: string[];
  rows: (number | string | boolean)[][];
  dateColumns: boolean[];
  /** Plain-language notes about what was read (dates in a layout that is not read, ragged rows). */
  notes: string[];
}

const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4})$/;

/** Reads pasted cells or CSV text: the delimiter is detected (tab, comma, semicolon, bar); the first row holds the headers. */
export function readOwnTable(text: string): OwnTable {
  return ownTable(parseCsv(text, guessDelimiter(text)));
}

/** A sheet of a workbook read for the preview, with the names of all its sheets. */
export interface OwnWorkbook {
  table: OwnTable;
  sheet: string;
  sheets: string[];
}

/**
 * Reads one sheet of an .xlsx workbook (by name; the first when `sheet` is
 * undefined) with read-excel-file's browser entry. Throws an Error with a
 * plain message for a file that is not an .xlsx workbook or an empty sheet.
 */
export async function readOwnWorkbook(bytes: ArrayBuffer | Uint8Array, sheet?: string): Promise<OwnWorkbook> {
  const data = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  const w = await readWorkbookTable(data, sheet, (input, k, options) => (readSheet as unknown as SheetReader)(storedParts(input as Uint8Array), k, options));
  return { table: ownTable(w.table), sheet: w.sheet, sheets: w.sheets };
}

/**
 * The workbook's XML parts in a zip archive without compression. read-excel-file's
 * browser entry unzips with fflate's asynchronous unzip, which inflates a part
 * of 512 KB or more (a sheet of some ten thousand rows) in a Worker started from
 * a blob: URL; the pane's Content-Security-Policy forbids such workers, so the
 * parts are inflated here on this thread and handed over stored, which it
 * copies as they are. (The file's own checks, not a zip archive, run before.)
 */
function storedParts(bytes: Uint8Array): Uint8Array {
  return zipSync(unzipSync(bytes, { filter: (f) => /\.(xml|rels)$/i.test(f.name) }), { level: 0 });
}

/** True when a file name says .xlsx workbook (or its macro-enabled twin, .xlsm). */
export function isWorkbookName(name: string): boolean {
  return /\.xls[xm]$/i.test(name);
}

/**
 * Opens a file chosen in the preview: CSV text, or an .xlsx workbook whose
 * sheets are offered in `chooser` when there are several (choosing one reads
 * it). `use` receives the sheet's name (or the file's) and the table; `fail`
 * a message.
 */
export async function openOwnFile(file: File, chooser: HTMLSelectElement, use: (name: string, table: OwnTable) => void, fail: (message: string) => void): Promise<void> {
  const label = chooser.labels?.[0];
  const show = (on: boolean) => { chooser.hidden = !on; if (label) label.hidden = !on; };
  show(false);
  chooser.onchange = null;
  const base = file.name.replace(/\.[^.]*$/, '');
  try {
    if (!isWorkbookName(file.name)) { use(sheetName(base), readOwnTable(await file.text())); return; }
    const bytes = new Uint8Array(await file.arrayBuffer());
    const open = async (sheet?: string) => {
      try {
        const w = await readOwnWorkbook(bytes, sheet);
        if (w.sheets.length > 1) {
          chooser.replaceChildren(...w.sheets.map((n) => new Option(n, n)));
          chooser.value = w.sheet;
          show(true);
        }
        use(sheetName(w.sheet), w.table);
      } catch (e) {
        fail(`Could not read ${sheet === undefined ? file.name : `sheet "${sheet}" of ${file.name}`}: ${(e as Error).message}`);
      }
    };
    chooser.onchange = () => { void open(chooser.value); };
    await open();
  } catch (e) {
    fail(`Could not read ${file.name}: ${(e as Error).message}`);
  }
}

/** A name the preview's sheet can carry (Excel's 31 characters, letters, digits, _ and spaces). */
function sheetName(name: string): string {
  return name.replace(/[^A-Za-z0-9_ ]/g, '_').slice(0, 31) || 'File';
}

/** A table from a CSV file, pasted cells or a workbook's sheet as the preview's sheet holds it. */
function ownTable(t: Table): OwnTable {
  const workbook = t.source === 'workbook';
  const body = t.rows.filter((r) => r.some((c) => c !== null && c !== ''));
  if (!t.header.length || !body.length) throw new Error('no data found: paste or open at least a header row and one row of values.');
  const width = body.reduce((m, r) => Math.max(m, r.length), t.header.length);
  const header = Array.from({ length: width }, (_, j) => (t.header[j] ?? '').trim() || `column ${j + 1}`);
  const dateColumns = header.map((_, j) => !!t.dateColumns[j]);
  const unread = header.map(() => ({ count: 0, example: '', row: 0 }));
  const notes: string[] = [];
  if (body.some((r) => r.length !== body[0].length)) notes.push('rows have different numbers of fields; missing fields are read as blank cells.');
  const rows = body.map((r, i) => header.map((_, j) => {
    const c = r[j];
    if (c === null || c === undefined) return '';
    if (typeof c === 'object') return c.error;
    if (typeof c === 'string') {
      const f = c.trim();
      if (looksLikeIsoDate(f) || OTHER_DATE.test(f)) { const u = unread[j]; if (!u.count) { u.example = f; u.row = i + 2; } u.count++; }
    }
    return c;
  }));
  unread.forEach((u, j) => {
    if (!u.count) return;
    if (workbook) notes.push(`column "${header[j]}" holds ${u.count} date${u.count > 1 ? 's' : ''} stored as text (first in sheet row ${u.row}: "${u.example}"); store dates as date cells in the workbook.`);
    else notes.push(`column "${header[j]}" holds ${u.count} date${u.count > 1 ? 's' : ''} that could not be read (first in sheet row ${u.row}: "${u.example}"); write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM).`);
  });
  return { header, rows, dateColumns, notes };
}
