/**
 * A small RFC 4180 CSV reader for the command line: quoted fields, doubled
 * quotes, CRLF or LF line ends. Fields become cells by the rule every front
 * follows (README, "Numbers, text and blanks"): a field that is exactly a
 * plain decimal numeral ("12", "-3.5", "1e-4", quoted or not) is a number; an
 * ISO 8601 date (YYYY-MM-DD, optionally with a time "THH:MM[:SS]" or
 * " HH:MM[:SS]") becomes its Excel serial number (1900 date system, as a
 * worksheet holds dates) and marks its column as dates; an empty or all-space
 * field is a blank; an Excel error literal (#N/A, #DIV/0!, ...) is an error
 * cell; TRUE and FALSE are booleans; NaN and Infinity are numbers that are not
 * finite; anything else stays text, so the engine's intake names it,
 * including numbers written with anything around them (" 12 ", "1,234",
 * "12%"), which it leaves out as numbers stored as text exactly as it does for
 * a text cell on a worksheet.
 *
 * Rows are counted as the file's data rows: the first line after the header
 * is row 1 (so a blank on line 35 of the file is row 34).
 */
import type { Cell } from '../engine/series';
import { isoToSerial, looksLikeIsoDate } from '../present/isoDate';
import { excelErrorCell } from '../present/excelErrors';

export interface Table {
  header: string[];
  rows: Cell[][];
  /** Per column: true when at least one field was read as an ISO date (its numbers are Excel serials). */
  dateColumns: boolean[];
  /** Where the cells came from: a CSV file (the default) or a sheet of an .xlsx workbook (dates are date cells there). */
  source?: 'csv' | 'workbook';
}

/** Dates in layouts other than ISO 8601 (02/01/2023, 2023/01/02, 2 Jan 2023, 2023-1-2): readable by a person, ambiguous or unsupported here. */
const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4}|[A-Za-z]{3,9}\.? \d{1,2},? \d{4}|\d{4}-\d{1,2}-\d{1,2}.*)$/;

/**
 * Parses CSV text (or pasted cells with another separator) into a table.
 *
 * @param delimiter - the field separator: ',' (default), '\t' for cells pasted from a spreadsheet, ';' or '|'
 */
export function parseCsv(text: string, delimiter = ','): Table {
  const records: string[][] = [];
  let field = '';
  let record: string[] = [];
  let i = 0;
  let quoted = false;
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  while (i < src.length) {
    const ch = src[i];
    if (quoted) {
      if (ch === '"') {
        if (src[i + 1] === '"') { field += '"'; i += 2; continue; }
        quoted = false; i++; continue;
      }
      field += ch; i++; continue;
    }
    if (ch === '"' && field === '') { quoted = true; i++; continue; }
    if (ch === delimiter) { record.push(field); field = ''; i++; continue; }
    if (ch === '\r' || ch === '\n') {
      record.push(field); field = '';
      records.push(record); record = [];
      if (ch === '\r' && src[i + 1] === '\n') i++;
      i++; continue;
    }
    field += ch; i++;
  }
  if (field !== '' || record.length) { record.push(field); records.push(record); }
  // An empty line inside the data is a row of blanks (a one-column file writes a blank cell so), so
  // rows keep their numbers; empty lines before the header and after the last row are not rows.
  const empty = (r: string[]) => r.length === 1 && r[0].trim() === '';
  let first = 0, last = records.length;
  while (first < last && empty(records[first])) first++;
  while (last > first && empty(records[last - 1])) last--;
  const [header = [], ...body] = records.slice(first, last);
  const dateColumns = header.map(() => false);
  const rows = body.map((r) => r.map((f, j) => {
    const c = fieldToCell(f);
    if (typeof c === 'number' && !PLAIN_NUMBER.test(f) && looksLikeIsoDate(f.trim())) dateColumns[j] = true;
    return c;
  }));
  return { header: header.map((h) => h.trim()), rows, dateColumns };
}

/** A plain decimal numeral, nothing around it (no spaces, separators, signs of currency or percent). */
const PLAIN_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
const NOT_FINITE: Record<string, number> = { nan: NaN, infinity: Infinity, '+infinity': Infinity, '-infinity': -Infinity, inf: Infinity, '+inf': Infinity, '-inf': -Infinity };

/** One field as a cell, by the rule above (an ISO date becomes its Excel serial). */
export function fieldToCell(f: string): Cell {
  if (f.trim() === '') return null;
  if (PLAIN_NUMBER.test(f)) return Number(f);
  const t = f.trim();
  const d = isoToSerial(t);
  if (d !== undefined) return d;
  const error = excelErrorCell(t);
  if (error) return error;
  const upper = t.toUpperCase();
  if (upper === 'TRUE' || upper === 'FALSE') return upper === 'TRUE';
  const lower = t.toLowerCase();
  if (lower in NOT_FINITE) return NOT_FINITE[lower];
  return f;
}

/**
 * Refuses a column that holds dates the reader could not turn into numbers,
 * with a message that shows one and says which layout is read. A column is
 * refused when a field looks like an ISO date but is not a valid one
 * ("2023-02-30", "2023-1-2"), or when most of its non-blank text fields look
 * like dates in another layout ("02/01/2023", "2 Jan 2023"). A sheet of a
 * workbook has typed cells (dates are date cells): its column is refused only
 * when most of its filled cells are text that looks like dates; a few such
 * text cells are left for the engine to leave out and name, as on a worksheet.
 */
export function checkDates(table: Table, index: number): void {
  const name = table.header[index];
  let text = 0, dateLike = 0, filled = 0;
  let first: { row: number; value: string } | undefined;
  table.rows.forEach((r, i) => {
    const v = r[index];
    if (v !== null && v !== undefined) filled++;
    if (typeof v !== 'string') return;
    text++;
    const t = v.trim();
    if (OTHER_DATE.test(t) || looksLikeIsoDate(t)) {
      dateLike++;
      if (!first) first = { row: i + 1, value: t };
    }
  });
  if (!first) return;
  const iso = looksLikeIsoDate(first.value);
  if (table.source === 'workbook') {
    // A sheet's cells have types: a few dates typed as text among other cells are text rows the engine leaves
    // out and names, as on a worksheet; a column mostly of dates stored as text is refused here.
    if (dateLike * 2 > filled) throw new CliError(`column "${name}": row ${first.row} holds the text "${first.value}", a date stored as text${dateLike > 1 ? ` (${dateLike} such rows)` : ''}; store the dates as date cells (or serial numbers), or save the sheet as CSV with dates as YYYY-MM-DD; rows count the sheet's data rows, the first after the header being row 1.`);
    return;
  }
  if (table.dateColumns[index] || iso || dateLike * 2 > text) {
    const what = iso ? 'is not a valid ISO 8601 date' : 'looks like a date that cannot be read';
    throw new CliError(`column "${name}": row ${first.row} holds "${first.value}", which ${what}${dateLike > 1 ? ` (${dateLike} such rows)` : ''}. Write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM or YYYY-MM-DDTHH:MM:SS), or as Excel serial numbers; rows count the file's data rows, the first after the header being row 1.`);
  }
}

/**
 * The separator of pasted cells or a CSV file, from its first line: a tab
 * (cells copied from a spreadsheet), else the most frequent of ',', ';', '|'
 * outside quotes (',' when none).
 */
export function guessDelimiter(text: string): string {
  const line = (text.split(/\r?\n/).find((l) => l.trim() !== '') ?? '').replace(/"[^"]*"/g, '');
  if (line.includes('\t')) return '\t';
  let best = ',', most = 0;
  for (const d of [',', ';', '|']) { const c = line.split(d).length - 1; if (c > most) { most = c; best = d; } }
  return best;
}

/**
 * Finds a column by header name (exact, then case-insensitive) or 1-based
 * number, and refuses it when it holds dates that could not be read
 * ({@link checkDates}).
 */
export function columnIndex(table: Table | NumericTable, spec: string): number {
  const found = findColumn(table, spec);
  if ('rows' in table) checkDates(table, found); // an all-numeric file holds no dates
  return found;
}

function findColumn(table: { header: string[] }, spec: string): number {
  const exact = table.header.indexOf(spec);
  if (exact >= 0) return exact;
  const lower = table.header.findIndex((h) => h.toLowerCase() === spec.toLowerCase());
  if (lower >= 0) return lower;
  if (/^\d+$/.test(spec)) {
    const k = Number(spec);
    if (k >= 1 && k <= table.header.length) return k - 1;
  }
  throw new CliError(`no column "${spec}"; the file has ${table.header.length} columns: ${table.header.map((h, i) => `${i + 1}="${h}"`).join(', ')}.`);
}

/** A usage or input problem reported as one line with a non-zero exit code. */
export class CliError extends Error {
  constructor(message: string, readonly exitCode = 2) {
    super(message);
    this.name = 'CliError';
  }
}

/** A CSV whose every data field is a plain decimal number, read column by column. */
export interface NumericTable {
  header: string[];
  /** One array per column, one value per data row. */
  columns: Float64Array[];
}

const enum Ch { Tab = 9, Lf = 10, Cr = 13, Space = 32, Quote = 34, Plus = 43, Comma = 44, Minus = 45, Dot = 46, D0 = 48, D9 = 57, E = 69, e = 101 }

/** 10^k for k = 0..22: exact in binary64, so m * 10^k and m / 10^k round once (Clinger's fast path). */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The fast path for the common numeric file: reads each field straight into a
 * Float64Array, with no per-cell strings or row arrays. Returns null as soon as
 * the file is anything else (a quote, a blank or text field, rows of unequal
 * length), and the caller reads it with {@link parseCsv}, which reports such
 * cells by row. A field counts as a number exactly when `numberFromText`
 * would take it (the same plain-decimal rule, spaces around allowed), and its
 * value equals `Number(field)`: digits that fit in 2^53 with a power of ten up
 * to 22 are converted in one correctly rounded step, anything else by Number().
 */
export function parseNumericCsv(text: string): NumericTable | null {
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const n = text.length;
  // Header: up to the first line end; quotes send the file to the general reader.
  let lineEnd = i;
  while (lineEnd < n && text.charCodeAt(lineEnd) !== Ch.Lf && text.charCodeAt(lineEnd) !== Ch.Cr) lineEnd++;
  const headLine = text.slice(i, lineEnd);
  if (headLine.includes('"') || headLine.trim() === '') return null;
  const header = headLine.split(',').map((h) => h.trim());
  const nc = header.length;
  i = lineEnd;
  let cap = 1024;
  let cols = header.map(() => new Float64Array(cap));
  let rows = 0;
  // after the header and after each row: exactly one line end (CRLF, LF or CR)
  const lineEnd1 = (k: number) => (text.charCodeAt(k) === Ch.Cr && text.charCodeAt(k + 1) === Ch.Lf ? k + 2 : k + 1);
  if (i < n) i = lineEnd1(i);
  while (i < n) {
    let c = text.charCodeAt(i);
    if (c === Ch.Lf || c === Ch.Cr) {
      // an empty line: trailing ones end the file; one inside the data is a row of blanks, for the general reader
      let k = i;
      while (k < n && ((c = text.charCodeAt(k)) === Ch.Lf || c === Ch.Cr || c === Ch.Space || c === Ch.Tab)) k++;
      if (k === n) break;
      return null;
    }
    if (rows === cap) {
      cap *= 2;
      cols = cols.map((a) => { const b = new Float64Array(cap); b.set(a); return b; });
    }
    for (let j = 0; j < nc; j++) {
      // One field: [sign] digits [. digits] [e [sign] digits], nothing around it (a padded number is text,
      // left out as a number stored as text, by the general reader's rule)
      const start = i;
      let neg = false;
      c = text.charCodeAt(i);
      if (c === Ch.Minus || c === Ch.Plus) { neg = c === Ch.Minus; i++; }
      let mant = 0, digits = 0, intDigits = 0, fracDigits = 0, sig = 0;
      while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { if (mant !== 0 || c !== Ch.D0) sig++; mant = mant * 10 + (c - Ch.D0); intDigits++; i++; }
      if (c === Ch.Dot && i < n) {
        i++;
        while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { if (mant !== 0 || c !== Ch.D0) sig++; mant = mant * 10 + (c - Ch.D0); fracDigits++; i++; }
      }
      digits = intDigits + fracDigits;
      if (digits === 0) return null;
      let exp = 0;
      if (i < n && ((c = text.charCodeAt(i)) === Ch.E || c === Ch.e)) {
        i++;
        let eneg = false;
        c = text.charCodeAt(i);
        if (c === Ch.Minus || c === Ch.Plus) { eneg = c === Ch.Minus; i++; }
        let ed = 0;
        while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { exp = exp * 10 + (c - Ch.D0); ed++; i++; if (exp > 1e6) exp = 1e6; }
        if (ed === 0) return null;
        if (eneg) exp = -exp;
      }
      const end = i;
      // The field must end here: a comma between fields, a line end (or the end) after the last.
      const last = j === nc - 1;
      if (i < n) {
        c = text.charCodeAt(i);
        if (last ? c !== Ch.Lf && c !== Ch.Cr : c !== Ch.Comma) return null;
        i = last ? lineEnd1(i) : i + 1;
      } else if (!last) return null;
      const e10 = exp - fracDigits;
      if (sig <= 15 && e10 >= -22 && e10 <= 22) {
        const v = e10 < 0 ? mant / POW10[-e10] : mant * POW10[e10];
        cols[j][rows] = neg ? -v : v;
      } else cols[j][rows] = Number(text.slice(start, end));
    }
    rows++;
  }
  return { header, columns: cols.map((a) => a.slice(0, rows)) };
}
